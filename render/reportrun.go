package render

import (
	"encoding/json"
	"errors"
	"fmt"
	"io/fs"
	"math"
	"os"
	"path/filepath"

	"spallscope/dic"
	"spallscope/dic/runfolder"
	"spallscope/strain/strainfile"
)

// runRecords is what a run folder says about its test, read once for the
// plots and the report. A stage that has not run leaves its record nil;
// Missing says, for people, what is absent and what that costs.
type runRecords struct {
	Dir string
	// PlotDir is the folder the plots are written under (its plots/
	// subfolder): the run folder, or beside a report written elsewhere so
	// that the run folder is only read.
	PlotDir    string
	Track      *runfolder.TrackRecord
	Strain     *strainfile.StrainRecord
	Resolution *strainfile.ResolutionRecord
	Timeline   *strainfile.TimelineRecord
	Load       *runfolder.LoadRecord
	Onset      *strainfile.OnsetReport
	Zones      []strainfile.ZoneRow
	AE         *runfolder.AERecord
	Scale      dic.Scale
	Axis       frameAxis
	Missing    []string
}

// frameAxis places the frames of a run along the horizontal axis of the
// history plots: at their camera times when the run knows them, else at
// their positions in the sequence.
type frameAxis struct {
	Names []string
	// X is each frame's place: time in s when Timed, else the frame index.
	X     []float64
	Timed bool
	// Stress is each frame's nominal stress in MPa (NaN when unknown).
	Stress []float64
	index  map[string]int
}

// Label is the axis label.
func (a frameAxis) Label() string {
	if a.Timed {
		return "time, s"
	}
	return "frame"
}

// Of returns the place of a frame by name, and whether it is known.
func (a frameAxis) Of(name string) (float64, bool) {
	k, ok := a.index[name]
	if !ok {
		return 0, false
	}
	return a.X[k], true
}

// HasStress reports whether some frame has a known stress.
func (a frameAxis) HasStress() bool {
	for _, s := range a.Stress {
		if !math.IsNaN(s) {
			return true
		}
	}
	return false
}

// readRunRecords reads every record of run folder dir. Only a folder
// without displacement fields and without a manifest is an error; a record
// that exists but cannot be read is an error naming its file.
func readRunRecords(dir string) (*runRecords, error) {
	if st, err := os.Stat(dir); err != nil {
		return nil, fmt.Errorf("run folder: %w", err)
	} else if !st.IsDir() {
		return nil, fmt.Errorf("run folder %s is not a folder", dir)
	}
	r := &runRecords{Dir: dir}
	var tr runfolder.TrackRecord
	var sr strainfile.StrainRecord
	var res strainfile.ResolutionRecord
	var tl strainfile.TimelineRecord
	var ld runfolder.LoadRecord
	var ae runfolder.AERecord
	if runfolder.Section(dir, "ae", &ae) == nil {
		r.AE = &ae // optional: no note when a test has no acoustic emission
	}
	sections := []struct {
		name, missing string
		v             any
		keep          func()
	}{
		{"track", "no track record: settings are unknown", &tr, func() { r.Track = &tr }},
		{"strain", "no strain record: the strain window and VSG are unknown", &sr, func() { r.Strain = &sr }},
		{"resolution", "no resolution record: no static frames were measured, so the results carry no stated noise floor", &res, func() { r.Resolution = &res }},
		{"timeline", "no timeline: frame stresses are unknown (run zones with a load log)", &tl, func() { r.Timeline = &tl }},
		{"load", "no load log record: the stress history is unknown", &ld, func() { r.Load = &ld }},
	}
	for _, s := range sections {
		err := runfolder.Section(dir, s.name, s.v)
		switch {
		case err == nil:
			s.keep()
		case errors.Is(err, fs.ErrNotExist):
			r.Missing = append(r.Missing, s.missing)
		default:
			return nil, err
		}
	}
	onsetPath := filepath.Join(dir, strainfile.OnsetJSON)
	data, err := os.ReadFile(onsetPath)
	switch {
	case err == nil:
		var rep strainfile.OnsetReport
		if err := json.Unmarshal(data, &rep); err != nil {
			return nil, fmt.Errorf("%s: %w", onsetPath, err)
		}
		r.Onset = &rep
	case errors.Is(err, fs.ErrNotExist):
		r.Missing = append(r.Missing, "no onset.json: zones have not been found (run zones)")
	default:
		return nil, err
	}
	r.Zones, err = strainfile.ReadZones(dir)
	if err != nil {
		if !errors.Is(err, fs.ErrNotExist) {
			return nil, err
		}
		r.Zones = nil
		if r.Onset != nil {
			r.Missing = append(r.Missing, fmt.Sprintf("zone histories not drawn: %v", err))
		}
	}
	r.Scale = strainfile.Scale(dir)
	if r.Axis, err = r.frameAxis(); err != nil {
		return nil, err
	}
	return r, nil
}

// frameAxis builds the frames' places from the timeline, else the track
// record, else the fields on disk.
func (r *runRecords) frameAxis() (frameAxis, error) {
	var a frameAxis
	var times []float64
	switch {
	case r.Timeline != nil && len(r.Timeline.Frames) > 0:
		a.Names, times = r.Timeline.Frames, r.Timeline.Times
		if len(r.Timeline.Stress) == len(a.Names) {
			a.Stress = r.Timeline.Stress
		}
	case r.Track != nil && len(r.Track.Frames) > 0:
		a.Names, times = r.Track.Frames, r.Track.Times
	default:
		names, err := runfolder.Frames(r.Dir)
		if err != nil {
			if r.Onset == nil && r.Track == nil && r.Strain == nil {
				return a, fmt.Errorf("%s holds no run: %w", r.Dir, err)
			}
			return a, nil
		}
		a.Names = names
	}
	if len(times) == len(a.Names) && len(times) > 1 {
		lo, hi := math.Inf(1), math.Inf(-1)
		for _, t := range times {
			lo, hi = math.Min(lo, t), math.Max(hi, t)
		}
		a.Timed = hi > lo
	}
	a.index = make(map[string]int, len(a.Names))
	for k, name := range a.Names {
		a.index[name] = k
		if a.Timed {
			a.X = append(a.X, times[k])
		} else {
			a.X = append(a.X, float64(k))
		}
	}
	if a.Stress == nil {
		a.Stress = make([]float64, len(a.Names))
		for k := range a.Stress {
			a.Stress[k] = math.NaN()
		}
	}
	return a, nil
}

// OnsetX returns the place of an onset on the frame axis.
func (r *runRecords) OnsetX(o strainfile.OnsetRecord) float64 {
	if x, ok := r.Axis.Of(o.Name); ok {
		return x
	}
	if r.Axis.Timed {
		return o.Time
	}
	return float64(o.Frame)
}

// Index returns the position of a frame in the sequence by name, and
// whether it is known.
func (a frameAxis) Index(name string) (int, bool) {
	k, ok := a.index[name]
	return k, ok
}

// FrameX returns the place of the frame at position k of the sequence (the
// frame index of onset.json's histories), and whether it is known.
func (r *runRecords) FrameX(k int) (float64, bool) {
	if k >= 0 && k < len(r.Axis.X) {
		return r.Axis.X[k], true
	}
	if !r.Axis.Timed {
		return float64(k), true
	}
	return 0, false
}

// TriggerAt returns the place of an onset's trigger frame on the frame
// axis and its nominal stress (NaN when unknown), and whether the trigger
// is known (records from before back-dating carry none).
func (r *runRecords) TriggerAt(o strainfile.OnsetRecord) (x, stress float64, ok bool) {
	if o.TriggerName == "" && o.Interval == nil {
		return 0, math.NaN(), false
	}
	k, found := r.Axis.Index(o.TriggerName)
	if !found {
		if o.TriggerName != "" || o.TriggerFrame < 0 || o.TriggerFrame >= len(r.Axis.X) {
			return 0, math.NaN(), false
		}
		k = o.TriggerFrame
	}
	return r.Axis.X[k], r.Axis.Stress[k], true
}

// ZoneX returns the place of a zone row on the frame axis.
func (r *runRecords) ZoneX(z strainfile.ZoneRow) float64 {
	if x, ok := r.Axis.Of(z.Frame); ok {
		return x
	}
	return z.Time
}

// ZoneFrame returns the position of a zone row's frame in the sequence,
// −1 when the frame is not one of the run's.
func (r *runRecords) ZoneFrame(z strainfile.ZoneRow) int {
	if k, ok := r.Axis.index[z.Frame]; ok {
		return k
	}
	return -1
}

// plotRoot is the folder whose plots/ subfolder receives the plots.
func (r *runRecords) plotRoot() string {
	if r.PlotDir != "" {
		return r.PlotDir
	}
	return r.Dir
}
