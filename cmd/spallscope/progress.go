package main

import (
	"fmt"
	"math"
	"os"
	"strings"
	"sync"
	"time"

	"github.com/spf13/cobra"
)

// progressLine returns a progress callback that prints "what done/total"
// to stderr about every tenth of the work and at the end.
func progressLine(cmd *cobra.Command, what string) func(done, total int) {
	last := -1
	return func(done, total int) {
		step := done * 10 / total
		if step != last || done == total {
			last = step
			fmt.Fprintf(cmd.ErrOrStderr(), "%s %d/%d\n", what, done, total)
		}
	}
}

// rateLine reports frames done, points per second and the time left: one
// line rewritten in place on a terminal, a line every tenth otherwise.
type rateLine struct {
	cmd        *cobra.Command
	what       string
	total, pts int
	start      time.Time
	tty        bool
	lastStep   int
}

func newRateLine(cmd *cobra.Command, what string, total, pointsPerFrame int) *rateLine {
	tty := false
	if f, ok := cmd.ErrOrStderr().(*os.File); ok {
		if st, err := f.Stat(); err == nil && st.Mode()&os.ModeCharDevice != 0 {
			tty = true
		}
	}
	return &rateLine{cmd: cmd, what: what, total: total, pts: pointsPerFrame, start: time.Now(), tty: tty, lastStep: -1}
}

// done reports that n frames are finished, the last with valid points.
func (r *rateLine) done(n, valid int) {
	el := time.Since(r.start).Seconds()
	rate := float64(n*r.pts) / el
	eta := el / float64(n) * float64(r.total-n)
	line := fmt.Sprintf("%s: frame %d/%d, %.0f points/s, %d valid in the last, %s left", r.what, n, r.total, rate, valid, time.Duration(eta*float64(time.Second)).Round(time.Second).String())
	w := r.cmd.ErrOrStderr()
	if r.tty {
		fmt.Fprintf(w, "\r%-90s", line)
		if n == r.total {
			fmt.Fprintln(w)
		}
		return
	}
	if step := n * 10 / r.total; step != r.lastStep || n == r.total {
		r.lastStep = step
		fmt.Fprintln(w, line)
	}
}

// stageLines shows one progress line per test: stage, done/total, rate and
// time left — redrawn in place on a terminal, printed about every tenth
// otherwise. Safe for concurrent updates from a campaign's tests.
type stageLines struct {
	cmd   *cobra.Command
	tty   bool
	mu    sync.Mutex
	order []string
	state map[string]*stageState
	drawn int
	// tests is the campaign's size (0 for a single run): with it an overall
	// line counts the finished tests.
	tests int
	start time.Time
}

type stageState struct {
	stage       string
	done, total int
	start       time.Time
	lastTenth   int
}

func newStageLines(cmd *cobra.Command) *stageLines {
	tty := false
	if f, ok := cmd.ErrOrStderr().(*os.File); ok {
		if st, err := f.Stat(); err == nil && st.Mode()&os.ModeCharDevice != 0 {
			tty = true
		}
	}
	return &stageLines{cmd: cmd, tty: tty, state: map[string]*stageState{}, start: time.Now()}
}

// overall describes the campaign's progress: tests whose last stage is done.
func (s *stageLines) overall() string {
	done := 0
	for _, st := range s.state {
		if st.stage == "zones" && st.done == st.total {
			done++
		}
	}
	el := time.Since(s.start)
	left := "?"
	if done > 0 {
		left = time.Duration(float64(el) / float64(done) * float64(s.tests-done)).Round(time.Second).String()
	}
	return fmt.Sprintf("%-16s %d/%d tests done, %s elapsed, %s left", "campaign", done, s.tests, el.Round(time.Second), left)
}

func (s *stageLines) update(test, stage string, done, total int) {
	s.mu.Lock()
	defer s.mu.Unlock()
	st := s.state[test]
	if st == nil {
		st = &stageState{}
		s.state[test] = st
		s.order = append(s.order, test)
	}
	if st.stage != stage {
		st.stage, st.start, st.lastTenth = stage, time.Now(), -1
	}
	st.done, st.total = done, total
	w := s.cmd.ErrOrStderr()
	if !s.tty {
		if tenth := done * 10 / max(total, 1); tenth != st.lastTenth || done == total {
			st.lastTenth = tenth
			fmt.Fprintln(w, s.line(test, st))
			if s.tests > 0 && stage == "zones" && done == total {
				fmt.Fprintln(w, s.overall())
			}
		}
		return
	}
	if s.drawn > 0 {
		fmt.Fprintf(w, "\033[%dA", s.drawn)
	}
	for _, t := range s.order {
		fmt.Fprintf(w, "\r\033[K%s\n", s.line(t, s.state[t]))
	}
	s.drawn = len(s.order)
	if s.tests > 0 {
		fmt.Fprintf(w, "\r\033[K%s\n", s.overall())
		s.drawn++
	}
}

func (s *stageLines) line(test string, st *stageState) string {
	el := time.Since(st.start).Seconds()
	rate := float64(st.done) / math.Max(el, 1e-9)
	left := "?"
	if st.done > 0 {
		left = time.Duration(el / float64(st.done) * float64(st.total-st.done) * float64(time.Second)).Round(time.Second).String()
	}
	const width = 24
	filled := width * st.done / max(st.total, 1)
	bar := strings.Repeat("#", filled) + strings.Repeat(".", width-filled)
	return fmt.Sprintf("%-16s %-7s [%s] %d/%d  %.1f/s  %s left", test, st.stage, bar, st.done, st.total, rate, left)
}

func (s *stageLines) finish() {}
