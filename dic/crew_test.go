package dic

import (
	"math/rand/v2"
	"runtime"
	"sync/atomic"
	"testing"
	"time"
)

// A crew runs every job of every batch exactly once, whether its members
// are spinning when the batch is posted or have parked after a long gap
// (gaps of more than spinFor), and leaves no goroutine behind once
// stopped. Run under the race detector it also checks that the jobs'
// results written by the members are seen by the caller after run.
func TestCrewRunsEveryJobOnce(t *testing.T) {
	before := runtime.NumGoroutine()
	c := startCrew(3)
	rng := rand.New(rand.NewPCG(1, 2))
	done := make([]int32, 400)
	byMembers := 0
	for b := range 300 {
		n := rng.IntN(len(done))
		clear(done)
		var members atomic.Int32
		c.run(func(worker int, next *atomic.Int64) {
			for k := int(next.Add(1) - 1); k < n; k = int(next.Add(1) - 1) {
				done[k]++ // plain writes: run must order them before its return
				if worker != 0 {
					members.Add(1)
				}
			}
		})
		for k, d := range done {
			want := int32(0)
			if k < n {
				want = 1
			}
			if d != want {
				t.Fatalf("batch %d of %d jobs: job %d run %d times, want %d", b, n, k, d, want)
			}
		}
		byMembers += int(members.Load())
		if b%50 == 49 {
			time.Sleep(3 * spinFor) // the members park; the next batch wakes them
		}
	}
	c.stop()
	t.Logf("%d jobs run by crew members", byMembers)
	deadline := time.Now().Add(5 * time.Second)
	for runtime.NumGoroutine() > before && time.Now().Before(deadline) {
		time.Sleep(time.Millisecond)
	}
	if n := runtime.NumGoroutine(); n > before {
		t.Errorf("%d goroutines after stop, %d before the crew", n, before)
	}
}

// A crew stopped while its members are parked, or before any batch, ends.
func TestCrewStopsParkedAndIdle(t *testing.T) {
	for _, wait := range []time.Duration{0, 3 * spinFor} {
		c := startCrew(2)
		time.Sleep(wait)
		stopped := make(chan struct{})
		go func() { c.stop(); close(stopped) }()
		select {
		case <-stopped:
		case <-time.After(5 * time.Second):
			t.Fatalf("stop after %v idle did not return", wait)
		}
	}
}
