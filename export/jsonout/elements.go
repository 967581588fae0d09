package jsonout

import (
	"runtime"
	"sync"
)

// Chunking of long lists (writeElements).
var (
	chunkElements    = 2048 // elements formatted per chunk
	parallelElements = 4096 // shortest list formatted in parallel
)

// writeElements writes n elements of the open array of w, element i by
// the calls f makes on the writer it is given for a range [lo, hi) that
// holds i. f must write exactly one value per element and nothing else.
//
// A short list (or a single processor) is written directly into w. A long
// one is cut into chunks that are formatted on every processor, each into
// its own buffer, and copied into w in order, so the document is the same
// bytes; at most a few chunks are in memory at once, whatever n.
func writeElements(w *Writer, n int, f func(sw *Writer, lo, hi int)) {
	workers := runtime.GOMAXPROCS(0)
	if n < parallelElements || workers < 2 || w.compact > 0 {
		f(w, 0, n)
		return
	}
	if w.err != nil {
		return
	}
	depth := len(w.stack)
	type chunk struct {
		lo, hi int
		done   chan *Writer
	}
	inflight := 2 * workers
	jobs := make(chan chunk, inflight)
	order := make(chan chunk, inflight)
	free := make(chan *Writer, inflight+workers)
	base := w.stack[depth-1].n
	// A writer for one chunk: an array at the same depth as w's, so its
	// elements get the same separators and indentation, already holding
	// the elements before the chunk (so it starts with a comma unless the
	// chunk is the array's start).
	newSub := func(before int) *Writer {
		var sw *Writer
		select {
		case sw = <-free:
		default:
			sw = &Writer{buf: make([]byte, 0, flushAt+4096), stack: make([]frame, depth)}
		}
		sw.buf, sw.err, sw.afterKey, sw.compact = sw.buf[:0], nil, false, 0
		sw.stack = sw.stack[:depth]
		sw.stack[depth-1] = frame{object: false, n: before}
		return sw
	}
	var failure any
	var mu sync.Mutex
	var wg sync.WaitGroup
	for range workers {
		wg.Go(func() {
			for c := range jobs {
				sw := newSub(base + c.lo)
				func() {
					defer func() {
						if p := recover(); p != nil {
							mu.Lock()
							if failure == nil {
								failure = p
							}
							mu.Unlock()
						}
					}()
					f(sw, c.lo, c.hi)
				}()
				c.done <- sw
			}
		})
	}
	go func() {
		defer close(jobs)
		defer close(order)
		for lo := 0; lo < n; lo += chunkElements {
			c := chunk{lo: lo, hi: min(n, lo+chunkElements), done: make(chan *Writer, 1)}
			order <- c
			jobs <- c
		}
	}()
	for c := range order {
		sw := <-c.done
		if w.err == nil {
			if sw.err != nil {
				w.fail(sw.err)
			} else {
				w.buf = append(w.buf, sw.buf...)
				w.maybeFlush()
			}
		}
		select {
		case free <- sw:
		default:
		}
	}
	wg.Wait()
	if failure != nil {
		panic(failure) // on the caller's goroutine, where the crash handler is
	}
	w.stack[depth-1].n = base + n
}
