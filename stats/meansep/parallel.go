package meansep

import (
	"runtime"
	"sync"
)

// parallelMin is the smallest amount of work split across processors.
const parallelMin = 20000

// parallelChunks calls f on consecutive chunks [lo, hi) covering [0, n),
// one per processor at most, and returns when all are done. f must write
// only its own chunk. Small n runs in the caller's goroutine. A panic in
// a chunk is raised again on the caller's goroutine.
func parallelChunks(n int, f func(lo, hi int)) {
	workers := min(runtime.GOMAXPROCS(0), n/parallelMin)
	if workers <= 1 {
		f(0, n)
		return
	}
	var wg sync.WaitGroup
	var mu sync.Mutex
	var failure any
	for w := range workers {
		lo, hi := n*w/workers, n*(w+1)/workers
		wg.Go(func() {
			defer func() {
				if p := recover(); p != nil {
					mu.Lock()
					if failure == nil {
						failure = p
					}
					mu.Unlock()
				}
			}()
			f(lo, hi)
		})
	}
	wg.Wait()
	if failure != nil {
		panic(failure) // on the caller's goroutine, where the crash handler is
	}
}
