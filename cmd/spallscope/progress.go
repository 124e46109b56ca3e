package main

import (
	"fmt"
	"os"
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
