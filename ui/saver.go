package ui

import (
	"errors"
	"io/fs"
	"os"
	"path/filepath"
	"sync"
	"time"

	"furlong/trial"
	"furlong/trial/trialfile"
)

// saveJob is one write of a trial snapshot.
type saveJob struct {
	snap *trial.Trial
	// path is the trial file to write through trialfile.SaveChecked, or
	// "" when the snapshot only goes to the recovery copy (a trial never
	// saved, or one whose file changed on disk until the user decides).
	path string
	// recovery is the recovery copy: written when path is "", or when
	// writing path failed, so that the edit is on disk somewhere. After a
	// successful write of path it is removed.
	recovery string
	// base is the version the snapshot was edited from (as loaded or last
	// saved), written beside the recovery copy so that a restore can be
	// merged with what the file holds by then. May be nil.
	base *trial.Trial
	gen  uint64 // document generation of the snapshot
	// epoch is the document the job belongs to; reports for an older
	// document are ignored.
	epoch uint64
	// explicit marks a save the user asked for (File > Save): it is written
	// at once and drops any pending autosave.
	explicit bool
	// stale is a recovery copy of an earlier name, removed once path is
	// written (after Save as).
	stale string
	done  chan error // optional; receives the result
}

// saveResult is what a finished job reports.
type saveResult struct {
	// id is the identity of the trial file written (zero when only the
	// recovery copy was written, or on error).
	id trialfile.Identity
	// toRecovery: the snapshot is in the recovery copy (and not in the
	// trial file).
	toRecovery bool
	err        error
}

// saver writes trial snapshots on its own goroutine. Autosaves are
// debounced: the first edit after a quiet spell starts a timer of delay,
// and the newest snapshot at that moment is written, so every edit is on
// disk within delay plus the time of one write. Explicit saves go through
// the same goroutine, which serialises every write.
//
// The saver knows which version of each trial file the window's copy is
// based on (known): every write is checked against it, so that a file
// changed by another program is never overwritten, and the watcher
// compares the file with it under the same lock, so that the window's own
// writes are never taken for outside changes.
type saver struct {
	delay  time.Duration
	report func(j saveJob, r saveResult) // called on the saver goroutine

	mu    sync.Mutex
	known map[string]trialfile.Identity

	in    chan saveJob
	ctl   chan func() // run on the saver goroutine, in order with the jobs
	flush chan chan struct{}
	quit  chan struct{}
	ended chan struct{}
}

func newSaver(delay time.Duration, report func(saveJob, saveResult)) *saver {
	s := &saver{
		delay:  delay,
		report: report,
		known:  map[string]trialfile.Identity{},
		in:     make(chan saveJob, 16),
		ctl:    make(chan func()),
		flush:  make(chan chan struct{}),
		quit:   make(chan struct{}),
		ended:  make(chan struct{}),
	}
	go s.loop()
	return s
}

func (s *saver) loop() {
	defer close(s.ended)
	var (
		pending *saveJob
		timer   *time.Timer
		fire    <-chan time.Time
	)
	stopTimer := func() {
		if timer != nil {
			timer.Stop()
			timer, fire = nil, nil
		}
	}
	take := func(j saveJob) {
		if j.explicit {
			stopTimer()
			pending = nil
			s.run(j)
			return
		}
		pending = &j
		if timer == nil {
			timer = time.NewTimer(s.delay)
			fire = timer.C
		}
	}
	// drain takes every job already queued, so that a flush or quit never
	// overtakes an earlier submit.
	drain := func() {
		for {
			select {
			case j := <-s.in:
				take(j)
			default:
				return
			}
		}
	}
	for {
		select {
		case j := <-s.in:
			take(j)
		case <-fire:
			timer, fire = nil, nil
			if pending != nil {
				s.run(*pending)
				pending = nil
			}
		case f := <-s.ctl:
			// A new base (reload, merge, another file): what was pending
			// was edited from the old one and must not reach the file.
			drain()
			stopTimer()
			pending = nil
			f()
		case ch := <-s.flush:
			drain()
			stopTimer()
			if pending != nil {
				s.run(*pending)
				pending = nil
			}
			close(ch)
		case <-s.quit:
			drain()
			stopTimer()
			if pending != nil {
				s.run(*pending)
			}
			return
		}
	}
}

func (s *saver) run(j saveJob) {
	r := s.write(j)
	// Report first: the test driver runs fyne.Do at once, and a caller
	// waiting on done must see the report's effects.
	if s.report != nil {
		s.report(j, r)
	}
	if j.done != nil {
		j.done <- r.err
	}
}

// write carries out one job: the trial file through the checked save,
// falling back to the recovery copy when that fails.
func (s *saver) write(j saveJob) saveResult {
	if j.path == "" {
		return saveResult{toRecovery: true, err: writeRecovery(j)}
	}
	s.mu.Lock()
	id, err := trialfile.SaveChecked(j.path, j.snap, s.known[j.path])
	if err == nil {
		s.known[j.path] = id
	}
	s.mu.Unlock()
	if err == nil {
		removeRecovery(j.recovery)
		if j.stale != j.recovery {
			removeRecovery(j.stale)
		}
		return saveResult{id: id}
	}
	// The file was not written: keep the edit in the recovery copy, so
	// that it survives a crash until the user decides.
	r := saveResult{err: err}
	if j.recovery != "" && writeRecovery(j) == nil {
		r.toRecovery = true
	}
	return r
}

// baseSuffix names the copy of the base version kept beside a recovery
// copy.
const baseSuffix = ".base"

// writeRecovery writes the job's snapshot to its recovery copy (and its
// base beside it), creating the folder when needed.
func writeRecovery(j saveJob) error {
	if j.recovery == "" {
		return errors.New("no recovery copy")
	}
	if err := os.MkdirAll(filepath.Dir(j.recovery), 0o755); err != nil {
		return err
	}
	if j.base != nil {
		if err := trialfile.Save(j.recovery+baseSuffix, j.base); err != nil {
			return err
		}
	} else {
		os.Remove(j.recovery + baseSuffix)
	}
	return trialfile.Save(j.recovery, j.snap)
}

// removeRecovery removes a recovery copy, its base and its backup.
func removeRecovery(rp string) {
	if rp == "" {
		return
	}
	for _, p := range []string{rp, rp + baseSuffix, rp + trialfile.BackupSuffix, rp + baseSuffix + trialfile.BackupSuffix} {
		if err := os.Remove(p); err != nil && !errors.Is(err, fs.ErrNotExist) {
			continue // a leftover copy is harmless; the next restore compares content
		}
	}
}

// setKnown makes id the version of path the window's copy is based on,
// dropping any pending autosave (it was edited from the old version). It
// returns once done.
func (s *saver) setKnown(path string, id trialfile.Identity) {
	done := make(chan struct{})
	f := func() {
		s.mu.Lock()
		if id.IsZero() {
			delete(s.known, path)
		} else {
			s.known[path] = id
		}
		s.mu.Unlock()
		close(done)
	}
	select {
	case s.ctl <- f:
		<-done
	case <-s.ended:
	}
}

// discardPending drops a pending autosave (the user chose to drop the
// changes).
func (s *saver) discardPending() {
	done := make(chan struct{})
	select {
	case s.ctl <- func() { close(done) }:
		<-done
	case <-s.ended:
	}
}

// changedOutside reports whether the file at path is no longer the
// version the window knows, with the file's identity now (zero when it is
// gone). It looks at the size and time first and reads the file only when
// they differ. It holds the saver's lock, so a write of the window's own
// is either wholly before or after it. ok is false when the window knows
// no version of path (nothing to compare).
func (s *saver) changedOutside(path string) (id trialfile.Identity, changed, ok bool) {
	s.mu.Lock()
	defer s.mu.Unlock()
	want, ok := s.known[path]
	if !ok {
		return trialfile.Identity{}, false, false
	}
	fi, err := os.Stat(path)
	if err == nil && fi.Size() == want.Size && fi.ModTime().Equal(want.ModTime) {
		return want, false, true
	}
	id, err = trialfile.Stat(path)
	if err != nil {
		if errors.Is(err, fs.ErrNotExist) {
			return trialfile.Identity{}, true, true
		}
		return trialfile.Identity{}, false, true // unreadable for now: look again later
	}
	if id.Same(want) {
		s.known[path] = id // touched, not changed: remember the new time
		return id, false, true
	}
	return id, true, true
}

// submit queues a job; it never blocks the UI for long (the channel is
// buffered and the loop only writes files).
func (s *saver) submit(j saveJob) { s.in <- j }

// sync writes any pending autosave and returns when it is on disk.
func (s *saver) sync() {
	ch := make(chan struct{})
	select {
	case s.flush <- ch:
		<-ch
	case <-s.ended:
	}
}

// stop writes what is pending and ends the goroutine.
func (s *saver) stop() {
	select {
	case <-s.ended:
		return
	default:
	}
	close(s.quit)
	<-s.ended
}
