package ui

import (
	"errors"
	"io/fs"
	"os"
	"time"

	"furlong/trial"
)

// saveJob is one write of a trial snapshot.
type saveJob struct {
	snap *trial.Trial
	path string // where to write
	gen  uint64 // document generation of the snapshot
	// explicit marks a save the user asked for (File > Save): it is written
	// at once, drops any pending autosave and removes staleRecovery.
	explicit      bool
	staleRecovery string
	done          chan error // optional; receives the result
}

// saver writes trial snapshots on its own goroutine. Autosaves are
// debounced: the first edit after a quiet spell starts a timer of delay,
// and the newest snapshot at that moment is written, so every edit is on
// disk within delay plus the time of one write. Explicit saves go through
// the same goroutine, which serialises every write.
type saver struct {
	delay  time.Duration
	write  func(path string, t *trial.Trial) error
	report func(j saveJob, err error) // called on the saver goroutine

	in    chan saveJob
	flush chan chan struct{}
	quit  chan struct{}
	ended chan struct{}
}

func newSaver(delay time.Duration, write func(string, *trial.Trial) error, report func(saveJob, error)) *saver {
	s := &saver{
		delay:  delay,
		write:  write,
		report: report,
		in:     make(chan saveJob, 16),
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
	err := s.write(j.path, j.snap)
	if err == nil && j.explicit && j.staleRecovery != "" && j.staleRecovery != j.path {
		if rerr := os.Remove(j.staleRecovery); rerr != nil && !errors.Is(rerr, fs.ErrNotExist) {
			err = nil // the trial itself is saved; a leftover recovery copy is harmless
		}
	}
	// Report first: the test driver runs fyne.Do at once, and a caller
	// waiting on done must see the report's effects.
	if s.report != nil {
		s.report(j, err)
	}
	if j.done != nil {
		j.done <- err
	}
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
