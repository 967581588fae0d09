package chart

import (
	"slices"

	stseries "furlong/stats/series"
	"furlong/trial/series"
)

// FromSeries returns the chart data of one trait of a series analysis:
// name is the series' name, highlight the codes of the entries to draw in
// colour in Response besides the check (unknown codes are ignored).
func FromSeries(r *series.Result, name string, highlight []string) *Series {
	s := &Series{
		Name:  name,
		Trait: traitTitle(r.Trait.Name, r.Trait.Unit, r.Trait.Key),
		Cells: r.Cells, Check: r.Check, LowerIsBetter: !r.Trait.HigherBetter,
		Alpha: r.Alpha, SitesNote: "sites " + r.Sites.String(),
	}
	if r.Method == stseries.MethodTwoStage {
		s.SitesNote = "two-stage analysis of site means"
		if r.Weighted {
			s.SitesNote += ", weighted"
		}
	}
	for _, st := range r.SiteStats {
		s.Sites = append(s.Sites, st.Label)
	}
	s.LetterMethod = "LSD"
	if r.Separation == "tukey" {
		s.LetterMethod = "Tukey HSD"
	}
	withLetters := false
	for i, e := range r.Entries {
		s.Entries = append(s.Entries, e.Code)
		m := stseries.Mean{}
		if i < len(r.Means) {
			m = stseries.Mean{Mean: r.Means[i].Mean, SE: r.Means[i].SE, Sites: r.Means[i].NSites}
			s.Letters = append(s.Letters, r.Means[i].Letters)
			withLetters = withLetters || r.Means[i].Letters != ""
		}
		s.Means = append(s.Means, m)
		if slices.Contains(highlight, e.Code) {
			s.Highlight = append(s.Highlight, i)
		}
	}
	if !withLetters {
		s.Letters = nil
	}
	for _, st := range r.Stability {
		s.Stability = append(s.Stability, stseries.Stability{Slope: st.Slope, SlopeSE: st.SlopeSE, DeviationMS: st.DeviationMS, Ecovalence: st.Ecovalence})
	}
	return s
}
