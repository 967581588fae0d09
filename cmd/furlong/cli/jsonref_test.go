package cli

// The JSON document of `furlong analyze` as it was written before the
// streaming writer (export/jsonout): structs marshalled with encoding/json.
// It stays here as the reference the streamed document is checked against
// (jsonout_test.go), and as the types tests decode the output into.

import (
	"encoding/json"
	"io"
	"math"

	"furlong/stats"
	"furlong/trial/analysis"
)

type jsonANOVA struct {
	Source string   `json:"source"`
	DF     int      `json:"df"`
	SS     float64  `json:"ss"`
	MS     *float64 `json:"ms"`
	F      *float64 `json:"f"`
	P      *float64 `json:"p"`
}

type jsonMean struct {
	Treatment string   `json:"treatment"`
	N         int      `json:"n"`
	Mean      float64  `json:"mean"`
	RawMean   float64  `json:"raw_mean"`
	SE        float64  `json:"se"`
	BackMean  *float64 `json:"back_transformed_mean,omitempty"`
	// Confidence limits of the mean on the original scale.
	Lower          *float64 `json:"lower,omitempty"`
	Upper          *float64 `json:"upper,omitempty"`
	PercentOfCheck *float64 `json:"percent_of_check,omitempty"`
	LettersLSD     *string  `json:"letters_lsd"`
	LettersTukey   string   `json:"letters_tukey"`
}

type jsonPair struct {
	A      string  `json:"a"`
	B      string  `json:"b"`
	Diff   float64 `json:"diff"`
	SE     float64 `json:"se"`
	PLSD   float64 `json:"p_lsd"`
	PTukey float64 `json:"p_tukey"`
	LSD    float64 `json:"lsd"`
	HSD    float64 `json:"hsd"`
}

type jsonOutlier struct {
	Plot        int     `json:"plot"`
	Treatment   string  `json:"treatment"`
	Value       float64 `json:"value"`
	Residual    float64 `json:"residual"`
	StdResidual float64 `json:"std_residual"`
}

type jsonDiagnostics struct {
	ShapiroW       *float64      `json:"shapiro_w"`
	ShapiroP       *float64      `json:"shapiro_p"`
	LeveneF        *float64      `json:"levene_f"`
	LeveneP        *float64      `json:"levene_p"`
	BartlettK2     *float64      `json:"bartlett_k2"`
	BartlettP      *float64      `json:"bartlett_p"`
	NonAdditivityF *float64      `json:"nonadditivity_f"`
	NonAdditivityP *float64      `json:"nonadditivity_p"`
	Outliers       []jsonOutlier `json:"outliers"`
}

type jsonTrait struct {
	Trait       string           `json:"trait"`
	Error       *string          `json:"error,omitempty"`
	Design      string           `json:"design,omitempty"`
	Transform   *string          `json:"transform,omitempty"`
	N           int              `json:"n"`
	Missing     int              `json:"missing"`
	Excluded    int              `json:"excluded"`
	ANOVA       []jsonANOVA      `json:"anova"`
	GrandMean   *float64         `json:"grand_mean"`
	MSE         *float64         `json:"mse"`
	DFError     *int             `json:"df_error"`
	CVPercent   *float64         `json:"cv_percent"`
	RSquared    *float64         `json:"r_squared"`
	RelEff      *float64         `json:"relative_efficiency"`
	Means       []jsonMean       `json:"means"`
	LSD         *float64         `json:"lsd"`
	HSD         *float64         `json:"hsd"`
	LSDRange    []float64        `json:"lsd_range,omitempty"` // smallest and largest pairwise LSD
	HSDRange    []float64        `json:"hsd_range,omitempty"`
	Pairs       []jsonPair       `json:"pairs"`
	Diagnostics *jsonDiagnostics `json:"diagnostics"`
	VsCheck     []jsonVsCheck    `json:"vs_check,omitempty"`
	VsCheckInfo *jsonVsCheckInfo `json:"vs_check_method,omitempty"`
	Warnings    []string         `json:"warnings"`
}

type jsonVsCheck struct {
	Treatment string  `json:"treatment"`
	Diff      float64 `json:"diff"`
	SE        float64 `json:"se"`
	Lower     float64 `json:"lower"`
	Upper     float64 `json:"upper"`
	PTwoSided float64 `json:"p_two_sided"`
	PBetter   float64 `json:"p_better"`
	Verdict   string  `json:"verdict"`
}

type jsonVsCheckInfo struct {
	Check        string   `json:"check"`
	Method       string   `json:"method"`
	Error        *float64 `json:"error"`
	Critical     float64  `json:"critical_t"`
	HigherBetter bool     `json:"higher_is_better"`
}

func fp(v float64) *float64 { return &v }

func toJSON(oc analysis.Outcome) jsonTrait {
	jt := jsonTrait{Trait: oc.Key, ANOVA: []jsonANOVA{}, Means: []jsonMean{}, Pairs: []jsonPair{}, Warnings: []string{}}
	if oc.Err != nil {
		msg := oc.Err.Error()
		jt.Error = &msg
		return jt
	}
	r := oc.Result
	a := r.ANOVA
	jt.Design = string(r.Design)
	if r.Transform != stats.NoTransform {
		s := string(r.Transform)
		jt.Transform = &s
	}
	jt.N, jt.Missing, jt.Excluded = r.N, r.Missing, len(r.Excluded)
	for _, s := range a.Sources {
		row := jsonANOVA{Source: s.Name, DF: s.DF, SS: s.SS}
		if s.Role != stats.RoleTotal {
			row.MS = fp(s.MS)
		}
		if s.HasTest {
			row.F, row.P = fp(s.F), fp(s.P)
		}
		jt.ANOVA = append(jt.ANOVA, row)
	}
	jt.GrandMean, jt.MSE, jt.CVPercent, jt.RSquared = fp(a.GrandMean), fp(a.MSE), fp(a.CVPercent), fp(a.RSquared)
	df := a.DFError
	jt.DFError = &df
	jt.RelEff = a.RelativeEfficiency
	for _, m := range r.Means {
		jm := jsonMean{Treatment: m.Treatment, N: m.N, Mean: m.Mean, RawMean: m.RawMean, SE: m.SE, LettersTukey: m.LettersTukey}
		if r.LSDLettersGiven {
			l := m.LettersLSD
			jm.LettersLSD = &l
		}
		if r.Transform != stats.NoTransform {
			jm.BackMean = fp(m.BackMean)
		}
		jm.Lower, jm.Upper, jm.PercentOfCheck = m.Lower, m.Upper, m.PercentOfCheck
		jt.Means = append(jt.Means, jm)
	}
	jt.LSD, jt.HSD = r.LSD, r.HSD
	if r.LSDRange != nil && r.HSDRange != nil {
		jt.LSDRange = []float64{r.LSDRange.Min, r.LSDRange.Max}
		jt.HSDRange = []float64{r.HSDRange.Min, r.HSDRange.Max}
	}
	for _, p := range r.Pairs {
		jt.Pairs = append(jt.Pairs, jsonPair{A: p.A, B: p.B, Diff: p.Diff, SE: p.SE, PLSD: p.PLSD, PTukey: p.PTukey, LSD: p.LSD, HSD: p.HSD})
	}
	d := r.Diagnostics
	jd := &jsonDiagnostics{ShapiroW: d.ShapiroW, ShapiroP: d.ShapiroP, LeveneF: d.LeveneF, LeveneP: d.LeveneP,
		BartlettK2: d.BartlettK2, BartlettP: d.BartlettP, NonAdditivityF: d.NonAdditivityF, NonAdditivityP: d.NonAdditivityP,
		Outliers: []jsonOutlier{}}
	for _, o := range d.Outliers {
		jd.Outliers = append(jd.Outliers, jsonOutlier{Plot: o.Plot, Treatment: o.Treatment, Value: o.Value, Residual: o.Residual, StdResidual: o.StdResidual})
	}
	jt.Diagnostics = jd
	jt.Warnings = append(jt.Warnings, r.Warnings...)
	return jt
}

func vsCheckJSON(vc *analysis.CheckComparison) ([]jsonVsCheck, *jsonVsCheckInfo) {
	if vc == nil {
		return nil, nil
	}
	rows := make([]jsonVsCheck, len(vc.Rows))
	for i, r := range vc.Rows {
		rows[i] = jsonVsCheck{Treatment: r.Treatment, Diff: r.Diff, SE: r.SE, Lower: r.Lower, Upper: r.Upper,
			PTwoSided: r.PTwoSided, PBetter: r.PBetter, Verdict: r.Verdict}
	}
	info := &jsonVsCheckInfo{Check: vc.Check, Method: string(vc.Method), Critical: vc.Critical, HigherBetter: vc.HigherBetter}
	if !math.IsNaN(vc.Error) {
		info.Error = fp(vc.Error)
	}
	return rows, info
}

func writeAnalysisJSONStructs(w io.Writer, outcomes []analysis.Outcome) error {
	doc := struct {
		Traits []jsonTrait `json:"traits"`
	}{Traits: []jsonTrait{}}
	for _, oc := range outcomes {
		jt := toJSON(oc)
		if oc.Result != nil {
			jt.VsCheck, jt.VsCheckInfo = vsCheckJSON(oc.Result.VsCheck)
		}
		doc.Traits = append(doc.Traits, jt)
	}
	enc := json.NewEncoder(w)
	enc.SetIndent("", "  ")
	return enc.Encode(doc)
}
