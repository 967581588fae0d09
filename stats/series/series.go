package series

import (
	"errors"
	"fmt"
	"math"

	"gonum.org/v1/gonum/mathext"
	"gonum.org/v1/gonum/stat/distuv"

	"furlong/stats"
	"furlong/stats/meansep"
)

// Sites says whether the sites of a series are a sample of the region the
// entries are meant for (random, the default) or the only sites of
// interest (fixed). It decides what the entries are tested against.
type Sites int

const (
	// SitesRandom tests entries against the entry × site interaction.
	SitesRandom Sites = iota
	// SitesFixed tests entries against the pooled error of the plots.
	SitesFixed
)

// String is "random" or "fixed".
func (s Sites) String() string {
	if s == SitesFixed {
		return "fixed"
	}
	return "random"
}

// Method names of the two analyses.
const (
	MethodCombined = "combined"
	MethodTwoStage = "two-stage"
)

// Source names of the lines of a series ANOVA, as in the JSON output.
const (
	SourceSite            = "site"
	SourceBlockWithinSite = "block_within_site"
	SourceEntry           = "treatment"
	SourceEntryBySite     = "treatment:site"
	SourceError           = "error"
	SourceTotal           = "total"
)

// ErrNotBalanced is returned by Combined when some entry is missing from
// some block of some site; TwoStage on the site means is the analysis
// for such a series.
var ErrNotBalanced = errors.New("the series is not balanced (some entry is missing at some site or block), so the combined analysis of plots does not apply; use the two-stage analysis of site means")

// Plots is the plot data of a series for Combined: per plot the response
// and the level indices of its site, its block within the site and its
// entry.
type Plots struct {
	Response []float64
	Site     []int // 0..Sites-1
	Block    []int // 0..Blocks-1, the block's number within its site
	Entry    []int // 0..Entries-1
	Sites    int
	Blocks   int // blocks per site
	Entries  int
}

// Mean is one entry's mean across sites.
type Mean struct {
	Mean  float64 // least-squares mean across sites
	SE    float64
	Sites int // sites where the entry was tested
}

// Result is the analysis of one trait of a series across sites.
type Result struct {
	Method   string // MethodCombined or MethodTwoStage
	Sites    Sites
	Weighted bool // two-stage with stage-1 weights

	// ANOVA lines: site, block_within_site (combined only), treatment,
	// treatment:site, error (combined only), total.
	ANOVA stats.Table
	Means []Mean // per entry, in entry order
	// DF and MS are the degrees of freedom and mean square of the error of
	// comparisons among entry means (entry × site with sites random or in
	// the two-stage analysis; pooled error with sites fixed).
	DF int
	MS float64
	// PTreatment is the p-value of the entries' F test.
	PTreatment float64
	// Cells are the site × entry means the analysis used (NaN where an
	// entry was not tested at a site).
	Cells [][]float64
	// Notes are plain-language remarks on the analysis.
	Notes []string

	pairSE func(i, j int) float64
}

// PairSE is the standard error of the difference of the across-site means
// of entries i and j.
func (r *Result) PairSE(i, j int) float64 {
	if i == j {
		return 0
	}
	return r.pairSE(i, j)
}

// Separation is the mean separation of the entries of a series.
type Separation struct {
	Compare       *meansep.Result
	LSD, Tukey    meansep.Lettering
	LSDValue      *float64 // common LSD when every pair has the same SE
	TukeyHSD      *float64
	LowerIsBetter bool
}

// Separate compares every pair of entry means with the series' error
// (Result.DF, Result.PairSE) and gives protected LSD and Tukey letters.
func (r *Result) Separate(alpha float64, unprotected, lowerIsBetter bool) (*Separation, error) {
	means := make([]float64, len(r.Means))
	for i, m := range r.Means {
		means[i] = m.Mean
	}
	c, err := meansep.Compare(means, meansep.PairSEFunc(r.PairSE), r.DF, alpha)
	if err != nil {
		return nil, err
	}
	opt := meansep.LetterOptions{LowerIsBetter: lowerIsBetter}
	lsd, err := c.LSDLetters(r.PTreatment, unprotected, opt)
	if err != nil {
		return nil, err
	}
	tk, err := c.TukeyLetters(opt)
	if err != nil {
		return nil, err
	}
	return &Separation{Compare: c, LSD: lsd, Tukey: tk, LSDValue: c.LSD, TukeyHSD: c.HSD, LowerIsBetter: lowerIsBetter}, nil
}

func fSurvival(f float64, d1, d2 int) float64 {
	if !(f > 0) {
		return 1
	}
	x := float64(d2) / (float64(d2) + float64(d1)*f)
	return mathext.RegIncBeta(float64(d2)/2, float64(d1)/2, x)
}

func line(name string, role stats.Role, df int, ss float64) stats.Source {
	s := stats.Source{Name: name, Role: role, DF: df, SS: ss}
	if df > 0 {
		s.MS = ss / float64(df)
	}
	return s
}

func test(s *stats.Source, against stats.Source) {
	if against.DF < 1 || !(against.MS > 0) || s.DF < 1 {
		return
	}
	s.HasTest = true
	s.F = s.MS / against.MS
	s.P = fSurvival(s.F, s.DF, against.DF)
}

// Combined is the combined analysis of variance of balanced plot data of
// a series of RCBD trials (see the package documentation). Every entry
// must occur exactly once in every block of every site, with a finite
// response; otherwise ErrNotBalanced.
func Combined(p Plots, sites Sites) (*Result, error) {
	s, b, e := p.Sites, p.Blocks, p.Entries
	n := len(p.Response)
	if s < 2 {
		return nil, errors.New("a combined analysis needs at least two sites")
	}
	if e < 2 {
		return nil, errors.New("a combined analysis needs at least two entries")
	}
	if b < 2 {
		return nil, errors.New("a combined analysis of plots needs at least two blocks at each site")
	}
	if len(p.Site) != n || len(p.Block) != n || len(p.Entry) != n {
		return nil, errors.New("every plot needs a site, a block and an entry")
	}
	if n != s*b*e {
		return nil, ErrNotBalanced
	}
	seen := make([]bool, n)
	for i, y := range p.Response {
		si, bi, ei := p.Site[i], p.Block[i], p.Entry[i]
		if si < 0 || si >= s || bi < 0 || bi >= b || ei < 0 || ei >= e {
			return nil, fmt.Errorf("plot %d has a site, block or entry index out of range", i+1)
		}
		if math.IsNaN(y) || math.IsInf(y, 0) {
			return nil, ErrNotBalanced
		}
		k := (si*b+bi)*e + ei
		if seen[k] {
			return nil, ErrNotBalanced
		}
		seen[k] = true
	}
	// Work on values centred on the first plot, so that a large common
	// offset does not cost digits in the sums of squares.
	c0 := p.Response[0]
	var tot float64
	siteSum := make([]float64, s)
	blockSum := make([]float64, s*b)
	entrySum := make([]float64, e)
	cellSum := make([]float64, s*e)
	for i, y := range p.Response {
		d := y - c0
		tot += d
		siteSum[p.Site[i]] += d
		blockSum[p.Site[i]*b+p.Block[i]] += d
		entrySum[p.Entry[i]] += d
		cellSum[p.Site[i]*e+p.Entry[i]] += d
	}
	gm := tot / float64(n)
	siteM := scale(siteSum, float64(b*e))
	blockM := scale(blockSum, float64(e))
	entryM := scale(entrySum, float64(s*b))
	cellM := scale(cellSum, float64(b))
	var ssSite, ssBlock, ssEntry, ssInt, ssErr, ssTot float64
	for j := 0; j < s; j++ {
		ssSite += sq(siteM[j] - gm)
		for k := 0; k < b; k++ {
			ssBlock += sq(blockM[j*b+k] - siteM[j])
		}
		for i := 0; i < e; i++ {
			ssInt += sq(cellM[j*e+i] - entryM[i] - siteM[j] + gm)
		}
	}
	for i := 0; i < e; i++ {
		ssEntry += sq(entryM[i] - gm)
	}
	for i, y := range p.Response {
		d := y - c0
		si, bi, ei := p.Site[i], p.Block[i], p.Entry[i]
		ssErr += sq(d - cellM[si*e+ei] - blockM[si*b+bi] + siteM[si])
		ssTot += sq(d - gm)
	}
	ssSite *= float64(b * e)
	ssBlock *= float64(e)
	ssEntry *= float64(s * b)
	ssInt *= float64(b)

	siteL := line(SourceSite, stats.RoleNuisance, s-1, ssSite)
	blockL := line(SourceBlockWithinSite, stats.RoleBlock, s*(b-1), ssBlock)
	entryL := line(SourceEntry, stats.RoleTreatment, e-1, ssEntry)
	intL := line(SourceEntryBySite, stats.RoleInteraction, (e-1)*(s-1), ssInt)
	errL := line(SourceError, stats.RoleError, s*(b-1)*(e-1), ssErr)
	totL := stats.Source{Name: SourceTotal, Role: stats.RoleTotal, DF: n - 1, SS: ssTot}
	against := intL
	if sites == SitesFixed {
		against = errL
	}
	test(&entryL, against)
	test(&intL, errL)

	r := &Result{
		Method:     MethodCombined,
		Sites:      sites,
		ANOVA:      stats.Table{siteL, blockL, entryL, intL, errL, totL},
		DF:         against.DF,
		MS:         against.MS,
		PTreatment: entryL.P,
	}
	if !entryL.HasTest {
		r.PTreatment = math.NaN()
		r.Notes = append(r.Notes, "the entries cannot be tested: the mean square they are compared with is 0")
	}
	se := math.Sqrt(against.MS / float64(s*b))
	sed := math.Sqrt(2 * against.MS / float64(s*b))
	r.pairSE = func(i, j int) float64 { return sed }
	r.Means = make([]Mean, e)
	for i := range r.Means {
		r.Means[i] = Mean{Mean: c0 + entryM[i], SE: se, Sites: s}
	}
	r.Cells = make([][]float64, s)
	for j := range r.Cells {
		r.Cells[j] = make([]float64, e)
		for i := range r.Cells[j] {
			r.Cells[j][i] = c0 + cellM[j*e+i]
		}
	}
	if sites == SitesRandom {
		r.Notes = append(r.Notes, "sites are taken as random (a sample of the region): entries are tested against the entry × site interaction")
	} else {
		r.Notes = append(r.Notes, "sites are taken as fixed (only these sites are of interest): entries are tested against the pooled error of the plots")
	}
	return r, nil
}

// TwoStage is the second stage of a two-stage analysis: the additive
// model site + entry fitted to cells, a table of site × entry means
// (cells[site][entry], NaN where the entry was not tested at the site).
// With weights (same shape: the inverse of each mean's stage-1 variance,
// or nil for an unweighted analysis) the fit is weighted least squares and
// the residual mean square is the scale of the weights (see the package
// documentation).
func TwoStage(cells [][]float64, weights [][]float64) (*Result, error) {
	s := len(cells)
	if s < 2 {
		return nil, errors.New("a series needs at least two sites")
	}
	e := len(cells[0])
	if e < 2 {
		return nil, errors.New("a series needs at least two entries")
	}
	var y []float64
	var site, entry []int
	var w []float64
	perEntry := make([]int, e)
	for j, row := range cells {
		if len(row) != e {
			return nil, errors.New("every site needs a value (or a gap) for every entry")
		}
		for i, v := range row {
			if math.IsNaN(v) {
				continue
			}
			if math.IsInf(v, 0) {
				return nil, fmt.Errorf("the mean of entry %d at site %d is not a number", i+1, j+1)
			}
			y = append(y, v)
			site = append(site, j)
			entry = append(entry, i)
			perEntry[i]++
			if weights != nil {
				wt := weights[j][i]
				if !(wt > 0) || math.IsInf(wt, 0) {
					return nil, fmt.Errorf("the weight of entry %d at site %d must be a positive number", i+1, j+1)
				}
				w = append(w, wt)
			}
		}
	}
	for i, c := range perEntry {
		if c == 0 {
			return nil, fmt.Errorf("entry %d was not tested at any site", i+1)
		}
	}
	var r *Result
	var err error
	if weights == nil {
		r, err = twoStageOLS(y, site, entry, s, e)
	} else {
		r, err = twoStageWLS(y, w, site, entry, s, e)
	}
	if err != nil {
		return nil, err
	}
	r.Cells = make([][]float64, s)
	for j := range cells {
		r.Cells[j] = append([]float64(nil), cells[j]...)
	}
	for i := range r.Means {
		r.Means[i].Sites = perEntry[i]
	}
	return r, nil
}

func twoStageOLS(y []float64, site, entry []int, s, e int) (*Result, error) {
	a, err := stats.Fit(stats.Model{
		Response:  y,
		Treatment: stats.Factor{Name: SourceEntry, Levels: e, Index: entry},
		Nuisance:  []stats.Factor{{Name: SourceSite, Levels: s, Index: site, Role: stats.RoleNuisance}},
	})
	if err != nil {
		return nil, fmt.Errorf("the two-stage analysis could not be fitted: %w", err)
	}
	if a.DFError < 1 {
		return nil, errors.New("the series has no degrees of freedom left for the entry × site interaction: it needs more sites or more entries in common")
	}
	tr, _ := a.Treatment()
	var siteL stats.Source
	for _, l := range a.Sources {
		if l.Role == stats.RoleNuisance {
			siteL = l
		}
	}
	er, _ := a.Error()
	to, _ := a.Total()
	siteL.HasTest, siteL.F, siteL.P = false, 0, 0
	siteL.Name = SourceSite
	tr.Name = SourceEntry
	er.Name, er.Role = SourceEntryBySite, stats.RoleInteraction
	to.Name = SourceTotal
	r := &Result{
		Method:     MethodTwoStage,
		Sites:      SitesRandom,
		ANOVA:      stats.Table{siteL, tr, er, to},
		DF:         a.DFError,
		MS:         a.MSE,
		PTreatment: tr.P,
		pairSE:     a.PairSE,
	}
	if !tr.HasTest {
		r.PTreatment = math.NaN()
	}
	r.Means = make([]Mean, e)
	for i, m := range a.Means {
		r.Means[i] = Mean{Mean: m.Mean, SE: m.SE}
	}
	if !a.Balanced {
		r.Notes = append(r.Notes, "not every entry was tested at every site: the means across sites are least-squares means adjusted for the sites each entry was at, and the sums of squares no longer add up")
	}
	r.Notes = append(r.Notes, "two-stage analysis of the site means: entries are tested against the entry × site interaction (sites as random)")
	return r, nil
}

// sq is x².
func sq(x float64) float64 { return x * x }

func scale(v []float64, d float64) []float64 {
	out := make([]float64, len(v))
	for i, x := range v {
		out[i] = x / d
	}
	return out
}

// tTwoSided is the two-sided p of a t statistic with df degrees of freedom.
func tTwoSided(t float64, df int) float64 {
	return 2 * distuv.StudentsT{Mu: 0, Sigma: 1, Nu: float64(df)}.Survival(math.Abs(t))
}
