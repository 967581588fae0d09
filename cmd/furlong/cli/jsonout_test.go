package cli

import (
	"bytes"
	"context"
	"encoding/json"
	"fmt"
	"math/rand/v2"
	"os"
	"path/filepath"
	"reflect"
	"strings"
	"testing"

	"furlong/export/jsonout"
	"furlong/sampledata"
	"furlong/stats/refdata"
	"furlong/trial/analysis"
	"furlong/trial/trialfile"
)

// jsonCase is one dataset analysed through `furlong analyze --format json`.
type jsonCase struct {
	name string
	args []string // after "analyze"
}

// writeJSONCases writes the invented inputs of the cases below into dir:
// the demo trial, a table whose treatment codes need every JSON escape,
// and a 120-entry RCBD with unequal replication and one response that
// cannot be analysed.
func writeJSONCases(t *testing.T, dir string) []jsonCase {
	t.Helper()
	demo := filepath.Join(dir, "demo.furlong")
	if err := os.WriteFile(demo, sampledata.Bytes(), 0o644); err != nil {
		t.Fatal(err)
	}
	// Codes with quotes, a backslash, HTML characters, a tab, non-ASCII
	// letters and the line separator U+2028: encoding/json escapes some
	// of them (\u003c, \u0026, \u2028) and the streamed output must match.
	var b strings.Builder
	b.WriteString("code,block,y,flat\n")
	codes := []string{`say "hi"`, `back\slash`, "<b>&amp;", "tab\there", "Kärnten-ß", "line\u2028sep", "plain"}
	rng := rand.New(rand.NewPCG(7, 11))
	for blk := 1; blk <= 3; blk++ {
		for i, c := range codes {
			q := `"` + strings.ReplaceAll(c, `"`, `""`) + `"`
			fmt.Fprintf(&b, "%s,%d,%.3f,5\n", q, blk, 10+float64(i)+rng.NormFloat64())
		}
	}
	odd := filepath.Join(dir, "odd-codes.csv")
	if err := os.WriteFile(odd, []byte(b.String()), 0o644); err != nil {
		t.Fatal(err)
	}
	// 120 entries × 3 blocks with a few missing plots: 7,140 pairs with
	// their own SEs, p-values down to 1e-300 (exponent form).
	b.Reset()
	b.WriteString("entry,block,yield\n")
	for blk := 1; blk <= 3; blk++ {
		for e := 1; e <= 120; e++ {
			v := fmt.Sprintf("%.4f", 3+float64(e%17)*0.4+0.05*rng.NormFloat64())
			if (e+7*blk)%41 == 0 {
				v = "NA"
			}
			fmt.Fprintf(&b, "E%d,%d,%s\n", e, blk, v)
		}
	}
	big := filepath.Join(dir, "rcbd-120.csv")
	if err := os.WriteFile(big, []byte(b.String()), 0o644); err != nil {
		t.Fatal(err)
	}
	return []jsonCase{
		{"demo trial, one trait, log", []string{demo, "--trait", "yield", "--transform", "log"}},
		{"plant growth (CRD)", []string{refdata.File(t, "plant-growth.csv"), "--treatment", "treatment", "--response", "weight"}},
		{"insect sprays", []string{refdata.File(t, "insect-sprays-sqrt.csv"), "--treatment", "treatment", "--response", "sqrt_count", "--transform", "sqrt"}},
		{"barley RCBD missing", []string{refdata.File(t, "barley-1931-rcbd-missing.csv"), "--treatment", "variety", "--block", "site"}},
		{"orchard Latin square", []string{refdata.File(t, "orchard-sprays-latin.csv"), "--treatment", "treatment", "--row", "row", "--column", "col"}},
		{"Dunnett vs check", []string{refdata.File(t, "dunnett-example.csv"), "--treatment", "entry", "--block", "block", "--check", "STD"}},
		{"escaped codes + failed trait", []string{odd, "--treatment", "code", "--block", "block", "--unprotected"}},
		{"120 entries", []string{big, "--treatment", "entry", "--block", "block"}},
	}
}

// outcomesOf analyses a case as runAnalyze does, for the reference encoder.
func outcomesOf(t *testing.T, c jsonCase) []analysis.Outcome {
	t.Helper()
	var o analyzeOptions
	fs := analyzeFlags(&o)
	if err := fs.Parse(c.args[1:]); err != nil {
		t.Fatal(err)
	}
	tf, err := parseTransform(o.transform)
	if err != nil {
		t.Fatal(err)
	}
	opts := analysis.Options{Alpha: o.alpha, Unprotected: o.unprotected, Transform: tf}
	ctx := context.Background()
	var outs []analysis.Outcome
	if isCSV(c.args[0]) {
		outs, err = analyzeCSV(ctx, o, c.args[0], opts)
	} else {
		tr, lerr := trialfile.Load(c.args[0])
		if lerr != nil {
			t.Fatal(lerr)
		}
		var keys []string
		if o.trait != "" {
			keys = []string{o.trait}
		}
		outs, err = analysis.AnalyzeAll(ctx, tr, keys, opts)
	}
	if err != nil {
		t.Fatal(err)
	}
	if err := analysis.CompareAllWithCheck(outs, o.check, false); err != nil {
		t.Fatal(err)
	}
	return outs
}

// TestJSONStreamMatchesEncodingJSON checks the streamed JSON document
// against the reference: the same outcomes marshalled from structs by
// encoding/json (jsonref_test.go, the encoder used before the stream).
// After json.Compact both must be the same bytes (same keys in the same
// order, same null and left-out members, the same shortest number forms
// and string escapes), and both decode to equal values.
func TestJSONStreamMatchesEncodingJSON(t *testing.T) {
	t.Parallel()
	cases := writeJSONCases(t, t.TempDir())
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			t.Parallel()
			if testing.Short() && strings.HasPrefix(c.name, "demo") {
				t.Skip("the demo trial's comparisons with the check take seconds")
			}
			var ref bytes.Buffer
			if err := writeAnalysisJSONStructs(&ref, outcomesOf(t, c)); err != nil {
				t.Fatal(err)
			}
			code, out, stderr := run(t, append([]string{"analyze", "--format", "json"}, c.args...)...)
			if code != 0 && code != ExitFailure {
				t.Fatalf("exit %d: %s", code, stderr)
			}
			var a, b bytes.Buffer
			if err := json.Compact(&a, ref.Bytes()); err != nil {
				t.Fatal(err)
			}
			if err := json.Compact(&b, []byte(out)); err != nil {
				t.Fatalf("the streamed output is not JSON: %v", err)
			}
			if !bytes.Equal(a.Bytes(), b.Bytes()) {
				i := 0
				for i < a.Len() && i < b.Len() && a.Bytes()[i] == b.Bytes()[i] {
					i++
				}
				lo := max(0, i-120)
				t.Fatalf("streamed JSON differs from encoding/json at byte %d:\nref: %s\ngot: %s", i,
					a.Bytes()[lo:min(a.Len(), i+80)], b.Bytes()[lo:min(b.Len(), i+80)])
			}
			var va, vb any
			if err := json.Unmarshal(ref.Bytes(), &va); err != nil {
				t.Fatal(err)
			}
			if err := json.Unmarshal([]byte(out), &vb); err != nil {
				t.Fatal(err)
			}
			if !reflect.DeepEqual(va, vb) {
				t.Fatal("the documents decode to different values")
			}
			if !strings.HasSuffix(out, "}\n") {
				t.Errorf("the document should end with a newline, as encoding/json's Encoder writes it")
			}
		})
	}
}

// TestJSONStreamNumbers checks the number form against encoding/json's
// (a general-purpose library) on awkward values: exponent limits,
// subnormals, negative zero, and shortest round trip.
func TestJSONStreamNumbers(t *testing.T) {
	t.Parallel()
	vals := []float64{0, 1, -1, 0.1, 1.0 / 3, 1e-6, 9.999999999999999e-7, 1e-7, 1e20, 1e21, 123456789012345680000,
		5e-324, 1.7976931348623157e308, -2.5e-10, 0.000001234, 3e100}
	rng := rand.New(rand.NewPCG(1, 2))
	for range 2000 {
		vals = append(vals, rng.NormFloat64()*float64(int64(1)<<rng.IntN(60))/float64(int64(1)<<rng.IntN(60)))
	}
	for _, v := range vals {
		want, err := json.Marshal(v)
		if err != nil {
			t.Fatal(err)
		}
		if got := jsonout.AppendNumber(nil, v); string(got) != string(want) {
			t.Errorf("AppendNumber(%v) = %s, encoding/json writes %s", v, got, want)
		}
	}
}
