package series

import (
	"bytes"
	"math"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"furlong/stats/refdata"
	stseries "furlong/stats/series"
)

type refLine struct {
	Source string   `json:"source"`
	DF     int      `json:"df"`
	SS     float64  `json:"ss"`
	F      *float64 `json:"f"`
	P      *float64 `json:"p"`
}

type refMean struct {
	Treatment string  `json:"treatment"`
	Mean      float64 `json:"mean"`
	LSMean    float64 `json:"ls_mean"`
	SE        float64 `json:"se"`
}

type ref struct {
	Combined []refLine `json:"combined"`
	ANOVA    []refLine `json:"anova"`
	Means    []refMean `json:"means"`
	FW       []struct {
		Treatment string  `json:"treatment"`
		Slope     float64 `json:"slope"`
	} `json:"finlay_wilkinson"`
	MSE float64 `json:"mse"`
	DF  int     `json:"df_error"`
}

func readRef(t *testing.T, name string) ref {
	t.Helper()
	var r ref
	refdata.JSON(t, name, &r)
	return r
}

func readTable(t *testing.T, name string, c TableColumns) TableTrait {
	t.Helper()
	f, err := refdata.Open(name)
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	tt, err := ReadTable(f, c)
	if err != nil {
		t.Fatal(err)
	}
	if len(tt) != 1 {
		t.Fatalf("%d traits, want 1", len(tt))
	}
	return tt[0]
}

func near(a, b, tol float64) bool { return math.Abs(a-b) <= tol*math.Max(1, math.Abs(b)) }

// TestFourSitesCombined checks the combined analysis of plot data read as
// a table against R 4.2.2 (refdata round2 series-4-sites: aov with entry
// tested against entry × site; emmeans on the site means; Finlay–Wilkinson
// slopes by lm).
func TestFourSitesCombined(t *testing.T) {
	t.Parallel()
	want := readRef(t, "series-4-sites.expected.json")
	tt := readTable(t, "series-4-sites.csv", TableColumns{Site: "site", Block: "block", Treatment: "entry", Responses: []string{"yield"}})
	r, err := Analyze(tt.Trait, tt.Sites, Options{Check: "V1"})
	if err != nil {
		t.Fatal(err)
	}
	if r.Method != stseries.MethodCombined || r.Sites != stseries.SitesRandom {
		t.Fatalf("method %s, sites %s; want combined, random", r.Method, r.Sites)
	}
	for _, w := range want.Combined {
		var got *refLine
		for _, l := range r.ANOVA {
			if l.Name == w.Source {
				got = &refLine{DF: l.DF, SS: l.SS}
				if l.HasTest {
					f, p := l.F, l.P
					got.F, got.P = &f, &p
				}
			}
		}
		if got == nil {
			t.Fatalf("no %s line", w.Source)
		}
		if got.DF != w.DF || !near(got.SS, w.SS, 1e-9) {
			t.Errorf("%s: df %d ss %g, want %d %g (R aov)", w.Source, got.DF, got.SS, w.DF, w.SS)
		}
		if w.F != nil && (got.F == nil || !near(*got.F, *w.F, 1e-9) || !near(*got.P, *w.P, 1e-7)) {
			t.Errorf("%s: F test %v, want F %g p %g (R aov)", w.Source, got.F, *w.F, *w.P)
		}
	}
	for _, w := range want.Means {
		i := r.EntryIndex(w.Treatment)
		if i < 0 {
			t.Fatalf("no entry %s", w.Treatment)
		}
		m := r.Means[i]
		if !near(m.Mean, w.Mean, 1e-9) || !near(m.SE, w.SE, 1e-9) || m.NSites != 4 {
			t.Errorf("%s: mean %g se %g sites %d, want %g %g 4 (R emmeans)", w.Treatment, m.Mean, m.SE, m.NSites, w.Mean, w.SE)
		}
		if pc := m.PercentOfCheck; pc == nil || !near(*pc, 100*w.Mean/want.Means[0].Mean, 1e-9) {
			t.Errorf("%s: percent of check %v (from the R means)", w.Treatment, pc)
		}
	}
	for _, w := range want.FW {
		s := r.Stability[r.EntryIndex(w.Treatment)]
		if s.Slope == nil || !near(*s.Slope, w.Slope, 1e-9) {
			t.Errorf("%s: slope %v, want %g (R lm)", w.Treatment, s.Slope, w.Slope)
		}
	}
	if len(r.SiteStats) != 4 || r.SiteStats[0].DFError != 10 || r.SiteStats[0].LSD == nil {
		t.Errorf("site stats %+v: want 4 sites with 10 error df (RCBD 6 entries × 3 blocks, common practice) and an LSD", r.SiteStats)
	}
	if r.Bartlett == nil || r.Bartlett.DF != 3 || r.Bartlett.Reading == "" {
		t.Errorf("Bartlett %+v: want 3 df (4 sites, common practice)", r.Bartlett)
	}
	if len(r.HeadToHead) != 5 || r.HeadToHead[0].B != "V1" || r.HeadToHead[0].Sites != 4 {
		t.Errorf("head to head %+v", r.HeadToHead)
	}
	// Fixed sites: entries against the pooled error (Gomez & Gomez 1984, ch. 8).
	rf, err := Analyze(tt.Trait, tt.Sites, Options{Sites: stseries.SitesFixed})
	if err != nil {
		t.Fatal(err)
	}
	tr, _ := rf.ANOVA.Treatment()
	er, _ := rf.ANOVA.Error()
	if rf.Sites != stseries.SitesFixed || !near(tr.F, tr.MS/er.MS, 1e-12) {
		t.Errorf("fixed sites: F %g, want MS(entry)/MS(error) %g", tr.F, tr.MS/er.MS)
	}
}

// TestBarleyTwoStage checks the two-stage analysis of a table of site
// means against R 4.2.2 aov and emmeans on Immer, Hayes & Powers (1934),
// 1931 (lattice::barley), complete and with two site means missing.
func TestBarleyTwoStage(t *testing.T) {
	t.Parallel()
	for _, name := range []string{"barley-1931-rcbd", "barley-1931-rcbd-missing"} {
		want := readRef(t, name+".expected.json")
		tt := readTable(t, name+".csv", TableColumns{Site: "site", Treatment: "variety", Responses: []string{"yield"}})
		r, err := Analyze(tt.Trait, tt.Sites, Options{})
		if err != nil {
			t.Fatal(err)
		}
		if r.Method != stseries.MethodTwoStage {
			t.Fatalf("%s: method %s", name, r.Method)
		}
		for _, w := range want.ANOVA {
			src := map[string]string{"site": stseries.SourceSite, "variety": stseries.SourceEntry, "Residuals": stseries.SourceEntryBySite}[w.Source]
			for _, l := range r.ANOVA {
				if l.Name == src && (l.DF != w.DF || !near(l.SS, w.SS, 1e-6)) {
					t.Errorf("%s %s: df %d ss %g, want %d %g (R aov)", name, src, l.DF, l.SS, w.DF, w.SS)
				}
			}
		}
		for _, w := range want.Means {
			m := r.Means[r.EntryIndex(w.Treatment)]
			if !near(m.Mean, w.LSMean, 1e-6) || !near(m.SE, w.SE, 1e-6) {
				t.Errorf("%s %s: mean %g se %g, want %g %g (R emmeans)", name, w.Treatment, m.Mean, m.SE, w.LSMean, w.SE)
			}
		}
		if strings.HasSuffix(name, "missing") && len(r.Missing) != 2 {
			t.Errorf("%s: missing %+v, want two entries", name, r.Missing)
		}
	}
}

func TestRefusals(t *testing.T) {
	t.Parallel()
	// Barely overlapping trials (common practice: a series compares the same entries).
	csv := "site,trt,y\nA,x1,1\nA,x2,2\nA,x3,3\nA,x4,4\nB,x1,1.5\nB,y2,2\nB,y3,3\nB,y4,4\n"
	tt, err := ReadTable(strings.NewReader(csv), TableColumns{Site: "site", Treatment: "trt"})
	if err != nil {
		t.Fatal(err)
	}
	if _, err := Analyze(tt[0].Trait, tt[0].Sites, Options{}); err == nil || !strings.Contains(err.Error(), "shares only 1 of its 4 entries") {
		t.Errorf("barely overlapping: %v", err)
	}
	if _, err := Analyze(tt[0].Trait, tt[0].Sites, Options{Check: "zz"}); err == nil {
		t.Error("an unknown check was accepted")
	}
}

func TestFileRoundTrip(t *testing.T) {
	t.Parallel()
	dir := t.TempDir()
	a := filepath.Join(dir, "north.furlong")
	if err := os.WriteFile(a, []byte("trial bytes"), 0o644); err != nil {
		t.Fatal(err)
	}
	sp := filepath.Join(dir, "season"+FileExt)
	ref, err := Ref(sp, a)
	if err != nil {
		t.Fatal(err)
	}
	if ref.Path != "north.furlong" {
		t.Errorf("path %q, want relative", ref.Path)
	}
	s := &Series{Name: "Season A", Trials: []TrialRef{ref, {Path: "gone.furlong", Size: 3, SHA256: strings.Repeat("0", 64)}}, Options: FileOptions{Trait: "yield", Sites: "fixed"}}
	if err := Save(sp, s); err != nil {
		t.Fatal(err)
	}
	got, probs, err := Load(sp)
	if err != nil {
		t.Fatal(err)
	}
	if got.Name != "Season A" || len(got.Trials) != 2 || got.Options.Sites != "fixed" || got.Trials[0].SHA256 != ref.SHA256 {
		t.Errorf("round trip: %+v", got)
	}
	if len(probs) != 1 || !probs[0].Missing || !strings.Contains(probs[0].Msg, "gone.furlong") {
		t.Errorf("problems %+v, want gone.furlong missing", probs)
	}
	if err := os.WriteFile(a, []byte("trial bytes, changed"), 0o644); err != nil {
		t.Fatal(err)
	}
	probs = Check(sp, got)
	if len(probs) != 2 || !probs[0].Changed {
		t.Errorf("problems %+v, want north.furlong changed", probs)
	}
	var buf bytes.Buffer
	buf.WriteString(`{"format":"furlong-series","version":99,"trials":[]}`)
	if _, err := Decode(&buf); err == nil || !strings.Contains(err.Error(), "newer") {
		t.Errorf("future version: %v", err)
	}
}
