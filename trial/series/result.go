package series

import (
	"math"

	"furlong/stats"
	"furlong/stats/meansep"
	stseries "furlong/stats/series"
	"furlong/trial/analysis"
)

// Trait describes the trait a series is analysed on.
type Trait struct {
	Key          string
	Name         string
	Unit         string
	Decimals     int
	HigherBetter bool
}

// Site is one trial of a series for one trait: its plot data, or (from a
// table of site means) only its entries' means.
type Site struct {
	Label  string // site and season, for example "North field 2026"; unique in the series
	Site   string // the trial's site name
	Season string
	Path   string // the trial file, "" for a table
	// Data is the trait's plot data classified by the trial's design
	// (analysis.FromTrial, or a table with a block column); nil when only
	// site means are known.
	Data *analysis.Data
	// Means, when Data is nil, are the site means of the entries.
	Means *SiteMeans
	// Checks, optional, are the treatment codes the trial marks as checks.
	Checks []string
}

// SiteMeans are the entries' means at one site (a table of site means).
type SiteMeans struct {
	Treatments []string // codes
	Names      []string // optional, same length
	Values     []float64
}

// Options control the analysis of a series.
type Options struct {
	// Check is the code of the check entry; "" takes the entry the trials
	// mark as check (the first one met), none when no trial marks one.
	Check string
	// Sites random (the default) tests entries against entry × site;
	// fixed tests them against the pooled error (combined analysis only).
	Sites stseries.Sites
	// Weighted weights the site means of a two-stage analysis by the
	// inverse of their stage-1 variances (unweighted by default). A
	// weighted analysis is always two-stage.
	Weighted bool
	Alpha    float64        // significance level, default 0.05
	Method   meansep.Method // letters by "lsd" (default) or "tukey"
	// Unprotected gives LSD letters across sites even when the entries'
	// F test is not significant.
	Unprotected bool
}

// Result is the analysis of one trait of a series.
type Result struct {
	Trait Trait

	// Method is stseries.MethodCombined ("combined") or
	// stseries.MethodTwoStage ("two-stage"); MethodReason says why, in
	// words.
	Method       string
	MethodReason string
	// Sites is how sites were taken in the test of the entries (random or
	// fixed); every output states it.
	Sites    stseries.Sites
	Weighted bool // two-stage weighted by stage-1 precision
	Alpha    float64
	// Separation is the method of the letters (LSD or Tukey).
	Separation meansep.Method

	// SiteStats, one per site in series order.
	SiteStats []SiteStats
	// Entries, one per entry of the series in order of first appearance;
	// every per-entry slice below is aligned with it.
	Entries []Entry
	// Check is the index in Entries of the check, -1 when none.
	Check int

	// Bartlett is the test of equal error variances across sites, nil
	// when fewer than two sites have an error mean square.
	Bartlett *Bartlett

	// ANOVA of the series: site, block_within_site, treatment,
	// treatment:site, error, total (combined) or site, treatment,
	// treatment:site, total (two-stage). Names are stseries.Source*.
	ANOVA stats.Table
	// DFError and MSError are the error of comparisons among the means
	// across sites (entry × site, or the pooled error with sites fixed).
	DFError int
	MSError float64
	// PTreatment is the p of the entries' F test, nil when untested.
	PTreatment *float64

	// Means across sites, one per entry.
	Means []Mean
	// LSD and HSD at Alpha when every pair of means has the same SE, nil
	// otherwise (entries missing at some sites).
	LSD, HSD *float64
	// LettersWithheld is true when the protected LSD letters were not
	// given (the entries' F test was not significant).
	LettersWithheld bool

	// Stability, one per entry; nil when it could not be computed
	// (Warnings says why).
	Stability []Stability
	// HeadToHead compares every other entry with the check (A = the
	// entry, B = the check); nil without a check. Pair compares any two.
	HeadToHead []HeadToHead

	// Cells are the entry means at each site, Cells[site][entry], NaN
	// where the entry was not tested at the site (use Cell).
	Cells [][]float64
	// PercentOfCheck[site][entry] is 100 · entry mean / check mean at the
	// site, nil where either is missing or there is no check.
	PercentOfCheck [][]*float64
	// Missing lists the entries not tested at every site.
	Missing []MissingEntry

	// Warnings are plain-language remarks a reader must see: missing
	// entries, unequal site variances, few sites, what was left out.
	Warnings []string
	// Notes describe the analysis (how sites were taken, weighting).
	Notes []string

	fit *stseries.Result
}

// SiteStats is one site's own analysis, side by side with the others.
type SiteStats struct {
	Label, Site, Season, Path string
	Entries                   int // entries tested at the site
	N                         int // plots analysed (entries, for site means)
	GrandMean                 float64
	// MSE, DFError, CVPercent, PTreatment and LSD come from the site's
	// own ANOVA; nil (0 for DFError) for site means only. LSD is the
	// site's common LSD, or the largest pairwise LSD with unequal
	// replication (LSDVaries then says so).
	MSE        *float64
	DFError    int
	CVPercent  *float64
	PTreatment *float64
	LSD        *float64
	LSDVaries  bool
	// Result is the site's full analysis (trial/analysis), nil for site
	// means only.
	Result *analysis.Result
}

// Entry is one entry of the series.
type Entry struct {
	Code  string
	Name  string
	Check bool // the series' check (Result.Check)
	Sites int  // sites where it was tested
}

// Mean is one entry's mean across sites.
type Mean struct {
	Treatment string
	Mean      float64 // least-squares mean across sites
	SE        float64
	NSites    int
	// Letters by the result's Separation method ("" when withheld);
	// LettersLSD and LettersTukey both.
	Letters, LettersLSD, LettersTukey string
	// PercentOfCheck is 100·Mean/(check's Mean), nil without a check.
	PercentOfCheck *float64
}

// Stability is an entry's response to the sites.
type Stability struct {
	Treatment string
	// Finlay–Wilkinson slope on the site index, its SE and the deviation
	// mean square; nil where the entry was at too few sites.
	Slope, SlopeSE, DeviationMS *float64
	Ecovalence                  float64 // Wricke's ecovalence
	// Ranks at each site (1 = best, ties averaged), 0 where not tested.
	Ranks []float64
}

// HeadToHead is entry A against entry B over the sites with both.
type HeadToHead struct {
	A, B                string
	Sites               int // sites with both
	Higher, Lower, Ties int // sites where A's mean was higher / lower / equal
	MeanDiff            float64
	// SE, T and P of the paired t test over sites (DF = Sites−1); nil
	// with fewer than two sites or identical differences.
	SE, T, P *float64
	DF       int
	// PercentOfB is A's mean over the common sites as a percent of B's.
	PercentOfB *float64
}

// MissingEntry is an entry not tested at every site.
type MissingEntry struct {
	Treatment string
	Sites     []string // labels of the sites without it
}

// Bartlett is the homogeneity of the site error variances.
type Bartlett struct {
	K2, P float64
	DF    int
	// MSERatio is the largest site MSE over the smallest, with the
	// sites that have them.
	MSERatio          float64
	Largest, Smallest string
	// Reading says in words what the test means for the analysis.
	Reading string
	// Flagged is true when the variances look unequal (p < 0.05 or a
	// ratio above 3).
	Flagged bool
}

// Cell returns the mean of entry i at site j, false when not tested.
func (r *Result) Cell(j, i int) (float64, bool) {
	v := r.Cells[j][i]
	return v, !math.IsNaN(v)
}

// EntryIndex returns the index of the entry with code, -1 when none.
func (r *Result) EntryIndex(code string) int {
	for i, e := range r.Entries {
		if e.Code == code {
			return i
		}
	}
	return -1
}

// PairSE is the standard error of the difference of the means across
// sites of entries i and j.
func (r *Result) PairSE(i, j int) float64 { return r.fit.PairSE(i, j) }
