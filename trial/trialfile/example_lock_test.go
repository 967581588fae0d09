package trialfile_test

import (
	"context"
	"errors"
	"fmt"
	"os"
	"path/filepath"

	"furlong/trial"
	"furlong/trial/trialfile"
)

// exampleTrial is a small invented trial: three entries in two blocks.
func exampleTrial() *trial.Trial {
	t, err := trial.New(trial.NewOptions{
		Title:      "Example entries, Cobble Hill (fictional)",
		Treatments: []trial.Treatment{{Code: "A"}, {Code: "B"}, {Code: "C"}},
		Design:     trial.Design{Kind: trial.RCBD, Reps: 2},
		Traits:     []trial.Trait{{Key: "ht", Name: "Height", Unit: "cm", Kind: trial.Continuous}},
		Seed:       1,
	})
	if err != nil {
		panic(err)
	}
	return t
}

// Update is the read-modify-write of a trial file: the change is made to
// the file as it is under the lock, so concurrent writers lose nothing.
func ExampleUpdate() {
	dir, _ := os.MkdirTemp("", "furlong-example")
	defer os.RemoveAll(dir)
	path := filepath.Join(dir, "entries.furlong")
	if err := trialfile.Save(path, exampleTrial()); err != nil {
		panic(err)
	}
	err := trialfile.Update(context.Background(), path, func(t *trial.Trial) error {
		return t.SetValue(0, "ht", 182)
	})
	fmt.Println(err)
	t, _ := trialfile.Load(path)
	fmt.Println(t.Traits[0].Values[0])
	// Output:
	// <nil>
	// 182
}

// SaveChecked saves only over the version that was loaded: a change made
// by another program in between is never overwritten silently.
func ExampleSaveChecked() {
	dir, _ := os.MkdirTemp("", "furlong-example")
	defer os.RemoveAll(dir)
	path := filepath.Join(dir, "entries.furlong")
	trialfile.Save(path, exampleTrial())

	mine, loaded, _ := trialfile.LoadIdentity(path)
	// Another program changes the file.
	trialfile.Update(context.Background(), path, func(t *trial.Trial) error { return t.SetValue(1, "ht", 175) })

	mine.SetValue(2, "ht", 190)
	_, err := trialfile.SaveChecked(path, mine, loaded)
	fmt.Println(errors.Is(err, trialfile.ErrChangedOnDisk))

	// Merge the two versions plot by plot, then save over what is there now.
	theirs, now, _ := trialfile.LoadIdentity(path)
	base, _ := trialfile.Load(path + trialfile.BackupSuffix)
	merged, conflicts, _ := trial.MergeValues(base, mine, theirs)
	_, err = trialfile.SaveChecked(path, merged, now)
	fmt.Println(len(conflicts), err, merged.Traits[0].Values[1], merged.Traits[0].Values[2])
	// Output:
	// true
	// 0 <nil> 175 190
}
