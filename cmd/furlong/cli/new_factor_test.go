package cli

import (
	"path/filepath"
	"strings"
	"testing"

	"furlong/trial"
	"furlong/trial/trialfile"
)

// TestParseFactor: the --factor forms documented in 'furlong help new'
// (the command-line contract of issue 8; the level and rate conventions
// are common practice: "0, 60, 120 kg N/ha" is how trial plans write rates).
func TestParseFactor(t *testing.T) {
	t.Parallel()
	f, err := parseFactor("N:Nitrogen rate=0,60,120 kg N/ha")
	if err != nil {
		t.Fatal(err)
	}
	if f.Key != "N" || f.Name != "Nitrogen rate" || len(f.Levels) != 3 {
		t.Fatalf("got %+v", f)
	}
	for i, want := range []struct {
		code, name string
		v          float64
	}{{"N0", "0 kg N/ha", 0}, {"N60", "60 kg N/ha", 60}, {"N120", "120 kg N/ha", 120}} {
		l := f.Levels[i]
		if l.Code != want.code || l.Name != want.name || l.Value == nil || *l.Value != want.v || l.Unit != "kg N/ha" {
			t.Errorf("level %d = %+v, want %+v", i, l, want)
		}
	}
	f, err = parseFactor("V=V1=Amberline, V2 ,V3=Coldharbour")
	if err != nil {
		t.Fatal(err)
	}
	if f.Name != "" || f.Levels[0].Name != "Amberline" || f.Levels[1].Code != "V2" || f.Levels[1].Name != "" || f.Levels[2].Value != nil {
		t.Errorf("got %+v", f)
	}
	for _, c := range []struct{ in, want string }{
		{"N", "needs its levels after '='"},
		{"1N=a,b", "must start with a letter"},
		{"V=a-b,c", `contains "-"`},
		{"V=a,b kg", "contains a space"},
		{"V=a,5 kg", "needs every level to be a number"},
	} {
		if _, err := parseFactor(c.in); err == nil || !strings.Contains(err.Error(), c.want) {
			t.Errorf("parseFactor(%q) = %v, want %q", c.in, err, c.want)
		}
	}
}

// TestNewFactorial: 'furlong new' with factors writes a trial of every new
// design that validates, reproduces from its seed and holds the
// restriction of its design (brute force over the plots: each main plot of
// a split plot holds one level of the main-plot factor; each vertical strip
// one level of the vertical factor); 'furlong show' names the factors'
// places. Wrong combinations of flags get plain messages.
func TestNewFactorial(t *testing.T) {
	t.Parallel()
	dir := t.TempDir()
	for _, c := range []struct {
		design, main string
		factors      []string
		show         string
	}{
		{"rcbd", "", []string{"N=0,60 kg N/ha", "V=V1,V2,V3"}, "factorial (N × V)"},
		{"crd", "", []string{"N=0,60 kg N/ha", "V=V1,V2"}, "factorial (N × V)"},
		{"split-plot", "V", []string{"N=0,60 kg N/ha", "V=V1,V2,V3"}, "V on main plots, N on subplots"},
		{"split-plot", "", []string{"N=0,60", "V=V1,V2", "S=early,late"}, "N on main plots, V on subplots, S on sub-subplots"},
		{"strip-plot", "", []string{"I=dry,wet", "N=0,50,100 kg N/ha"}, "I in horizontal strips"},
	} {
		out := filepath.Join(dir, c.design+c.main+itoa(len(c.factors))+".furlong")
		args := []string{"new", "-o", out, "--design", c.design, "--reps", "3", "--seed", "11", "--traits", "yield:t/ha"}
		for _, f := range c.factors {
			args = append(args, "--factor", f)
		}
		if c.main != "" {
			args = append(args, "--main-plot", c.main)
		}
		if code, _, stderr := run(t, args...); code != 0 {
			t.Fatalf("%v: exit %d: %s", args, code, stderr)
		}
		tr, err := trialfile.Load(out)
		if err != nil {
			t.Fatal(err)
		}
		if err := tr.Validate(); err != nil {
			t.Errorf("%s: %v", c.design, err)
		}
		if err := tr.CheckRandomization(); err != nil {
			t.Errorf("%s: %v", c.design, err)
		}
		if len(tr.Factors) != len(c.factors) {
			t.Errorf("%s: %d factors", c.design, len(tr.Factors))
		}
		order := tr.Design.FactorOrder(tr.Factors)
		unitLevel := map[[2]int]string{}
		for _, p := range tr.Plots {
			var u [2]int
			f := order[0]
			switch tr.Design.Kind {
			case trial.SplitPlot:
				u = [2]int{p.Block, p.MainPlot}
			case trial.StripPlot:
				u, f = [2]int{p.Block, p.Strip}, order[1]
			default:
				continue
			}
			l := tr.LevelCode(p.Treatment, f)
			if old, ok := unitLevel[u]; ok && old != l {
				t.Fatalf("%s: unit %v holds levels %s and %s", c.design, u, old, l)
			}
			unitLevel[u] = l
		}
		if code, _, stderr := run(t, "map", out, "-o", out+".svg", "--colour-by", tr.Factors[0].Key); code != 0 {
			t.Errorf("%s: map --colour-by: exit %d: %s", c.design, code, stderr)
		}
		_, stdout, _ := run(t, "show", out)
		if !strings.Contains(stdout, c.show) || !strings.Contains(stdout, "Factors (") {
			t.Errorf("%s: show lacks %q:\n%s", c.design, c.show, stdout)
		}
	}
	for _, c := range []struct {
		args []string
		want string
	}{
		{[]string{"--design", "strip-plot", "--factor", "A=a,b", "--factor", "B=c,d", "--factor", "C=e,f"}, "a strip plot needs exactly 2 factors"},
		{[]string{"--design", "split-plot", "--treatments", "4"}, "a split plot needs its treatments given as 2 or 3 factors"},
		{[]string{"--design", "rcbd", "--treatments", "4", "--factor", "A=a,b"}, "not both"},
		{[]string{"--design", "rcbd", "--treatments", "4", "--main-plot", "A"}, "give the factors with --factor"},
		{[]string{"--design", "split-plot", "--factor", "A=a,b", "--factor", "B=c,d", "--main-plot", "Q"}, `main-plot factor "Q" is not one of the trial's factors`},
		{[]string{"--design", "split-plot", "--factor", "A=a,b", "--factor", "B=c,d,e", "--plots-per-row", "4"}, "a multiple of 3"},
	} {
		args := append([]string{"new", "-o", filepath.Join(dir, "bad.furlong"), "--reps", "2", "--seed", "1"}, c.args...)
		code, _, stderr := run(t, args...)
		if code == 0 || !strings.Contains(stderr, c.want) {
			t.Errorf("%v: exit %d, stderr %q, want %q", c.args, code, stderr, c.want)
		}
	}
}
