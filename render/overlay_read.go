package render

import (
	"runtime"
)

// readAhead is the most frames the limits pass reads at once beyond the
// one being pooled: each is a frame's values (and displacements), a few
// MB at 20 MP.
const readAhead = 4

// eachFrameValues reads every frame's values of q (and its displacement
// with disp; see frameValues) on up to GOMAXPROCS goroutines and hands
// them to fn one at a time in frame order, so that fn sees the same
// sequence as a serial loop: a frame's strain file is parsed while the
// one before is pooled. The error is the first in frame order — a bad
// frame is named as a serial read would name it, and no frame after it
// reaches fn —; an error of fn stops the reading.
func (rr *renderRun) eachFrameValues(q Quantity, disp bool, fn func(k int, fd frameData) error) error {
	type result struct {
		fd  frameData
		err error
	}
	n := len(rr.names)
	workers := max(1, min(runtime.GOMAXPROCS(0), readAhead, n))
	if workers == 1 {
		for k, name := range rr.names {
			fd, err := rr.frameValues(q, name, disp)
			if err != nil {
				return err
			}
			if err := fn(k, fd); err != nil {
				return err
			}
		}
		return nil
	}
	// One buffered channel a frame; frame k is read by worker k%workers,
	// which moves on to frame k+workers only once frame k is taken (the
	// slots), so at most workers frames are held at once.
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
					fd, err := rr.frameValues(q, rr.names[k], disp)
					out[k] <- result{fd, err}
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
		if err = fn(k, r.fd); err != nil {
			break
		}
	}
	close(stop)
	// Free the feeder if it waits for a slot, then wait for every reader.
	for {
		select {
		case <-slots:
			continue
		case <-done:
			return err
		}
	}
}
