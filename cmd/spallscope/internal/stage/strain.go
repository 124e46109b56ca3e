package stage

import (
	"context"
	"fmt"
	"time"

	"spallscope/dic"
	"spallscope/dic/runfolder"
	"spallscope/strain"
	"spallscope/strain/strainfile"
)

// Strain runs the strain stage over every displacement field of run folder
// dir with window w, writing dir/strain/<frame>.csv and the "strain"
// section of run.json. subsetSize is the correlation subset, for the VSG
// (0: taken from the track section). If static > 0, the first static
// frames are static shots whose scatter gives the noise floor, written as
// the "resolution" section.
//
// When ctx is done the stage stops before its next frame with a *Stopped
// error.
func Strain(ctx context.Context, dir string, w strain.Window, subsetSize int, scale dic.Scale, static int, progress func(done, total int)) (strainfile.StrainRecord, *strainfile.ResolutionRecord, error) {
	start := time.Now()
	names, err := runfolder.Frames(dir)
	if err != nil {
		return strainfile.StrainRecord{}, nil, err
	}
	var tr runfolder.TrackRecord
	haveTrack := runfolder.Section(dir, "track", &tr) == nil
	if subsetSize == 0 {
		if !haveTrack {
			return strainfile.StrainRecord{}, nil, fmt.Errorf("run folder %s has no track record: give the subset size for the VSG", dir)
		}
		subsetSize = tr.Settings.Subset
	}
	if !scale.Known() && haveTrack {
		scale = tr.MMPerPx
	}
	if static > len(names) {
		return strainfile.StrainRecord{}, nil, fmt.Errorf("%d static frames asked for, the run has %d", static, len(names))
	}
	rec := strainfile.StrainRecord{Window: w.Size, Order: max(w.Order, 1), Measure: w.Measure, Subset: subsetSize, MMPerPx: scale}
	if rec.Measure == "" {
		rec.Measure = strain.Engineering
	}
	var staticFields []*dic.Field
	var staticStrains []*strain.Field
	for i, name := range names {
		if ctx.Err() != nil {
			return rec, nil, &Stopped{Stage: "strain", Done: i, Total: len(names), Cause: context.Cause(ctx)}
		}
		f, err := runfolder.ReadField(runfolder.FieldPath(dir, name))
		if err != nil {
			return rec, nil, err
		}
		f.Index = i
		sf, err := w.Strain(f)
		if err != nil {
			return rec, nil, fmt.Errorf("frame %s: %w", name, err)
		}
		if err := strainfile.WriteStrain(strainfile.StrainPath(dir, name), sf, scale); err != nil {
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
	if err := runfolder.SetSection(dir, "strain", rec); err != nil {
		return rec, nil, err
	}
	if static == 0 {
		return rec, nil, nil
	}
	floor, err := strain.NoiseFloor(staticFields, staticStrains)
	if err != nil {
		return rec, nil, err
	}
	res := &strainfile.ResolutionRecord{Resolution: floor, StaticFrames: names[:static], Subset: subsetSize, Step: rec.Step,
		Window: w.Size, VSG: rec.VSG, VSGmm: rec.VSGmm, Measure: string(rec.Measure)}
	if scale.Known() {
		res.UMM = scale.MM(floor.U)
	}
	if haveTrack {
		res.Interpolation, res.ShapeFunction = tr.Settings.Interpolation.String(), tr.Settings.Order.String()
	}
	return rec, res, runfolder.SetSection(dir, "resolution", res)
}
