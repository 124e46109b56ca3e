package runfolder

import (
	"spallscope/dic/loadlog"
)

// RecordLoad writes the "load" section of dir's run.json: the log used and
// its nominal stress on the camera's clock, thinned to at most 4000
// samples (every k-th, keeping the peak) for plots.
func RecordLoad(dir string, s *loadlog.Stress) error {
	lg := s.Log
	peak, at := s.Peak()
	rec := LoadRecord{Path: lg.Path, AreaMM2: s.AreaMM2, Offset: s.Clock.LogTime(0), Peak: peak, PeakAt: at, Notes: lg.Notes}
	n := len(lg.Time)
	step := max(1, (n+3999)/4000)
	for i := 0; i < n; i++ {
		t := s.Clock.CameraTime(lg.Time[i])
		if i%step != 0 && t != at && i != n-1 {
			continue
		}
		rec.Times = append(rec.Times, t)
		rec.Stress = append(rec.Stress, lg.Force[i]/s.AreaMM2)
	}
	return SetSection(dir, "load", rec)
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
