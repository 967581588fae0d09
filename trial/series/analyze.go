package series

import (
	"errors"
	"fmt"
	"math"
	"runtime"
	"strconv"
	"strings"

	"furlong/stats"
	"furlong/stats/diag"
	"furlong/stats/meansep"
	stseries "furlong/stats/series"
	"furlong/trial"
	"furlong/trial/analysis"
)

// MinShared is the least share of a trial's entries that must also be
// tested elsewhere in the series (and at least two entries): below it the
// trials barely overlap and Analyze refuses them.
const MinShared = 0.5

// Analyze analyses trait over the sites of a series (see the package
// documentation). It needs at least two sites.
func Analyze(trait Trait, sites []Site, o Options) (*Result, error) {
	if len(sites) < 2 {
		return nil, errors.New("a series needs at least two trials (sites or seasons)")
	}
	if o.Alpha == 0 {
		o.Alpha = analysis.DefaultAlpha
	}
	if o.Method == "" {
		o.Method = meansep.LSD
	}
	r := &Result{Trait: trait, Alpha: o.Alpha, Separation: o.Method, Check: -1}
	if err := uniqueLabels(sites); err != nil {
		return nil, err
	}

	// Stage 1: each site on its own, concurrently.
	r.SiteStats = make([]SiteStats, len(sites))
	errs := make([]error, len(sites))
	transformed := false
	var workers trial.Workers
	next := make(chan int)
	for w := 0; w < min(runtime.GOMAXPROCS(0), len(sites)); w++ {
		workers.Go(func() {
			for j := range next {
				r.SiteStats[j], errs[j] = siteStats(sites[j], o)
			}
		})
	}
	for j, s := range sites {
		if s.Data != nil && s.Data.Transform != stats.NoTransform {
			transformed = true
		}
		next <- j
	}
	close(next)
	workers.Wait()
	for j, err := range errs {
		if err != nil {
			return nil, fmt.Errorf("%s: %w", sites[j].Label, err)
		}
	}
	if transformed {
		r.Warnings = append(r.Warnings, "some trials analyse this trait on a transformed scale; the series compares the means on the scale the values were recorded on")
	}

	// Entries by code, in order of first appearance.
	index := map[string]int{}
	for j, st := range r.SiteStats {
		codes, names := siteCodes(sites[j])
		for k, c := range codes {
			if _, ok := index[c]; !ok {
				index[c] = len(r.Entries)
				r.Entries = append(r.Entries, Entry{Code: c, Name: names[k]})
			}
		}
		_ = st
	}
	e := len(r.Entries)
	r.Cells = make([][]float64, len(sites))
	se := make([][]float64, len(sites))
	for j := range sites {
		r.Cells[j] = nanRow(e)
		se[j] = nanRow(e)
		codes, _ := siteCodes(sites[j])
		if res := r.SiteStats[j].Result; res != nil {
			for k, m := range res.Means {
				if m.N > 0 {
					r.Cells[j][index[codes[k]]] = m.Mean
					se[j][index[codes[k]]] = m.SE
				}
			}
		} else {
			for k, v := range sites[j].Means.Values {
				if !math.IsNaN(v) {
					r.Cells[j][index[codes[k]]] = v
				}
			}
		}
	}
	for i := range r.Entries {
		for j := range sites {
			if !math.IsNaN(r.Cells[j][i]) {
				r.Entries[i].Sites++
			}
		}
	}
	if err := checkOverlap(r, sites); err != nil {
		return nil, err
	}
	// Drop entries tested nowhere (listed but without values).
	if dropped := dropUntested(r, se); len(dropped) > 0 {
		r.Warnings = append(r.Warnings, fmt.Sprintf("%s had no values at any site and %s left out", strings.Join(dropped, ", "), plural(len(dropped), "is", "are")))
	}
	e = len(r.Entries)
	if e < 2 {
		return nil, errors.New("the series has fewer than two entries with values")
	}
	for i, en := range r.Entries {
		if en.Sites < len(sites) {
			m := MissingEntry{Treatment: en.Code}
			for j := range sites {
				if math.IsNaN(r.Cells[j][i]) {
					m.Sites = append(m.Sites, sites[j].Label)
				}
			}
			r.Missing = append(r.Missing, m)
		}
	}
	if len(r.Missing) > 0 {
		var parts []string
		for _, m := range r.Missing {
			parts = append(parts, m.Treatment+" (not at "+strings.Join(m.Sites, ", ")+")")
		}
		r.Warnings = append(r.Warnings, fmt.Sprintf("%d of %d entries were not tested at every site: %s; their means across sites are adjusted for the sites they were at", len(r.Missing), e, strings.Join(parts, "; ")))
	}

	// The check.
	if err := findCheck(r, sites, o.Check); err != nil {
		return nil, err
	}

	// Homogeneity of the site errors.
	r.Bartlett = bartlett(r.SiteStats)
	if r.Bartlett != nil && r.Bartlett.Flagged {
		r.Warnings = append(r.Warnings, r.Bartlett.Reading)
	}

	// Stage 2 (or the combined analysis).
	if err := fitSeries(r, sites, se, o); err != nil {
		return nil, err
	}
	if len(sites) < 4 {
		r.Warnings = append(r.Warnings, fmt.Sprintf("the series has only %d sites: the entry × site interaction, and so every comparison across sites, rests on few degrees of freedom", len(sites)))
	}

	// Means, letters, percent of check.
	if err := means(r, o); err != nil {
		return nil, err
	}
	// Stability.
	st, err := stseries.StabilityOf(r.Cells, !trait.HigherBetter)
	if err != nil {
		r.Warnings = append(r.Warnings, "stability could not be computed: "+err.Error())
	} else {
		r.Stability = make([]Stability, e)
		for i, s := range st {
			ranks := make([]float64, len(s.Ranks))
			for j, v := range s.Ranks {
				if !math.IsNaN(v) {
					ranks[j] = v
				}
			}
			r.Stability[i] = Stability{Treatment: r.Entries[i].Code, Slope: s.Slope, SlopeSE: s.SlopeSE, DeviationMS: s.DeviationMS, Ecovalence: s.Ecovalence, Ranks: ranks}
		}
	}
	// Percent of check and head to head.
	r.PercentOfCheck = make([][]*float64, len(sites))
	for j := range sites {
		r.PercentOfCheck[j] = make([]*float64, e)
		if r.Check >= 0 {
			for i := range r.Entries {
				r.PercentOfCheck[j][i] = stseries.PercentOf(r.Cells[j][i], r.Cells[j][r.Check])
			}
		}
	}
	if r.Check >= 0 {
		for i := range r.Entries {
			if i != r.Check {
				r.HeadToHead = append(r.HeadToHead, r.compare(i, r.Check))
			}
		}
		if n := r.Entries[r.Check].Sites; n < len(sites) {
			r.Warnings = append(r.Warnings, fmt.Sprintf("the check %s was tested at only %d of %d sites; percent of check is missing at the others", r.Entries[r.Check].Code, n, len(sites)))
		}
	}
	return r, nil
}

// Pair compares entry a with entry b (codes) over the sites with both.
func (r *Result) Pair(a, b string) (HeadToHead, error) {
	i, j := r.EntryIndex(a), r.EntryIndex(b)
	if i < 0 || j < 0 {
		missing := a
		if i >= 0 {
			missing = b
		}
		return HeadToHead{}, fmt.Errorf("%s is not an entry of the series", missing)
	}
	return r.compare(i, j), nil
}

func (r *Result) compare(i, j int) HeadToHead {
	h := stseries.Compare2(r.Cells, i, j)
	out := HeadToHead{A: r.Entries[i].Code, B: r.Entries[j].Code, Sites: h.Sites, Higher: h.Higher, Lower: h.Lower, Ties: h.Ties,
		MeanDiff: h.MeanDiff, SE: h.SE, T: h.T, P: h.P, DF: h.DF}
	var sa, sb float64
	for _, row := range r.Cells {
		if !math.IsNaN(row[i]) && !math.IsNaN(row[j]) {
			sa += row[i]
			sb += row[j]
		}
	}
	if h.Sites > 0 {
		out.PercentOfB = stseries.PercentOf(sa, sb)
	}
	return out
}

func siteCodes(s Site) (codes, names []string) {
	if s.Data != nil {
		codes = s.Data.Treatments
		names = s.Data.Names
	} else {
		codes = s.Means.Treatments
		names = s.Means.Names
	}
	if len(names) != len(codes) {
		names = make([]string, len(codes))
	}
	return codes, names
}

func nanRow(n int) []float64 {
	row := make([]float64, n)
	for i := range row {
		row[i] = math.NaN()
	}
	return row
}

func uniqueLabels(sites []Site) error {
	seen := map[string]int{}
	for j, s := range sites {
		if s.Data == nil && s.Means == nil {
			return fmt.Errorf("%s has neither plot data nor site means", s.Label)
		}
		if k, ok := seen[s.Label]; ok {
			return fmt.Errorf("trials %d and %d are both labelled %q; give each trial its own site or season", k+1, j+1, s.Label)
		}
		seen[s.Label] = j
	}
	return nil
}

// siteStats runs the site's own analysis.
func siteStats(s Site, o Options) (SiteStats, error) {
	st := SiteStats{Label: s.Label, Site: s.Site, Season: s.Season, Path: s.Path}
	if s.Data == nil {
		var sum float64
		for _, v := range s.Means.Values {
			if !math.IsNaN(v) {
				st.N++
				sum += v
			}
		}
		if st.N == 0 {
			return st, errors.New("the site has no means")
		}
		st.Entries = st.N
		st.GrandMean = sum / float64(st.N)
		return st, nil
	}
	d := *s.Data
	d.Transform = stats.NoTransform
	d.PercentOfCheck = false
	res, err := analysis.AnalyzeData(&d, analysis.Options{Alpha: o.Alpha, Method: o.Method, Unprotected: true})
	if err != nil {
		return st, err
	}
	st.Result = res
	st.N = res.N
	for _, m := range res.Means {
		if m.N > 0 {
			st.Entries++
		}
	}
	a := res.ANOVA
	st.GrandMean = a.GrandMean
	if a.DFError > 0 {
		mse, cv := a.MSE, a.CVPercent
		st.MSE, st.DFError = &mse, a.DFError
		if !math.IsNaN(cv) && !math.IsInf(cv, 0) {
			st.CVPercent = &cv
		}
	}
	if tr, ok := a.Treatment(); ok && tr.HasTest {
		p := tr.P
		st.PTreatment = &p
	}
	if res.LSD != nil {
		v := *res.LSD
		st.LSD = &v
	} else if res.LSDRange != nil {
		v := res.LSDRange.Max
		st.LSD, st.LSDVaries = &v, true
	}
	return st, nil
}

// checkOverlap refuses trials that share too few entries with the rest.
func checkOverlap(r *Result, sites []Site) error {
	for j := range sites {
		var own, shared int
		for i := range r.Entries {
			if math.IsNaN(r.Cells[j][i]) {
				continue
			}
			own++
			if r.Entries[i].Sites > 1 {
				shared++
			}
		}
		if own == 0 {
			return fmt.Errorf("%s has no values of this trait for any entry", sites[j].Label)
		}
		if shared < 2 || float64(shared) < MinShared*float64(own) {
			return fmt.Errorf("%s shares only %d of its %d entries (by treatment code) with the other trials; a series needs the same entries at its sites (at least half of each trial's entries, and at least two, tested elsewhere too); check the treatment codes or leave that trial out", sites[j].Label, shared, own)
		}
	}
	return nil
}

func dropUntested(r *Result, se [][]float64) []string {
	var dropped []string
	keep := make([]int, 0, len(r.Entries))
	for i, en := range r.Entries {
		if en.Sites == 0 {
			dropped = append(dropped, en.Code)
			continue
		}
		keep = append(keep, i)
	}
	if len(dropped) == 0 {
		return nil
	}
	ents := make([]Entry, len(keep))
	for k, i := range keep {
		ents[k] = r.Entries[i]
	}
	r.Entries = ents
	for j := range r.Cells {
		c, s := make([]float64, len(keep)), make([]float64, len(keep))
		for k, i := range keep {
			c[k], s[k] = r.Cells[j][i], se[j][i]
		}
		r.Cells[j], se[j] = c, s
	}
	return dropped
}

func findCheck(r *Result, sites []Site, want string) error {
	if want != "" {
		i := r.EntryIndex(want)
		if i < 0 {
			codes := make([]string, len(r.Entries))
			for k, e := range r.Entries {
				codes[k] = e.Code
			}
			return fmt.Errorf("the check %q is not an entry of the series; its entries are %s", want, strings.Join(codes, ", "))
		}
		r.Check = i
	} else {
		for _, s := range sites {
			var checks []string
			if s.Data != nil {
				for k, c := range s.Data.Checks {
					if c {
						checks = append(checks, s.Data.Treatments[k])
					}
				}
			}
			checks = append(checks, s.Checks...)
			for _, c := range checks {
				if i := r.EntryIndex(c); i >= 0 {
					r.Check = i
					break
				}
			}
			if r.Check >= 0 {
				break
			}
		}
	}
	if r.Check >= 0 {
		r.Entries[r.Check].Check = true
	}
	return nil
}

// bartlett tests the site MSEs for equality.
func bartlett(sts []SiteStats) *Bartlett {
	var v []float64
	var df []int
	var labels []string
	for _, s := range sts {
		if s.MSE != nil && *s.MSE > 0 && s.DFError > 0 {
			v = append(v, *s.MSE)
			df = append(df, s.DFError)
			labels = append(labels, s.Label)
		}
	}
	if len(v) < 2 {
		return nil
	}
	t, err := diag.BartlettVariances(v, df)
	if err != nil {
		return nil
	}
	hi, lo := 0, 0
	for k := range v {
		if v[k] > v[hi] {
			hi = k
		}
		if v[k] < v[lo] {
			lo = k
		}
	}
	b := &Bartlett{K2: t.ChiSquare, P: t.P, DF: t.DF, MSERatio: v[hi] / v[lo], Largest: labels[hi], Smallest: labels[lo]}
	ratio := strconv.FormatFloat(b.MSERatio, 'f', 1, 64)
	// A ratio of the largest to the smallest error mean square above about
	// 3 is the usual rule of thumb against pooling the errors of a series
	// (common practice; Gomez & Gomez 1984, ch. 8, test homogeneity before
	// combining).
	b.Flagged = b.P < 0.05 || b.MSERatio > 3
	if b.Flagged {
		b.Reading = fmt.Sprintf("The sites' error variances differ (Bartlett p = %s; the largest, at %s, is %s times the smallest, at %s): the pooled error of a combined analysis fits some sites better than others; weigh the across-site comparisons with care, or weight the site means by their precision.", pText(b.P), b.Largest, ratio, b.Smallest)
	} else {
		b.Reading = fmt.Sprintf("The sites' error variances are similar (Bartlett p = %s; the largest is %s times the smallest), so pooling them is reasonable.", pText(b.P), ratio)
	}
	return b
}

func pText(p float64) string {
	if p < 0.001 {
		return "< 0.001"
	}
	return strconv.FormatFloat(p, 'f', 3, 64)
}

// fitSeries runs the combined analysis when the series is balanced plot
// data (and not weighted), else the two-stage analysis.
func fitSeries(r *Result, sites []Site, se [][]float64, o Options) error {
	if !o.Weighted {
		if p, why := balancedPlots(r, sites); p != nil {
			fit, err := stseries.Combined(*p, o.Sites)
			if err == nil {
				r.fit = fit
				r.Method = stseries.MethodCombined
				r.MethodReason = "every entry was in every block at every site, with the same number of blocks: the combined analysis of the plots"
				return finishFit(r, fit)
			}
			if !errors.Is(err, stseries.ErrNotBalanced) {
				return err
			}
		} else {
			r.MethodReason = "two-stage analysis of the site means, because " + why
		}
	} else {
		r.MethodReason = "two-stage analysis of the site means, weighted by their stage-1 precision, as asked"
	}
	var w [][]float64
	if o.Weighted {
		ok := true
		w = make([][]float64, len(se))
		for j := range se {
			w[j] = make([]float64, len(se[j]))
			for i, s := range se[j] {
				switch {
				case math.IsNaN(r.Cells[j][i]):
					w[j][i] = math.NaN()
				case s > 0 && !math.IsNaN(s):
					w[j][i] = 1 / (s * s)
				default:
					ok = false
				}
			}
		}
		if !ok {
			w = nil
			r.Warnings = append(r.Warnings, "the site means could not be weighted (some site has no standard errors, for example site means without plots): the analysis is unweighted")
			r.MethodReason = "two-stage analysis of the site means, unweighted (the weights were not available)"
		}
	}
	fit, err := stseries.TwoStage(r.Cells, w)
	if err != nil {
		return err
	}
	r.fit = fit
	r.Method = stseries.MethodTwoStage
	r.Weighted = fit.Weighted
	if o.Sites == stseries.SitesFixed {
		r.Warnings = append(r.Warnings, "sites were declared fixed, but the two-stage analysis of site means tests entries against the entry × site interaction (sites random); the fixed-sites test needs the combined analysis of balanced plot data")
	}
	return finishFit(r, fit)
}

func finishFit(r *Result, fit *stseries.Result) error {
	r.Sites = fit.Sites
	r.ANOVA = fit.ANOVA
	r.DFError, r.MSError = fit.DF, fit.MS
	if !math.IsNaN(fit.PTreatment) {
		p := fit.PTreatment
		r.PTreatment = &p
	}
	r.Notes = append(r.Notes, fit.Notes...)
	return nil
}

// balancedPlots returns the series' plots for the combined analysis, or
// nil and the reason it does not apply.
func balancedPlots(r *Result, sites []Site) (*stseries.Plots, string) {
	blocks := 0
	n := 0
	for j, s := range sites {
		d := s.Data
		if d == nil {
			return nil, "only site means are known for " + s.Label
		}
		if d.Design != trial.RCBD {
			return nil, s.Label + " is not a randomised complete block trial"
		}
		if j == 0 {
			blocks = d.Blocks
		} else if d.Blocks != blocks {
			return nil, "the sites have different numbers of blocks"
		}
		n += len(d.Values)
	}
	if blocks < 2 {
		return nil, "the trials have fewer than two blocks"
	}
	if len(r.Missing) > 0 {
		return nil, "not every entry was tested at every site"
	}
	e := len(r.Entries)
	if n != len(sites)*blocks*e {
		return nil, "some plots are missing or excluded"
	}
	p := &stseries.Plots{Sites: len(sites), Blocks: blocks, Entries: e,
		Response: make([]float64, 0, n), Site: make([]int, 0, n), Block: make([]int, 0, n), Entry: make([]int, 0, n)}
	for j, s := range sites {
		d := s.Data
		for k, v := range d.Values {
			if math.IsNaN(v) {
				return nil, "some plots have no value"
			}
			p.Response = append(p.Response, v)
			p.Site = append(p.Site, j)
			p.Block = append(p.Block, d.Block[k])
			p.Entry = append(p.Entry, r.EntryIndex(d.Treatments[d.Treatment[k]]))
		}
	}
	return p, ""
}

// means fills the means across sites with letters and percent of check.
func means(r *Result, o Options) error {
	fit := r.fit
	sep, err := fit.Separate(o.Alpha, o.Unprotected, !r.Trait.HigherBetter)
	if err != nil {
		return err
	}
	r.Means = make([]Mean, len(r.Entries))
	var ref float64 = math.NaN()
	if r.Check >= 0 {
		ref = fit.Means[r.Check].Mean
	}
	for i, m := range fit.Means {
		mm := Mean{Treatment: r.Entries[i].Code, Mean: m.Mean, SE: m.SE, NSites: r.Entries[i].Sites}
		if sep.LSD.Letters != nil {
			mm.LettersLSD = sep.LSD.Letters[i]
		}
		if sep.Tukey.Letters != nil {
			mm.LettersTukey = sep.Tukey.Letters[i]
		}
		if o.Method == meansep.Tukey {
			mm.Letters = mm.LettersTukey
		} else {
			mm.Letters = mm.LettersLSD
		}
		mm.PercentOfCheck = stseries.PercentOf(m.Mean, ref)
		r.Means[i] = mm
	}
	r.LSD, r.HSD = sep.LSDValue, sep.TukeyHSD
	if o.Method != meansep.Tukey && sep.LSD.Withheld {
		r.LettersWithheld = true
		if sep.LSD.Note != "" {
			r.Notes = append(r.Notes, sep.LSD.Note)
		}
	}
	return nil
}

func plural(n int, one, many string) string {
	if n == 1 {
		return one
	}
	return many
}
