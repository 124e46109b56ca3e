package runfolder

import (
	"runtime"
)

// MaxReadAhead is the most files ReadInOrder reads at once: each is one
// frame's field or strain file, a few MB in memory at 20 MP.
const MaxReadAhead = 4

// ReadInOrder calls read(k) for k = 0…n−1 on up to min(GOMAXPROCS,
// MaxReadAhead) goroutines and hands the results to use one at a time in
// order, so that use sees what a serial loop would: the next frames'
// files are parsed while one is used. At most that many results are held
// at once. The error is the first in order — a bad file stops the reading
// at the frame a serial loop would have stopped at, with its error, and no
// later result reaches use —; an error of use stops the reading too. No
// goroutine is left running when it returns. read must be safe to call
// from several goroutines.
func ReadInOrder[T any](n int, read func(k int) (T, error), use func(k int, v T) error) error {
	workers := max(1, min(runtime.GOMAXPROCS(0), MaxReadAhead, n))
	if workers == 1 {
		for k := range n {
			v, err := read(k)
			if err != nil {
				return err
			}
			if err := use(k, v); err != nil {
				return err
			}
		}
		return nil
	}
	type result struct {
		v   T
		err error
	}
	// One buffered channel a frame, so that a reader never blocks on its
	// result; a slot is taken before a frame is handed to a reader and
	// given back when its result is used.
	out := make([]chan result, n)
	for k := range out {
		out[k] = make(chan result, 1)
	}
	stop := make(chan struct{})
	slots := make(chan struct{}, workers)
	done := make(chan struct{})
	go func() {
		defer close(done)
		next := make(chan int)
		finished := make(chan struct{}, workers)
		for range workers {
			go func() {
				defer func() { finished <- struct{}{} }()
				for k := range next {
					v, err := read(k)
					out[k] <- result{v, err}
				}
			}()
		}
	feed:
		for k := range n {
			select {
			case slots <- struct{}{}:
			case <-stop:
				break feed
			}
			select {
			case next <- k:
			case <-stop:
				break feed
			}
		}
		close(next)
		for range workers {
			<-finished
		}
	}()
	var err error
	for k := range n {
		r := <-out[k]
		<-slots
		if r.err != nil {
			err = r.err
			break
		}
		if err = use(k, r.v); err != nil {
			break
		}
	}
	close(stop)
	<-done
	return err
}
