package trialfile

import (
	"bufio"
	"errors"
	"fmt"
	"io"
	"math/rand/v2"
	"os"
	"os/exec"
	"path/filepath"
	"strings"
	"syscall"
	"testing"
	"time"
)

func TestSaveKeepsBackup(t *testing.T) {
	t.Parallel()
	dir := t.TempDir()
	path := filepath.Join(dir, "nitrogen.furlong")
	first, second := richTrial(), richTrial()
	second.Title = "second version"
	if err := Save(path, first); err != nil {
		t.Fatal(err)
	}
	if _, err := os.Stat(path + ".bak"); !errors.Is(err, os.ErrNotExist) {
		t.Errorf("a backup exists after the first save: %v", err)
	}
	if err := Save(path, second); err != nil {
		t.Fatal(err)
	}
	got, err := Load(path)
	if err != nil {
		t.Fatal(err)
	}
	if d := diff(second, got); d != "" {
		t.Error(d)
	}
	bak, err := Load(path + ".bak")
	if err != nil {
		t.Fatal(err)
	}
	if d := diff(first, bak); d != "" {
		t.Error("backup:", d)
	}
	entries, _ := os.ReadDir(dir)
	if len(entries) != 2 {
		t.Errorf("folder holds %d entries, want the file and its backup", len(entries))
	}
}

// failAfter fails with "no space left on device" after n bytes.
type failAfter struct {
	w io.Writer
	n int
}

func (f *failAfter) Write(p []byte) (int, error) {
	if len(p) > f.n {
		k, _ := f.w.Write(p[:f.n])
		f.n = 0
		return k, syscall.ENOSPC
	}
	f.n -= len(p)
	return f.w.Write(p)
}

func TestSaveDiskFullLeavesOldFile(t *testing.T) {
	t.Parallel()
	dir := t.TempDir()
	path := filepath.Join(dir, "big.furlong")
	old := bigTrial("old", 2000, 3, 0)
	if err := Save(path, old); err != nil {
		t.Fatal(err)
	}
	before, _ := os.ReadFile(path)
	_, err := save(path, bigTrial("new", 2000, 3, 1), func(w io.Writer) io.Writer { return &failAfter{w: w, n: 100000} })
	if !errors.Is(err, syscall.ENOSPC) {
		t.Fatalf("got %v, want the disk-full error", err)
	}
	after, _ := os.ReadFile(path)
	if string(after) != string(before) {
		t.Error("the old file changed")
	}
	entries, _ := os.ReadDir(dir)
	if len(entries) != 1 {
		var names []string
		for _, e := range entries {
			names = append(names, e.Name())
		}
		t.Errorf("left behind: %v", names)
	}
}

const helperEnv = "FURLONG_TRIALFILE_SAVE_HELPER"

// TestHelperSaver is not a test: TestSaveSurvivesKill runs the test binary
// with it as a separate process that saves in a loop until it is killed.
func TestHelperSaver(t *testing.T) {
	path := os.Getenv(helperEnv)
	if path == "" {
		t.Skip("helper process for TestSaveSurvivesKill")
	}
	a, b := bigTrial("A", 2000, 10, 0), bigTrial("B", 2000, 10, 0.5)
	out := bufio.NewWriter(os.Stdout)
	deadline := time.Now().Add(30 * time.Second)
	for i := 0; time.Now().Before(deadline); i++ {
		tr := a
		if i%2 == 1 {
			tr = b
		}
		fmt.Fprintln(out, "start")
		out.Flush()
		if err := Save(path, tr); err != nil {
			fmt.Fprintln(os.Stderr, err)
			os.Exit(2)
		}
		fmt.Fprintln(out, "saved")
		out.Flush()
	}
	os.Exit(0)
}

// TestSaveSurvivesKill kills a process that saves in a loop (SIGKILL on
// Unix) at random moments and checks that the file, and its backup, are
// always a complete old or new trial.
func TestSaveSurvivesKill(t *testing.T) {
	kills := 30
	if testing.Short() {
		kills = 8
	}
	dir := t.TempDir()
	path := filepath.Join(dir, "crash.furlong")
	a, b := bigTrial("A", 2000, 10, 0), bigTrial("B", 2000, 10, 0.5)
	start := time.Now()
	if err := Save(path, a); err != nil {
		t.Fatal(err)
	}
	saveTime := time.Since(start)
	rng := rand.New(rand.NewPCG(7, 11))
	saves, interrupted := 0, 0
	for k := range kills {
		cmd := exec.Command(os.Args[0], "-test.run=^TestHelperSaver$")
		cmd.Env = append(os.Environ(), helperEnv+"="+path)
		stdout, err := cmd.StdoutPipe()
		if err != nil {
			t.Fatal(err)
		}
		var stderr strings.Builder
		cmd.Stderr = &stderr
		if err := cmd.Start(); err != nil {
			t.Fatal(err)
		}
		counted := make(chan [2]int)
		firstSave := make(chan struct{})
		go func() {
			var n [2]int // saves started, saves finished
			sc := bufio.NewScanner(stdout)
			for sc.Scan() {
				if sc.Text() == "start" {
					n[0]++
				} else {
					if n[1] == 0 {
						close(firstSave)
					}
					n[1]++
				}
			}
			counted <- n
		}()
		// Wait for one complete save, so that the kill lands in the save
		// loop, then kill at a random moment within about two saves.
		select {
		case <-firstSave:
		case <-time.After(30 * time.Second):
			cmd.Process.Kill()
			t.Fatalf("the helper did not save: %s", stderr.String())
		}
		time.Sleep(time.Duration(rng.Int64N(int64(2 * saveTime))))
		if err := cmd.Process.Kill(); err != nil {
			t.Fatal(err)
		}
		n := <-counted
		cmd.Wait()
		if strings.Contains(stderr.String(), "could not") {
			t.Fatalf("helper failed: %s", stderr.String())
		}
		saves += n[1]
		if n[0] > n[1] {
			interrupted++
		}
		for _, p := range []string{path, path + BackupSuffix} {
			got, err := Load(p)
			if errors.Is(err, os.ErrNotExist) && p != path {
				continue
			}
			if err != nil {
				t.Fatalf("kill %d: %v", k, err)
			}
			want := a
			if got.Title == "B" {
				want = b
			}
			if d := diff(want, got); d != "" {
				t.Fatalf("kill %d: %s is neither trial: %s", k, filepath.Base(p), d)
			}
		}
	}
	if interrupted < kills/3 {
		t.Errorf("only %d of %d kills interrupted a save (%d saves completed): the test proves little", interrupted, kills, saves)
	}
	t.Logf("%d kills, %d of them during a save; %d complete saves", kills, interrupted, saves)
	// The next save removes what the killed saves left behind (their
	// writer has ended on this machine) and leaves no lock file.
	if err := Save(path, a); err != nil {
		t.Fatal(err)
	}
	entries, _ := os.ReadDir(dir)
	for _, e := range entries {
		if n := e.Name(); n != "crash.furlong" && n != "crash.furlong"+BackupSuffix {
			t.Errorf("left behind after the next save: %s", n)
		}
	}
}
