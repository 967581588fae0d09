package analysis

import (
	"errors"
	"fmt"
	"math"
	"sort"

	"furlong/stats"
	"furlong/trial"
)

// Rates is a trial's rate series: the rate of each treatment that takes part
// in a response analysis, in one unit.
type Rates struct {
	Of      map[string]float64 // treatment code → rate
	Unit    string             // for example "kg N/ha"; "" when none was given
	LeftOut []string           // treatments without a rate or left out by the user, in trial order
}

// RatesOf returns the rate series of t: every treatment with a rate, except
// those in leaveOut (for example the untreated control of a product trial).
// It fails, in plain words, when the rates are in different units or fewer
// than 3 treatments have one.
func RatesOf(t *trial.Trial, leaveOut []string) (Rates, error) {
	leave := map[string]bool{}
	for _, c := range leaveOut {
		leave[c] = true
	}
	r := Rates{Of: map[string]float64{}}
	for _, tr := range t.Treatments {
		if leave[tr.Code] || tr.Rate == nil {
			r.LeftOut = append(r.LeftOut, tr.Code)
			continue
		}
		r.Of[tr.Code] = *tr.Rate
		if r.Unit == "" {
			r.Unit = tr.RateUnit
		} else if tr.RateUnit != "" && tr.RateUnit != r.Unit {
			return Rates{}, fmt.Errorf("the treatments' rates are in different units (%s and %s): give every rate in one unit", r.Unit, tr.RateUnit)
		}
	}
	if len(r.Of) < 3 {
		return Rates{}, fmt.Errorf("a response analysis needs at least 3 treatments with a rate, and this trial has %d; give each treatment its rate (furlong new --rates, or the Treatments tab)", len(r.Of))
	}
	return r, nil
}

// RatePoint is one treatment mean of a rate series.
type RatePoint struct {
	Treatment string
	Rate      float64
	N         int
	Mean, SE  float64
}

// ResponseFit is one fitted response model with its optima.
type ResponseFit struct {
	stats.ResponseModel
	// Optimum is the agronomic optimum (largest fitted response); nil when
	// the curve has none inside the tested rates.
	Optimum *float64
	// Economic optimum at the price ratio (nil without one): the rate where
	// the fitted slope equals the ratio, capped at the join point and kept
	// within the tested rates; AtEdge when it is one end of them.
	Econ, EconYield *float64
	AtEdge          bool
}

// Sensitivity is a model's economic optimum at another price ratio.
type Sensitivity struct {
	PriceRatio  float64
	Model       string
	Rate, Yield float64
}

// MarginPoint is one point of the margin curve of the best model: the
// fitted response and the response less the input's cost in response units.
type MarginPoint struct {
	Rate, Response, Margin float64
}

// SensitivityFactors are the multiples of the price ratio at which the
// optimum is shown again (half to one and a half times).
var SensitivityFactors = []float64{0.5, 0.75, 1, 1.25, 1.5}

// Response is the response analysis of one trait of a rate trial: the
// treatment means at their rates, the trends of the treatment sum of
// squares on the rates, the fitted models and, with a price ratio, the
// economic optimum and its sensitivity.
type Response struct {
	Trait, Unit, RateUnit string
	Points                []RatePoint // in increasing rate
	LeftOut               []string
	Trends                []stats.TrendLine
	Models                []ResponseFit
	// Best is the model with the lowest AIC among those with residual
	// degrees of freedom; "" when none has any.
	Best        string
	PriceRatio  float64 // 0: no economics
	Sensitivity []Sensitivity
	Margin      []MarginPoint // of the best model, at 21 rates over the tested range
	Notes       []string
}

// BestFit returns the best model, nil when there is none.
func (r *Response) BestFit() *ResponseFit {
	for i := range r.Models {
		if r.Models[i].Model == r.Best {
			return &r.Models[i]
		}
	}
	return nil
}

// ResponseOf analyses the response of res's trait to the rates: trends on
// the actual rates (unequal spacing allowed) with the design's error, the
// four response models fitted to the means, and with priceRatio > 0 (price
// of a unit of input in response units) the economic optimum. Treatments
// of res without a rate in rates are not part of it. When the models
// cannot be fitted it returns what it has (means, trends) with the error.
func ResponseOf(res *Result, rates Rates, priceRatio float64) (*Response, error) {
	r := &Response{Trait: res.TraitKey, Unit: res.Unit, RateUnit: rates.Unit, LeftOut: rates.LeftOut}
	var idx []int
	for i, m := range res.Means {
		if x, ok := rates.Of[m.Treatment]; ok {
			idx = append(idx, i)
			r.Points = append(r.Points, RatePoint{Treatment: m.Treatment, Rate: x, N: m.N, Mean: m.Mean, SE: m.SE})
		}
	}
	order := make([]int, len(idx))
	for i := range order {
		order[i] = i
	}
	sort.SliceStable(order, func(a, b int) bool { return r.Points[order[a]].Rate < r.Points[order[b]].Rate })
	pts, sorted := make([]RatePoint, len(order)), make([]int, len(order))
	for k, i := range order {
		pts[k], sorted[k] = r.Points[i], idx[i]
	}
	r.Points, idx = pts, sorted
	x, y := make([]float64, len(pts)), make([]float64, len(pts))
	for k, p := range pts {
		x[k], y[k] = p.Rate, p.Mean
	}
	if res.Transform != stats.NoTransform {
		r.Notes = append(r.Notes, "The trait was analysed on a transformed scale; the trends and curves are on that scale.")
	}
	if cov, err := meansCovariance(res, idx); err != nil {
		r.Notes = append(r.Notes, err.Error())
	} else {
		lines, err := stats.PolynomialTrend(y, cov, x, res.ANOVA.MSE, res.ANOVA.DFError)
		if err != nil {
			r.Notes = append(r.Notes, err.Error())
		}
		r.Trends = lines
	}
	models, notes, err := stats.FitResponse(x, y)
	if err != nil {
		return r, err
	}
	r.Notes = append(r.Notes, notes...)
	if priceRatio > 0 && !math.IsInf(priceRatio, 0) {
		r.PriceRatio = priceRatio
	}
	bestAIC := math.Inf(1)
	for _, m := range models {
		f := ResponseFit{ResponseModel: m}
		if v, ok := m.AgronomicOptimum(); ok {
			f.Optimum = &v
		}
		if r.PriceRatio > 0 {
			x, edge := m.EconomicOptimum(r.PriceRatio)
			y := m.Predict(x)
			f.Econ, f.EconYield, f.AtEdge = &x, &y, edge
			for _, k := range SensitivityFactors {
				xr, _ := m.EconomicOptimum(r.PriceRatio * k)
				r.Sensitivity = append(r.Sensitivity, Sensitivity{PriceRatio: r.PriceRatio * k, Model: m.Model, Rate: xr, Yield: m.Predict(xr)})
			}
		}
		r.Models = append(r.Models, f)
		if m.DF > 0 && m.AIC < bestAIC {
			bestAIC, r.Best = m.AIC, m.Model
		}
	}
	if b := r.BestFit(); b != nil && r.PriceRatio > 0 {
		const points = 21
		for k := 0; k < points; k++ {
			x := b.Low + (b.High-b.Low)*float64(k)/(points-1)
			y := b.Predict(x)
			r.Margin = append(r.Margin, MarginPoint{Rate: x, Response: y, Margin: y - r.PriceRatio*x})
		}
	}
	if len(models) > 0 && len(x) < 5 {
		r.Notes = append(r.Notes, "With fewer than 5 rates the plateau models are poorly determined; compare them with care.")
	}
	return r, nil
}

// meansCovariance returns the covariance of the means res.Means[idx[k]]
// divided by the error variance, from the analysis' standard errors:
// Var(m_i) = SE_i² and Cov(m_i, m_j) = (SE_i² + SE_j² − SED_ij²)/2.
func meansCovariance(res *Result, idx []int) ([]float64, error) {
	a := res.ANOVA
	if a == nil || !(a.MSE > 0) {
		return nil, errors.New("The trends need an error mean square, and this analysis has none.")
	}
	sed, nt := res.SEDMatrix(), len(res.Means)
	n := len(idx)
	cov := make([]float64, n*n)
	for a1, i := range idx {
		mi := res.Means[i]
		cov[a1*n+a1] = mi.SE * mi.SE / a.MSE
		for b1 := a1 + 1; b1 < n; b1++ {
			j := idx[b1]
			mj := res.Means[j]
			d := sed[i*nt+j]
			if !(d > 0) {
				return nil, fmt.Errorf("The analysis has no comparison of %s and %s, so the trends cannot be computed.", mi.Treatment, mj.Treatment)
			}
			v := (mi.SE*mi.SE + mj.SE*mj.SE - d*d) / (2 * a.MSE)
			cov[a1*n+b1], cov[b1*n+a1] = v, v
		}
	}
	return cov, nil
}
