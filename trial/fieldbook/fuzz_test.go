package fieldbook

import (
	"bytes"
	"math"
	"strings"
	"testing"
)

func fuzzSeeds(f *testing.F) {
	tr, _ := barley(f)
	var buf bytes.Buffer
	WriteCSV(&buf, tr, Options{Comma: ';', DecimalComma: true, CRLF: true, BOM: true})
	f.Add(buf.Bytes())
	f.Add([]byte("plot,ht,n,pc\n1,2,3,4\n2,abc,2.5,120\n2,,,\n999,1,1,1\n"))
	f.Add([]byte("sep=\t\nplot\tht\n1\t1,5\n"))
	f.Add([]byte("\xff\xfep\x00l\x00o\x00t\x00\n\x001\x00"))
	f.Add([]byte("plot,\"ht\n(cm)\",n\n1,\"2\"\"\",3\n"))
	f.Add([]byte("\ufeffPLOT;HT (cm);treatment;block\r\n3;1e400;A;x\r\n"))
}

// FuzzReadTable: ReadTable never panics and keeps row i on line i+1 of
// files without quoted line breaks.
func FuzzReadTable(f *testing.F) {
	fuzzSeeds(f)
	f.Fuzz(func(t *testing.T, data []byte) {
		table, err := ReadTable(bytes.NewReader(data))
		if err != nil {
			return
		}
		if !bytes.ContainsAny(data, "\"\r") && !bytes.HasPrefix(data, []byte{0xFF, 0xFE}) && !bytes.HasPrefix(data, []byte{0xFE, 0xFF}) {
			if lines := strings.Count(string(data), "\n") + 1; len(table) > lines {
				t.Fatalf("%d rows from %d lines", len(table), lines)
			}
		}
	})
}

// FuzzPlan: Plan and Apply never panic; an applied plan sets exactly its
// changes, and a refused one changes nothing.
func FuzzPlan(f *testing.F) {
	fuzzSeeds(f)
	f.Fuzz(func(t *testing.T, data []byte) {
		table, err := ReadTable(bytes.NewReader(data))
		if err != nil {
			return
		}
		for _, overwrite := range []bool{false, true} {
			tr := smallTrial()
			plan, err := Plan(tr, table)
			if err != nil {
				return
			}
			var sb strings.Builder
			plan.Report(&sb)
			if strings.Contains(sb.String(), "NaN") {
				t.Fatalf("report shows NaN:\n%s", sb.String())
			}
			before := clone(tr)
			n, err := plan.Apply(tr, overwrite)
			if err != nil {
				if d := sameValues(before, tr); d != "" {
					t.Fatalf("refused Apply changed %s", d)
				}
				continue
			}
			if plan.HasErrors(overwrite) || n != len(plan.Changes()) {
				t.Fatalf("applied %d of %d changes", n, len(plan.Changes()))
			}
			for _, c := range plan.Changes() {
				if v := tr.Traits[c.TraitIndex].Values[c.PlotIndex]; math.Float64bits(v) != math.Float64bits(c.New) {
					t.Fatalf("change %+v not applied: %v", c, v)
				}
			}
		}
	})
}
