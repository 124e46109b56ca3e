package baseline

import (
	"errors"
	"runtime"
	"sync"
)

// forChunks splits the indices 0…n−1 into one contiguous chunk per
// available CPU and runs fn on each chunk concurrently. The per-point
// methods run this way so that they use the machine as OpenCV's internally
// parallel Lucas–Kanade and Farneback do. It returns the errors joined.
func forChunks(n int, fn func(lo, hi int) error) error {
	workers := min(runtime.GOMAXPROCS(0), n)
	if workers <= 1 {
		return fn(0, n)
	}
	errs := make([]error, workers)
	var wg sync.WaitGroup
	for w := range workers {
		lo, hi := w*n/workers, (w+1)*n/workers
		wg.Add(1)
		go func() {
			defer wg.Done()
			errs[w] = fn(lo, hi)
		}()
	}
	wg.Wait()
	return errors.Join(errs...)
}
