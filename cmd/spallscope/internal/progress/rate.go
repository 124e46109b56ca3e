package progress

import (
	"fmt"
	"time"
)

// rate measures a task's speed from its first report on: units done since
// that report over the time since it.
type rate struct {
	start     time.Time
	startDone int
}

func newRate(now time.Time, done int) rate { return rate{start: now, startDone: done} }

// perSecond returns units per second and whether it is known yet (at least
// one unit and a tenth of a second after the first report).
func (r rate) perSecond(now time.Time, done int) (float64, bool) {
	el := now.Sub(r.start).Seconds()
	if done <= r.startDone || el < 0.1 {
		return 0, false
	}
	return float64(done-r.startDone) / el, true
}

// describe formats the rate and the time left ("3.2/s, 12s left"), or "–"
// while the rate is not known.
func (r rate) describe(now time.Time, done, total int) string {
	v, ok := r.perSecond(now, done)
	if !ok {
		return "–"
	}
	left := time.Duration(float64(total-done) / v * float64(time.Second)).Round(time.Second)
	return fmt.Sprintf("%.1f/s, %s left", v, left)
}
