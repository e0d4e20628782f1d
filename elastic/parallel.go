package elastic

import (
	"sync"
	"sync/atomic"
)

// parallelFor calls fn(lo, hi) on consecutive chunks of [0, n) of at most
// chunk indices, from up to workers goroutines that take the next chunk
// when they finish one. Callers make fn's effect independent of which
// goroutine runs which chunk, so results do not depend on workers.
func parallelFor(n, chunk, workers int, fn func(lo, hi int)) {
	if chunk < 1 {
		chunk = 1
	}
	chunks := (n + chunk - 1) / chunk
	if workers > chunks {
		workers = chunks
	}
	if workers <= 1 {
		for lo := 0; lo < n; lo += chunk {
			fn(lo, min(lo+chunk, n))
		}
		return
	}
	var next atomic.Int64
	var wg sync.WaitGroup
	for range workers {
		wg.Go(func() {
			for {
				c := int(next.Add(1)) - 1
				if c >= chunks {
					return
				}
				lo := c * chunk
				fn(lo, min(lo+chunk, n))
			}
		})
	}
	wg.Wait()
}

// firstError keeps the error of the lowest index reported by concurrent
// workers, so that the error returned does not depend on scheduling.
type firstError struct {
	mu  sync.Mutex
	idx int
	err error
}

func (f *firstError) set(idx int, err error) {
	f.mu.Lock()
	defer f.mu.Unlock()
	if f.err == nil || idx < f.idx {
		f.idx, f.err = idx, err
	}
}
