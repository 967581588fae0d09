package trialfile

import (
	"context"
	"crypto/sha256"
	"errors"
	"fmt"
	"os"
	"os/exec"
	"path/filepath"
	"strings"
	"sync"
	"testing"
	"time"

	"furlong/trial"
)

func TestStatAndLoadIdentity(t *testing.T) {
	t.Parallel()
	dir := t.TempDir()
	path := filepath.Join(dir, "id.furlong")
	if _, err := Stat(path); !errors.Is(err, os.ErrNotExist) {
		t.Fatalf("Stat of a missing file: %v, want not-exist", err)
	}
	if err := Save(path, richTrial()); err != nil {
		t.Fatal(err)
	}
	data, _ := os.ReadFile(path)
	id, err := Stat(path)
	if err != nil {
		t.Fatal(err)
	}
	// The hash is SHA-256 of the bytes (crypto/sha256, a general-purpose library).
	if id.Hash != sha256.Sum256(data) || id.Size != int64(len(data)) || id.IsZero() {
		t.Errorf("identity %v does not describe the %d bytes on disk", id, len(data))
	}
	tr, id2, err := LoadIdentity(path)
	if err != nil {
		t.Fatal(err)
	}
	if !id.Same(id2) || tr.Title != richTrial().Title {
		t.Errorf("LoadIdentity: %v, Stat: %v", id2, id)
	}
	// Same ignores the time (a copy or sync client may touch it): common practice.
	later := id
	later.ModTime = later.ModTime.Add(time.Hour)
	if !id.Same(later) {
		t.Error("a changed time alone made the identity differ")
	}
	other := id
	other.Hash[0] ^= 1
	if id.Same(other) {
		t.Error("a different hash compared the same")
	}
	if !(Identity{}).IsZero() {
		t.Error("zero identity not zero")
	}
}

func TestSaveChecked(t *testing.T) {
	t.Parallel()
	dir := t.TempDir()
	path := filepath.Join(dir, "checked.furlong")
	a, b := richTrial(), richTrial()
	b.Title = "theirs"

	// A new file: zero expect and no file saves.
	idA, err := SaveChecked(path, a, Identity{})
	if err != nil {
		t.Fatal(err)
	}
	now, _ := Stat(path)
	if !idA.Same(now) {
		t.Errorf("returned identity %v, file has %v", idA, now)
	}
	// Zero expect but the file exists: refused.
	if _, err := SaveChecked(path, a, Identity{}); !errors.Is(err, ErrChangedOnDisk) {
		t.Errorf("zero expect over an existing file: %v", err)
	}
	// Another program writes the file; the stale identity is refused and
	// nothing is written (common practice: compare-and-swap).
	if err := Save(path, b); err != nil {
		t.Fatal(err)
	}
	before, _ := os.ReadFile(path)
	mine := richTrial()
	mine.Title = "mine"
	_, err = SaveChecked(path, mine, idA)
	var ce *ChangedError
	if !errors.As(err, &ce) || !errors.Is(err, ErrChangedOnDisk) {
		t.Fatalf("stale save: %v, want a *ChangedError", err)
	}
	after, _ := os.ReadFile(path)
	if string(after) != string(before) {
		t.Error("a refused save changed the file")
	}
	if !ce.Want.Same(idA) || ce.Got.Hash != sha256.Sum256(before) || ce.Path != path {
		t.Errorf("ChangedError %+v", ce)
	}
	// With the current identity it saves.
	cur, _ := Stat(path)
	if _, err := SaveChecked(path, mine, cur); err != nil {
		t.Fatal(err)
	}
	if got, _ := Load(path); got.Title != "mine" {
		t.Errorf("title %q after a checked save", got.Title)
	}
	// The file removed in the meantime: refused, with a message saying so.
	os.Remove(path)
	if _, err := SaveChecked(path, mine, cur); !errors.As(err, &ce) || !ce.Got.IsZero() {
		t.Errorf("save over a removed file: %v", err)
	}
}

func TestLockExclusive(t *testing.T) {
	t.Parallel()
	dir := t.TempDir()
	path := filepath.Join(dir, "locked.furlong")
	unlock, err := LockExclusive(context.Background(), path)
	if err != nil {
		t.Fatal(err)
	}
	ctx, cancel := context.WithTimeout(context.Background(), 150*time.Millisecond)
	defer cancel()
	if _, err := LockExclusive(ctx, path); !errors.Is(err, context.DeadlineExceeded) {
		t.Fatalf("a second lock while held: %v, want it to wait until the deadline", err)
	}
	got := make(chan error)
	go func() {
		u, err := LockExclusive(context.Background(), path)
		if err == nil {
			err = u()
		}
		got <- err
	}()
	time.Sleep(50 * time.Millisecond)
	select {
	case err := <-got:
		t.Fatalf("the waiter got the lock while it was held: %v", err)
	default:
	}
	if err := unlock(); err != nil {
		t.Fatal(err)
	}
	if err := <-got; err != nil {
		t.Fatal(err)
	}
	entries, _ := os.ReadDir(dir)
	if len(entries) != 0 {
		t.Errorf("the lock left %d files behind", len(entries))
	}
	// A symbolic link shares its target's lock.
	target := filepath.Join(dir, "real.furlong")
	link := filepath.Join(dir, "link.furlong")
	if err := os.Symlink(target, link); err != nil {
		t.Skip("no symbolic links here:", err)
	}
	unlock, err = LockExclusive(context.Background(), target)
	if err != nil {
		t.Fatal(err)
	}
	ctx2, cancel2 := context.WithTimeout(context.Background(), 100*time.Millisecond)
	defer cancel2()
	if _, err := LockExclusive(ctx2, link); err == nil {
		t.Error("the link's lock is not its target's")
	}
	unlock()
}

// TestUpdateNoLostUpdate runs read-modify-write cycles from goroutines
// and from two processes at once; every increment must survive (a lost
// update would leave the total short: common practice for lock tests).
func TestUpdateNoLostUpdate(t *testing.T) {
	dir := t.TempDir()
	path := filepath.Join(dir, "counter.furlong")
	tr := bigTrial("counter", 20, 1, 0)
	tr.Traits[0].Values[0] = 0
	if err := Save(path, tr); err != nil {
		t.Fatal(err)
	}
	const goroutines, each = 4, 10
	var wg sync.WaitGroup
	for range goroutines {
		wg.Go(func() {
			for range each {
				if err := Update(context.Background(), path, increment); err != nil {
					t.Error(err)
				}
			}
		})
	}
	procs := []*exec.Cmd{}
	for range 2 {
		cmd := exec.Command(os.Args[0], "-test.run=^TestHelperUpdater$")
		cmd.Env = append(os.Environ(), updaterEnv+"="+path)
		if err := cmd.Start(); err != nil {
			t.Fatal(err)
		}
		procs = append(procs, cmd)
	}
	wg.Wait()
	for _, cmd := range procs {
		if err := cmd.Wait(); err != nil {
			t.Fatalf("helper process: %v", err)
		}
	}
	got, err := Load(path)
	if err != nil {
		t.Fatal(err)
	}
	want := float64(goroutines*each + 2*helperUpdates)
	if v := got.Traits[0].Values[0]; v != want {
		t.Errorf("counter %v after %v increments: updates were lost", v, want)
	}
	// An error from fn writes nothing.
	before, _ := os.ReadFile(path)
	boom := errors.New("boom")
	if err := Update(context.Background(), path, func(t *trial.Trial) error { t.Title = "x"; return boom }); !errors.Is(err, boom) {
		t.Errorf("Update returned %v, want fn's error", err)
	}
	if after, _ := os.ReadFile(path); string(after) != string(before) {
		t.Error("a failed Update wrote the file")
	}
}

func increment(t *trial.Trial) error {
	t.Traits[0].Values[0]++
	return nil
}

const (
	updaterEnv    = "FURLONG_TRIALFILE_UPDATE_HELPER"
	helperUpdates = 15
)

// TestHelperUpdater is not a test: TestUpdateNoLostUpdate runs the test
// binary with it as a separate process that increments a value.
func TestHelperUpdater(t *testing.T) {
	path := os.Getenv(updaterEnv)
	if path == "" {
		t.Skip("helper process for TestUpdateNoLostUpdate")
	}
	for range helperUpdates {
		if err := Update(context.Background(), path, increment); err != nil {
			fmt.Fprintln(os.Stderr, err)
			os.Exit(3)
		}
	}
	os.Exit(0)
}

func TestPresence(t *testing.T) {
	t.Parallel()
	dir := t.TempDir()
	path := filepath.Join(dir, "open.furlong")
	if p, err := ReadPresence(path); p != nil || err != nil {
		t.Fatalf("no marker: %v %v", p, err)
	}
	p, err := MarkOpen(path, "Furlong test")
	if err != nil {
		t.Fatal(err)
	}
	if p.TookOver != nil || p.Other != nil {
		t.Errorf("fresh marker reports %v / %v", p.TookOver, p.Other)
	}
	info, err := ReadPresence(path)
	if err != nil || info == nil {
		t.Fatalf("ReadPresence: %v %v", info, err)
	}
	host, _ := os.Hostname()
	if !info.Mine || info.Stale || info.PID != os.Getpid() || info.Host != host || info.App != "Furlong test" || time.Since(info.Since) > time.Minute {
		t.Errorf("own marker read as %+v", info)
	}
	if err := p.Release(); err != nil {
		t.Fatal(err)
	}
	if err := p.Release(); err != nil {
		t.Errorf("second Release: %v", err)
	}
	if info, _ := ReadPresence(path); info != nil {
		t.Errorf("marker still there after Release: %+v", info)
	}
	if entries, _ := os.ReadDir(dir); len(entries) != 0 {
		t.Errorf("Release left %d files", len(entries))
	}
}

// writeMarker writes a marker as another window would.
func writeMarker(t *testing.T, path, host string, pid int, since time.Time) {
	t.Helper()
	body := fmt.Sprintf(`{"app":"other","user":"ana","host":%q,"pid":%d,"since":%q}`, host, pid, since.UTC().Format(time.RFC3339Nano))
	if err := os.WriteFile(sidecar(path, presenceSuffix), []byte(body), 0o644); err != nil {
		t.Fatal(err)
	}
}

// deadPID returns the id of a process that has ended.
func deadPID(t *testing.T) int {
	t.Helper()
	cmd := exec.Command(os.Args[0], "-test.run=^$")
	if err := cmd.Run(); err != nil {
		t.Fatal(err)
	}
	return cmd.Process.Pid
}

func TestPresenceStaleAndOther(t *testing.T) {
	t.Parallel()
	host, _ := os.Hostname()
	cases := []struct {
		name  string
		host  string
		pid   int
		since time.Time
		stale bool
	}{
		// A dead process on this machine, or a marker over a day old, is
		// stale (the rule of the issue; common practice for lock files).
		{"dead process here", host, deadPID(t), time.Now(), true},
		{"older than a day", "far-away-host", 1, time.Now().Add(-25 * time.Hour), true},
		{"live process here", host, os.Getppid(), time.Now(), false},
		{"another machine, recent", "far-away-host", 1, time.Now().Add(-time.Hour), false},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			t.Parallel()
			path := filepath.Join(t.TempDir(), "shared.furlong")
			writeMarker(t, path, c.host, c.pid, c.since)
			info, err := ReadPresence(path)
			if err != nil || info == nil {
				t.Fatal(info, err)
			}
			if info.Stale != c.stale || info.Mine || info.User != "ana" {
				t.Fatalf("read %+v, want stale %v", info, c.stale)
			}
			p, err := MarkOpen(path, "me")
			if err != nil {
				t.Fatal(err)
			}
			if c.stale && (p.TookOver == nil || p.Other != nil) {
				t.Errorf("stale marker: took over %v, other %v", p.TookOver, p.Other)
			}
			if !c.stale && (p.Other == nil || p.Other.User != "ana" || p.TookOver != nil) {
				t.Errorf("fresh marker: other %v, took over %v", p.Other, p.TookOver)
			}
			if now, _ := ReadPresence(path); now == nil || !now.Mine {
				t.Errorf("after MarkOpen the marker is %+v, want ours", now)
			}
			p.Release()
			after, _ := ReadPresence(path)
			if c.stale && after != nil {
				t.Errorf("stale marker came back: %+v", after)
			}
			if !c.stale && (after == nil || after.User != "ana" || after.PID != c.pid) {
				t.Errorf("the other window's marker was not put back: %+v", after)
			}
		})
	}
}

func TestSidecarNames(t *testing.T) {
	t.Parallel()
	short := filepath.Join("d", "a.furlong")
	if got := sidecar(short, lockSuffix); got != filepath.Join("d", ".a.furlong.lock") {
		t.Errorf("lock of a short name: %s", got)
	}
	long := filepath.Join("d", strings.Repeat("x", 245)+".furlong")
	got := filepath.Base(sidecar(long, presenceSuffix))
	if len(got) > maxNameLen || got[:4] != ".fl-" {
		t.Errorf("marker of a long name: %q (%d bytes)", got, len(got))
	}
}
