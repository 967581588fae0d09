package ui

import (
	"io"
	"math"
	"sync"
	"testing"
	"time"

	"fyne.io/fyne/v2"
	"fyne.io/fyne/v2/test"
	"fyne.io/fyne/v2/widget"

	"furlong/trial"
	"furlong/trial/trialfile"
)

// newTestApp builds the window on a headless test app with in-memory
// preferences. Autosaves wait an hour unless the test sets delay, so that
// they only happen when a test asks (saver.sync), never while it edits.
func newTestApp(t testing.TB, delay time.Duration) (*App, fyne.Window) {
	t.Helper()
	a := test.NewTempApp(t)
	w := test.NewTempWindow(t, widget.NewLabel(""))
	if delay == 0 {
		delay = time.Hour
	}
	u := New(a, w, Options{Version: "test", autosaveDelay: delay, pollEvery: time.Hour})
	// Deliveries of the analyser run on the test goroutine, when a test
	// pumps them (pumpAnalysis), as the real driver runs them on the main
	// goroutine.
	posts := make(chan func(), 256)
	u.compute.post = func(f func()) { posts <- f }
	testPosts.Store(u.compute, posts)
	u.recoveryDir = t.TempDir()
	w.Resize(fyne.NewSize(1366, 768))
	t.Cleanup(func() {
		u.compute.shutdown()
		u.saver.stop()
		testPosts.Delete(u.compute)
	})
	return u, w
}

func f64(v float64) *float64 { return &v }

// smallTrial is an invented RCBD: four entries (one check) in three
// blocks, with a yield trait (valid range 0–10 t/ha) and a count.
func smallTrial(t *testing.T) *trial.Trial {
	t.Helper()
	tr, err := trial.New(trial.NewOptions{
		Title:  "Test strip",
		Crop:   "wheat",
		Season: "2026",
		Treatments: []trial.Treatment{
			{Code: "A", Name: "Alpha", Role: trial.RoleEntry},
			{Code: "B", Name: "Bravo", Role: trial.RoleEntry},
			{Code: "C", Name: "Charlie", Role: trial.RoleEntry},
			{Code: "K", Name: "Check", Role: trial.RoleCheck},
		},
		Design: trial.Design{Kind: trial.RCBD, Reps: 3},
		Traits: []trial.Trait{
			{Key: "yld", Name: "Yield", Unit: "t/ha", Kind: trial.Continuous, Min: f64(0), Max: f64(10), Decimals: 2, HigherBetter: true},
			{Key: "heads", Name: "Heads", Unit: "per m²", Kind: trial.Count},
		},
		Seed: 42,
		Now:  time.Date(2026, 4, 1, 9, 0, 0, 0, time.UTC),
	})
	if err != nil {
		t.Fatal(err)
	}
	return tr
}

// enter types text into the record entry and presses Enter.
func enter(r *recordStep, text string) {
	r.entry.SetText("")
	test.Type(r.entry, text)
	r.entry.TypedKey(&fyne.KeyEvent{Name: fyne.KeyReturn})
}

func sameValue(a, b float64) bool {
	return a == b || (math.IsNaN(a) && math.IsNaN(b))
}

// encodeTo encodes t to nowhere, for timing.
func encodeTo(t *trial.Trial) error { return trialfile.Encode(io.Discard, t) }

func nan() float64 { return math.NaN() }

// testPosts holds each test app's queue of analyser deliveries.
var testPosts sync.Map // *analyser → chan func()

// pumpAnalysis runs trigger, then runs the analyser's deliveries on the
// test goroutine until a complete round of the newest generation arrived,
// and waits for its goroutine to end.
func pumpAnalysis(t testing.TB, u *App, trigger func()) *resultSet {
	t.Helper()
	v, _ := testPosts.Load(u.compute)
	posts := v.(chan func())
	trigger()
	timeout := time.After(60 * time.Second)
	for {
		if s := u.compute.current; s != nil && s.complete && s.gen == u.compute.gen {
			break
		}
		select {
		case f := <-posts:
			f()
		case <-timeout:
			t.Fatal("no complete round of analyses within a minute")
		}
	}
	u.compute.rounds.Wait()
	return u.compute.current
}
