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

// LoadRecord is the run.json section describing the load log used, with
// its nominal-stress history on the camera's clock (at most a few thousand
// samples) for plotting.
type LoadRecord struct {
	Path    string    `json:"path"`
	AreaMM2 float64   `json:"area_mm2"`
	Offset  float64   `json:"clock_offset_s"`
	Times   []float64 `json:"times_s"`
	Stress  []float64 `json:"stress_MPa"`
	Peak    float64   `json:"peak_MPa"`
	PeakAt  float64   `json:"peak_time_s"`
	Notes   []string  `json:"notes,omitempty"`
}
