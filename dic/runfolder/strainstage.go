package runfolder

import (
	"errors"
	"fmt"
	"io/fs"
	"path/filepath"
	"strings"
	"time"

	"spallscope/dic"
	"spallscope/dic/frames"
	"spallscope/strain"
)

// StrainRecord is the run.json section written by the strain stage.
type StrainRecord struct {
	Window  int            `json:"window_points"`
	Order   int            `json:"fit_order"`
	Measure strain.Measure `json:"measure"`
	Step    int            `json:"step_px"`
	Subset  int            `json:"subset_px"`
	VSG     int            `json:"vsg_px"`
	VSGmm   float64        `json:"vsg_mm,omitempty"`
	MMPerPx dic.Scale      `json:"mm_per_px,omitempty"`
	Frames  []string       `json:"frames"`
	Seconds float64        `json:"seconds"`
}

// ResolutionRecord is the run.json section that states the measurement
// resolution with the settings that produced it (the reporting items of
// the iDICs Good Practices Guide, 2018).
type ResolutionRecord struct {
	strain.Resolution
	StaticFrames  []string `json:"static_frame_names"`
	Subset        int      `json:"subset_px"`
	Step          int      `json:"step_px"`
	Window        int      `json:"strain_window_points"`
	VSG           int      `json:"vsg_px"`
	VSGmm         float64  `json:"vsg_mm,omitempty"`
	UMM           float64  `json:"u_mm,omitempty"`
	Interpolation string   `json:"interpolation"`
	ShapeFunction string   `json:"shape_function"`
	Measure       string   `json:"measure"`
}

// Frames lists the frames of a run folder whose displacement fields exist,
// in the order the track stage recorded (or natural order of the files).
func Frames(dir string) ([]string, error) {
	var rec TrackRecord
	err := Section(dir, "track", &rec)
	switch {
	case err == nil && len(rec.Frames) > 0:
		return rec.Frames, nil
	case err != nil && !errors.Is(err, fs.ErrNotExist):
		return nil, err
	}
	matches, _ := filepath.Glob(filepath.Join(dir, FieldsDir, "*.csv"))
	if len(matches) == 0 {
		return nil, fmt.Errorf("run folder %s: no displacement fields in %s (run track first)", dir, filepath.Join(dir, FieldsDir))
	}
	var names []string
	for _, m := range matches {
		names = append(names, strings.TrimSuffix(filepath.Base(m), ".csv"))
	}
	frames.SortNatural(names)
	return names, nil
}

// Strain runs the strain stage over every displacement field of run folder
// dir with window w, writing dir/strain/<frame>.csv and the "strain"
// section of run.json. subsetSize is the correlation subset, for the VSG
// (0: taken from the track section). If static > 0, the first static
// frames are static shots whose scatter gives the noise floor, written as
// the "resolution" section.
func Strain(dir string, w strain.Window, subsetSize int, scale dic.Scale, static int, progress func(done, total int)) (StrainRecord, *ResolutionRecord, error) {
	start := time.Now()
	names, err := Frames(dir)
	if err != nil {
		return StrainRecord{}, nil, err
	}
	var tr TrackRecord
	haveTrack := Section(dir, "track", &tr) == nil
	if subsetSize == 0 {
		if !haveTrack {
			return StrainRecord{}, nil, fmt.Errorf("run folder %s has no track record: give the subset size for the VSG", dir)
		}
		subsetSize = tr.Settings.Subset
	}
	if !scale.Known() && haveTrack {
		scale = tr.MMPerPx
	}
	if static > len(names) {
		return StrainRecord{}, nil, fmt.Errorf("%d static frames asked for, the run has %d", static, len(names))
	}
	rec := StrainRecord{Window: w.Size, Order: max(w.Order, 1), Measure: w.Measure, Subset: subsetSize, MMPerPx: scale}
	if rec.Measure == "" {
		rec.Measure = strain.Engineering
	}
	var staticFields []*dic.Field
	var staticStrains []*strain.Field
	for i, name := range names {
		f, err := ReadField(FieldPath(dir, name))
		if err != nil {
			return rec, nil, err
		}
		f.Index = i
		sf, err := w.Strain(f)
		if err != nil {
			return rec, nil, fmt.Errorf("frame %s: %w", name, err)
		}
		if err := WriteStrain(StrainPath(dir, name), sf, scale); err != nil {
			return rec, nil, err
		}
		if i < static {
			staticFields, staticStrains = append(staticFields, f), append(staticStrains, sf)
		}
		rec.Step = f.Grid.Step
		rec.Frames = append(rec.Frames, name)
		if progress != nil {
			progress(i+1, len(names))
		}
	}
	rec.VSG = w.VSG(rec.Step, subsetSize)
	if scale.Known() {
		rec.VSGmm = scale.MM(float64(rec.VSG))
	}
	rec.Seconds = time.Since(start).Seconds()
	if err := SetSection(dir, "strain", rec); err != nil {
		return rec, nil, err
	}
	if static == 0 {
		return rec, nil, nil
	}
	floor, err := strain.NoiseFloor(staticFields, staticStrains)
	if err != nil {
		return rec, nil, err
	}
	res := &ResolutionRecord{Resolution: floor, StaticFrames: names[:static], Subset: subsetSize, Step: rec.Step,
		Window: w.Size, VSG: rec.VSG, VSGmm: rec.VSGmm, Measure: string(rec.Measure)}
	if scale.Known() {
		res.UMM = scale.MM(floor.U)
	}
	if haveTrack {
		res.Interpolation, res.ShapeFunction = tr.Settings.Interpolation.String(), tr.Settings.Order.String()
	}
	return rec, res, SetSection(dir, "resolution", res)
}
