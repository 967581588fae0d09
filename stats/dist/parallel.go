package dist

import (
	"runtime"
	"sync"
)

// parallelRange calls f on consecutive parts [lo, hi) covering [0, n), one
// per processor (at most n), and returns when all are done. f must write
// only its own part, and the function it evaluates must be safe for
// concurrent use; the results are those of one loop. A panic in a part is
// raised again on the caller's goroutine.
func parallelRange(n int, f func(lo, hi int)) {
	workers := min(runtime.GOMAXPROCS(0), n)
	if workers <= 1 {
		f(0, n)
		return
	}
	var wg sync.WaitGroup
	var mu sync.Mutex
	var failure any
	for w := 1; w < workers; w++ {
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
	f(0, n/workers)
	wg.Wait()
	if failure != nil {
		panic(failure)
	}
}
