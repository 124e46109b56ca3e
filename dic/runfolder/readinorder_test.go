package runfolder

import (
	"errors"
	"fmt"
	"runtime"
	"slices"
	"sync/atomic"
	"testing"
	"time"
)

// ReadInOrder hands every result over in order, whatever order the reads
// finish in; holds at most MaxReadAhead reads at once; stops at the first
// failing frame in order with its error, also when a later frame failed
// first, handing over nothing after it; stops when use fails; and leaves
// no goroutine behind.
func TestReadInOrder(t *testing.T) {
	before := runtime.NumGoroutine()
	const n = 40
	var inFlight, most atomic.Int32
	read := func(fail ...int) func(k int) (int, error) {
		return func(k int) (int, error) {
			now := inFlight.Add(1)
			defer inFlight.Add(-1)
			for {
				m := most.Load()
				if now <= m || most.CompareAndSwap(m, now) {
					break
				}
			}
			// Later frames finish first within a batch.
			time.Sleep(time.Duration((n-k)%5) * time.Millisecond)
			if slices.Contains(fail, k) {
				return 0, fmt.Errorf("frame %d: bad file", k)
			}
			return k * k, nil
		}
	}
	var got []int
	err := ReadInOrder(n, read(), func(k, v int) error {
		if v != k*k {
			t.Errorf("frame %d: value %d, expected %d", k, v, k*k)
		}
		got = append(got, k)
		return nil
	})
	if err != nil {
		t.Fatal(err)
	}
	if len(got) != n || !slices.IsSorted(got) {
		t.Errorf("frames used %v, expected 0…%d in order", got, n-1)
	}
	if m := int(most.Load()); m > MaxReadAhead || m > runtime.GOMAXPROCS(0) {
		t.Errorf("%d reads at once, expected at most min(%d, GOMAXPROCS %d)", m, MaxReadAhead, runtime.GOMAXPROCS(0))
	}
	for range 10 {
		got = got[:0]
		err = ReadInOrder(n, read(7, 8, 30), func(k, _ int) error { got = append(got, k); return nil })
		if err == nil || err.Error() != "frame 7: bad file" {
			t.Fatalf("error %v, expected frame 7's", err)
		}
		if !slices.Equal(got, []int{0, 1, 2, 3, 4, 5, 6}) {
			t.Fatalf("frames %v used before the error, expected 0–6", got)
		}
	}
	enough := errors.New("enough")
	got = got[:0]
	if err := ReadInOrder(n, read(), func(k, _ int) error { got = append(got, k); return enough }); !errors.Is(err, enough) || len(got) != 1 {
		t.Errorf("use's error: %v after frames %v, expected %v after frame 0 alone", err, got, enough)
	}
	if err := ReadInOrder(0, read(), func(k, _ int) error { return fmt.Errorf("frame %d used", k) }); err != nil {
		t.Errorf("no frames: %v", err)
	}
	after := runtime.NumGoroutine()
	for try := 0; try < 100 && after > before; try++ {
		time.Sleep(10 * time.Millisecond) // a reader may still be returning
		after = runtime.NumGoroutine()
	}
	if after > before {
		t.Errorf("%d goroutines after the reads, %d before", after, before)
	}
}
