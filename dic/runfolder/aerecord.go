package runfolder

import (
	"spallscope/dic/aelog"
)

// AERecord is the run.json "ae" section: the acoustic-emission record on
// the camera's clock — cumulative hits and energy (thinned for plots), the
// hit-rate onset with the figures it was judged by, and the gaps in the
// record (reported, never bridged).
type AERecord struct {
	Path       string       `json:"path"`
	Hits       int          `json:"hits"`
	Times      []float64    `json:"times_s"`
	Cumulative []float64    `json:"cumulative_hits"`
	Energy     []float64    `json:"cumulative_energy,omitempty"`
	EnergyUnit string       `json:"energy_unit,omitempty"`
	Onset      *aelog.Onset `json:"onset,omitempty"`
	Rule       string       `json:"onset_rule"`
	Gaps       []aelog.Gap  `json:"gaps,omitempty"`
	Notes      []string     `json:"notes,omitempty"`
}

// RecordAE builds the "ae" section from a series and writes it.
func RecordAE(dir string, lg *aelog.Log, s *aelog.Series, rule aelog.OnsetRule) (*AERecord, error) {
	rec := &AERecord{Path: lg.Path, Hits: lg.Len(), EnergyUnit: lg.EnergyUnit, Notes: lg.Notes, Gaps: s.Gaps(),
		Rule: "first hit after which P consecutive windows of w s each hold more than k × the early-test background rate"}
	times, hits, energy := s.Cumulative()
	step := max(1, (len(times)+1999)/2000)
	for i := 0; i < len(times); i += step {
		rec.Times = append(rec.Times, times[i])
		rec.Cumulative = append(rec.Cumulative, hits[i])
		if lg.Has.Energy {
			rec.Energy = append(rec.Energy, energy[i])
		}
	}
	if n := len(times); n > 0 && (n-1)%step != 0 {
		rec.Times, rec.Cumulative = append(rec.Times, times[n-1]), append(rec.Cumulative, hits[n-1])
		if lg.Has.Energy {
			rec.Energy = append(rec.Energy, energy[n-1])
		}
	}
	on, ok, err := s.Onset(rule)
	if err != nil {
		return nil, err
	}
	if ok {
		rec.Onset = &on
	}
	return rec, SetSection(dir, "ae", rec)
}
