package ui

import (
	"encoding/csv"
	"encoding/json"
	"strconv"
	"strings"
	"testing"

	"furlong/stats/meansep"
	"furlong/stats/refdata"
	"furlong/trial/analysis"
)

// warpbreaks analyses stats/refdata/warpbreaks-factorial.csv as a 2 × 3
// factorial (wool, tension).
func warpbreaks(t *testing.T) *analysis.Result {
	t.Helper()
	f, err := refdata.Open("warpbreaks-factorial.csv")
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	rows, err := csv.NewReader(f).ReadAll()
	if err != nil {
		t.Fatal(err)
	}
	ds, err := analysis.ParseTable(rows, analysis.TableColumns{Factors: []string{"wool", "tension"}, Responses: []string{"breaks"}})
	if err != nil {
		t.Fatal(err)
	}
	r, err := analysis.AnalyzeData(ds[0], analysis.Options{})
	if err != nil {
		t.Fatal(err)
	}
	return r
}

// The Effects tab's two-way table holds R 4.2.2's emmeans cell means and
// the main-effect means in its margins (stats/refdata/warpbreaks-factorial.
// expected.json), and the wool × tension interaction, significant in R
// (p = 0.021), opens on its slices.
func TestEffectsTable(t *testing.T) {
	t.Parallel()
	r := warpbreaks(t)
	raw, err := refdata.ReadFile("warpbreaks-factorial.expected.json")
	if err != nil {
		t.Fatal(err)
	}
	var ref struct {
		Effects map[string][]struct {
			Levels map[string]string `json:"levels"`
			Mean   float64           `json:"mean"`
		} `json:"effects"`
	}
	if err := json.Unmarshal(raw, &ref); err != nil {
		t.Fatal(err)
	}
	choices := effectChoices(r)
	if got := defaultEffect(r, choices); got != "Slices of wool × tension" {
		t.Errorf("default effect %q", got)
	}
	head, rows, note := effectTable(r, effectChoice{effect: "wool:tension"}, meansep.Tukey)
	if len(head) != 5 || head[0] != "wool \\ tension" || len(rows) != 3 {
		t.Fatalf("head %v rows %v", head, rows)
	}
	if !strings.Contains(note, "interaction is significant") {
		t.Errorf("note %q", note)
	}
	col := map[string]int{}
	for i, h := range head {
		col[h] = i
	}
	row := map[string]int{"A": 0, "B": 1, "Mean": 2}
	cellMean := func(s string) float64 {
		v, err := strconv.ParseFloat(strings.Fields(s)[0], 64)
		if err != nil {
			t.Fatalf("cell %q", s)
		}
		return v
	}
	dec := 0.0005 // shown at the data's decimals (0) + 1, rounded
	check := func(r, c int, want float64, what string) {
		if got := cellMean(rows[r][c]); got < want-0.05-dec || got > want+0.05+dec {
			t.Errorf("%s: %q, want %.4f", what, rows[r][c], want)
		}
	}
	for _, m := range ref.Effects["wool:tension"] {
		check(row[m.Levels["wool"]], col[m.Levels["tension"]], m.Mean, "cell "+m.Levels["wool"]+m.Levels["tension"])
	}
	for _, m := range ref.Effects["wool"] {
		check(row[m.Levels["wool"]], col["Mean"], m.Mean, "margin wool "+m.Levels["wool"])
	}
	for _, m := range ref.Effects["tension"] {
		check(row["Mean"], col[m.Levels["tension"]], m.Mean, "margin tension "+m.Levels["tension"])
	}
	// Slices: wool within each of 3 tensions, tension within each of 2 wools.
	_, srows, _ := effectTable(r, effectChoice{effect: "wool:tension", slices: true}, meansep.LSD)
	if len(srows) != 5 {
		t.Errorf("%d slices, want 5", len(srows))
	}
	// A main effect: one row per level.
	_, mrows, _ := effectTable(r, effectChoice{effect: "tension"}, meansep.LSD)
	if len(mrows) != 3 {
		t.Errorf("tension rows %v", mrows)
	}
}
