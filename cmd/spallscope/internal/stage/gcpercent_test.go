package stage

import (
	"math/rand/v2"
	"os"
	"runtime"
	"runtime/debug"
	"testing"
	"time"

	"spallscope/dic"
	"spallscope/subset"
)

// gcPercent returns the collector's growth without changing it
// (debug.SetGCPercent returns the previous setting).
func gcPercent() int {
	p := debug.SetGCPercent(100)
	debug.SetGCPercent(p)
	return p
}

// The collector's growth is lowGCPercent while a tracker the stage ran
// is live, and back to what it was once the collector has freed it; a
// GOGC in the environment is left alone (runtime/debug's documented
// semantics: SetGCPercent returns the previous setting).
func TestCollectOftenWhileTrackerLives(t *testing.T) {
	if v, set := os.LookupEnv("GOGC"); set {
		defer os.Setenv("GOGC", v)
		os.Unsetenv("GOGC")
	}
	defer debug.SetGCPercent(debug.SetGCPercent(100))
	rng := rand.New(rand.NewPCG(1, 2))
	ref := subset.NewImage(64, 64, 8)
	for i := range ref.Pix {
		ref.Pix[i] = float32(255 * rng.Float64())
	}
	newTracker := func() *dic.Tracker {
		tr, err := dic.NewTracker(ref, 0, nil, dic.Settings{Subset: 21, Step: 10})
		if err != nil {
			t.Fatal(err)
		}
		return tr
	}
	a, b := newTracker(), newTracker()
	collectOften(a)
	collectOften(b)
	if p := gcPercent(); p != lowGCPercent {
		t.Fatalf("growth %d %% with trackers live, want %d", p, lowGCPercent)
	}
	a = nil
	collectUntil(func() bool { return false }, 200*time.Millisecond)
	if p := gcPercent(); p != lowGCPercent {
		t.Errorf("growth %d %% with one of two trackers freed, want %d", p, lowGCPercent)
	}
	runtime.KeepAlive(b)
	b = nil
	if !collectUntil(func() bool { return gcPercent() == 100 }, 5*time.Second) {
		t.Errorf("growth %d %% after both trackers were freed, want 100 restored", gcPercent())
	}

	os.Setenv("GOGC", "100")
	defer os.Unsetenv("GOGC")
	collectOften(newTracker())
	if p := gcPercent(); p != 100 {
		t.Errorf("growth %d %% with GOGC=100 in the environment, want 100 kept", p)
	}
}

// collectUntil runs the collector until done reports true or the time is
// up, and returns done's last answer.
func collectUntil(done func() bool, limit time.Duration) bool {
	for end := time.Now().Add(limit); time.Now().Before(end); {
		runtime.GC()
		if done() {
			return true
		}
		time.Sleep(10 * time.Millisecond)
	}
	return done()
}

// The job's hold nests with a tracker's: the growth stays low until both
// have let go, and a second call of the same restore does not let go of
// another holder's (runtime/debug's documented semantics, as above).
func TestCollectOftenNests(t *testing.T) {
	if v, set := os.LookupEnv("GOGC"); set {
		defer os.Setenv("GOGC", v)
		os.Unsetenv("GOGC")
	}
	defer debug.SetGCPercent(debug.SetGCPercent(100))
	job := CollectOften()
	tracker := CollectOften()
	if p := gcPercent(); p != lowGCPercent {
		t.Fatalf("growth %d %% with two holders, want %d", p, lowGCPercent)
	}
	job()
	job()
	if p := gcPercent(); p != lowGCPercent {
		t.Errorf("growth %d %% after the job let go twice with a tracker left, want %d", p, lowGCPercent)
	}
	tracker()
	if p := gcPercent(); p != 100 {
		t.Errorf("growth %d %% after both let go, want 100 restored", p)
	}
}
