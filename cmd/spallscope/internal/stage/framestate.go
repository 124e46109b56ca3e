package stage

import "spallscope/dic/loadlog"

// FrameState is where a frame sits in the test: camera time and nominal
// stress from the load log, as plain values.
type FrameState struct {
	Name   string
	Time   float64
	Stress float64
	InSpan bool
}

// FrameStates places frames on the test's timeline: each frame's camera
// time and, with a load log (sigma not nil), its nominal stress and
// whether the log covers it.
func FrameStates(names []string, times []float64, sigma *loadlog.Stress) []FrameState {
	states := make([]FrameState, len(names))
	for k, name := range names {
		states[k] = FrameState{Name: name, Time: times[k]}
		if sigma != nil {
			states[k].Stress, states[k].InSpan = sigma.At(times[k])
		}
	}
	return states
}
