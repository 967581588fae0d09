package trial

import (
	"fmt"
	"runtime/debug"
	"sync"
)

// WorkerPanic is a panic raised on a worker goroutine, carried to the
// goroutine that waits for the work and raised there again. A panic that is
// not recovered on the goroutine where it happens ends the process at once
// (with the Go runtime's exit status 2, "the command line was wrong" for
// Furlong's commands) and bypasses the crash log; forwarded like this it
// reaches the program's one crash handler, which also saves Stack.
type WorkerPanic struct {
	Value any    // what the worker panicked with
	Stack []byte // the worker goroutine's stack when it panicked
}

// Error describes the panic; the stack is in Stack.
func (p *WorkerPanic) Error() string { return fmt.Sprintf("panic on a worker goroutine: %v", p.Value) }

// Catch runs f and returns the panic it raised, with its stack, or nil when
// f returned normally. A WorkerPanic raised again inside f is returned as it
// is, keeping the first goroutine's stack.
func Catch(f func()) (p *WorkerPanic) {
	defer func() {
		if r := recover(); r != nil {
			if wp, ok := r.(*WorkerPanic); ok {
				p = wp
				return
			}
			p = &WorkerPanic{Value: r, Stack: debug.Stack()}
		}
	}()
	f()
	return nil
}

// Workers runs functions on goroutines like a sync.WaitGroup, and Wait raises
// the first panic of any of them on the waiting goroutine.
type Workers struct {
	wg    sync.WaitGroup
	mu    sync.Mutex
	first *WorkerPanic
}

// Go runs f on a new goroutine.
func (w *Workers) Go(f func()) {
	w.wg.Add(1)
	go func() {
		defer w.wg.Done()
		if p := Catch(f); p != nil {
			w.mu.Lock()
			if w.first == nil {
				w.first = p
			}
			w.mu.Unlock()
		}
	}()
}

// Wait waits for every function started by Go to return, then panics with
// the first *WorkerPanic if one of them panicked.
func (w *Workers) Wait() {
	w.wg.Wait()
	w.mu.Lock()
	p := w.first
	w.mu.Unlock()
	if p != nil {
		panic(p)
	}
}
