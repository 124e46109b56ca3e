package progress

import (
	"bytes"
	"strings"
	"testing"
	"time"
)

// Plain lines: a line at the first report, about one per tenth and one at
// the end; no rate until the task has moved since its first report (the
// first tick of a task whose first unit was done before the display began
// shows "–", not a rate of thousands per second); no terminal codes.
func TestLinesTenthsAndSaneRates(t *testing.T) {
	var buf bytes.Buffer
	l := NewLines(&buf)
	clock := time.Unix(0, 0)
	l.now = func() time.Time { return clock }
	for done := 1; done <= 72; done++ {
		l.Update("front/render", done, 72)
		clock = clock.Add(500 * time.Millisecond)
	}
	out := buf.String()
	lines := strings.Split(strings.TrimSpace(out), "\n")
	// Tenths 0..10 of 72 frames: 11 lines (the last at 72/72).
	if len(lines) != 11 {
		t.Fatalf("%d lines:\n%s", len(lines), out)
	}
	if lines[0] != "front/render 1/72  –" {
		t.Errorf("first line %q, want no rate", lines[0])
	}
	// 2 frames a second by construction (one per 0.5 s).
	if want := "front/render 72/72  2.0/s, 0s left"; lines[10] != want {
		t.Errorf("last line %q, want %q", lines[10], want)
	}
	if strings.ContainsRune(out, '\x1b') || strings.ContainsRune(out, '\r') {
		t.Errorf("terminal codes in plain lines: %q", out)
	}
}

// Bars end even when a task never finishes (a failed run), and show the
// task's name.
func TestBarsWaitReturnsWithUnfinishedTasks(t *testing.T) {
	var buf bytes.Buffer
	b := NewBars(&buf, true)
	b.Update("back/track", 3, 10)
	b.Update("front/track", 10, 10)
	time.Sleep(400 * time.Millisecond) // a few refreshes
	done := make(chan struct{})
	go func() { b.Wait(); close(done) }()
	select {
	case <-done:
	case <-time.After(5 * time.Second):
		t.Fatal("Wait did not return with an unfinished task")
	}
	if !strings.Contains(buf.String(), "back/track") {
		t.Errorf("bar output %q lacks the task name", buf.String())
	}
}
