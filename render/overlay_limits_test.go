package render

import (
	"errors"
	"math"
	"os"
	"runtime"
	"slices"
	"strings"
	"testing"
	"time"

	"spallscope/dic/runfolder"
	"spallscope/strain/strainfile"
)

// The limits pass reads a run's frames on several goroutines
// (runfolder.ReadInOrder) with the values a serial read gives, in frame
// order; a bad strain file stops it at that frame with the serial read's
// error (naming the file), before any later frame is used, also when a
// later file is bad too; an error of the consumer stops the reading; no
// goroutine is left.
func TestLimitsPassReadsInOrder(t *testing.T) {
	const n = 7
	dir, sc := synthRun(t, n)
	q, err := QuantityNamed("exx")
	if err != nil {
		t.Fatal(err)
	}
	rr, err := openRenderRun(dir, Options{Field: "exx"})
	if err != nil {
		t.Fatal(err)
	}
	defer rr.seq.Close()
	if len(rr.names) != n {
		t.Fatalf("%d frames in the run, expected %d", len(rr.names), n)
	}
	before := runtime.NumGoroutine()
	var order []int
	err = runfolder.ReadInOrder(n, func(k int) (frameData, error) { return rr.frameValues(q, rr.names[k], true) }, func(k int, fd frameData) error {
		order = append(order, k)
		want, err := rr.frameValues(q, rr.names[k], true)
		if err != nil {
			return err
		}
		same := func(a, b []float64) bool {
			return slices.EqualFunc(a, b, func(x, y float64) bool { return x == y || (math.IsNaN(x) && math.IsNaN(y)) })
		}
		if !same(fd.values.Values, want.values.Values) || !same(fd.u.Values, want.u.Values) || !same(fd.v.Values, want.v.Values) {
			t.Errorf("frame %d: values differ from a serial read", k)
		}
		return nil
	})
	if err != nil {
		t.Fatal(err)
	}
	if !slices.Equal(order, []int{0, 1, 2, 3, 4, 5, 6}) {
		t.Errorf("frames handed over in the order %v, expected 0…%d", order, n-1)
	}

	// Frames 3 and 5 broken: the error is frame 3's, and only 0–2 arrive.
	for _, k := range []int{3, 5} {
		if err := os.WriteFile(strainfile.StrainPath(dir, sc.FrameName(k)), []byte("x,y\nnot,a number\n"), 0o644); err != nil {
			t.Fatal(err)
		}
	}
	_, serial := rr.frameValues(q, sc.FrameName(3), false)
	if serial == nil {
		t.Fatal("a serial read of the broken frame 3 gave no error")
	}
	for range 5 { // the goroutines' timing differs from run to run
		order = order[:0]
		err = runfolder.ReadInOrder(n, func(k int) (frameData, error) { return rr.frameValues(q, rr.names[k], false) }, func(k int, _ frameData) error {
			order = append(order, k)
			return nil
		})
		if err == nil || err.Error() != serial.Error() || !strings.Contains(err.Error(), sc.FrameName(3)) {
			t.Fatalf("error %v, expected frame 3's serial error %v naming %s", err, serial, sc.FrameName(3))
		}
		if !slices.Equal(order, []int{0, 1, 2}) {
			t.Fatalf("frames %v handed over before the error, expected 0–2", order)
		}
	}

	// The consumer's error stops the reading at once.
	stop := errors.New("enough")
	order = order[:0]
	if err := runfolder.ReadInOrder(n, func(k int) (frameData, error) { return rr.frameValues(q, rr.names[k], false) }, func(k int, _ frameData) error {
		order = append(order, k)
		return stop
	}); !errors.Is(err, stop) || len(order) != 1 {
		t.Errorf("consumer error: %v after frames %v, expected %v after frame 0 alone", err, order, stop)
	}
	// The last reader may still be returning when the call does.
	after := runtime.NumGoroutine()
	for try := 0; try < 100 && after > before; try++ {
		time.Sleep(10 * time.Millisecond)
		after = runtime.NumGoroutine()
	}
	if after > before {
		t.Errorf("%d goroutines after the reads, %d before", after, before)
	}
}
