package job

import (
	"context"
	"fmt"
	"os"
	"path/filepath"
	"runtime"
	"slices"
	"strings"

	"spallscope/cmd/spallscope/internal/stage"
	"spallscope/dic"
	"spallscope/dic/aelog"
	"spallscope/dic/frames"
	"spallscope/dic/runfolder"
	"spallscope/render"
	"spallscope/render/export"
	"spallscope/strain/model"
)

// The prepare and run functions of the stage table's rows (pipeline.go).

// prepareTrack opens the photos, reference and mask and reads the
// correlation, scale and frame-time settings.
func (r *testRun) prepareTrack() ([]any, error) {
	tp, err := prepareTrack(r.t, r.tool)
	if err != nil {
		return nil, err
	}
	r.tp = tp
	for k, v := range tp.hashes {
		r.hashes[k] = v
	}
	r.notes = append(r.notes, frames.Notes(tp.in.Seq)...)
	r.notes = append(r.notes, tp.notes...)
	return tp.inputs, nil
}

// track tracks every frame, or — resume — the frames after the last
// complete field of an interrupted run (fixed reference only; an
// incremental run is tracked again from the start).
func (r *testRun) track(ctx context.Context, resume bool) error {
	in := r.tp.in
	tracker, err := dic.NewTracker(in.Ref, max(in.RefIndex, 0), in.Mask, r.tp.settings)
	if err != nil {
		return err
	}
	from := 0
	if resume && tracker.Settings().Reference == dic.FixedReference {
		from = r.tp.resume(r.out, tracker, 0, in.Seq.Len())
	}
	if from == 0 {
		removeOutputs(r.out, []string{runfolder.FieldsDir, runfolder.PhotoFieldsDir})
	}
	r.resumed = from
	n := in.Seq.Len()
	_, err = stage.Track(ctx, r.out, in.Seq, tracker, r.tp.lens, r.tp.compensation(r.out, from), r.tp.record(r.t, r.tool), from,
		func(done int, _ *dic.Field) { r.progress("track", done, n) })
	return err
}

// doneTracking lets go of the reference and the mask: the later stages
// need only their size (the outputs stage reads the reference again).
func (r *testRun) doneTracking() {
	r.tp.in.release()
}

// prepareStrain reads the strain window.
func (r *testRun) prepareStrain() ([]any, error) {
	win, err := r.t.Strain.StrainWindow()
	if err != nil {
		return nil, err
	}
	r.window = win
	return []any{win, r.t.Strain.StaticFrames, r.tp.scale}, nil
}

// strain differentiates every field.
func (r *testRun) strain(ctx context.Context, _ bool) error {
	_, _, err := stage.Strain(ctx, r.out, r.window, 0, r.tp.scale, r.t.Strain.StaticFrames,
		func(done, total int) { r.progress("strain", done, total) })
	return err
}

// prepareZones reads the zone settings and openings, and reads and checks
// the load log and the acoustic-emission log.
func (r *testRun) prepareZones() ([]any, error) {
	t := r.t
	if len(r.tp.times) != r.tp.in.Seq.Len() {
		return nil, fmt.Errorf("frame times are unknown: give times (fps, csv, mtime or exif) in the test config")
	}
	st, err := t.Zones.Stage(t.Openings)
	if err != nil {
		return nil, err
	}
	st.Finder.Scale, st.Finder.SubsetHalf = r.tp.scale, r.tp.settings.Subset/2
	if r.tp.lens != nil {
		if err := undistortOpenings(&st, &r.tp.lens.Model); err != nil {
			return nil, err
		}
	}
	r.zoneCfg = st
	loadPath := t.Resolve(t.Load.File)
	if r.hashes["load_log"], err = fileHash(loadPath); err != nil {
		return nil, err
	}
	if r.sigma, err = t.Load.Stress(loadPath); err != nil {
		return nil, err
	}
	if r.sigma != nil {
		cov, err := r.sigma.Cover(r.tp.times)
		if err != nil {
			return nil, err
		}
		if cov.Note != "" {
			r.notes = append(r.notes, cov.Note)
		}
	}
	aePath := t.Resolve(t.AE.File)
	if r.hashes["ae_log"], err = fileHash(aePath); err != nil {
		return nil, err
	}
	if t.AE.File != "" {
		if r.aeClock, err = t.AE.Clock(); err != nil {
			return nil, fmt.Errorf("acoustic emission: %w", err)
		}
		if r.aeLog, err = aelog.Read(aePath, t.AE.Format); err != nil {
			return nil, fmt.Errorf("acoustic emission: %w", err)
		}
	}
	return []any{t.Zones, t.Load, r.hashes["load_log"], r.tp.times, t.Openings, t.AE, r.hashes["ae_log"]}, nil
}

// zones finds the localized zones and their onsets on the load log's
// clock, and records the acoustic emission.
func (r *testRun) zones(_ context.Context, _ bool) error {
	names, err := runfolder.Frames(r.out)
	if err != nil {
		return err
	}
	if err := r.recordMotion(); err != nil {
		return err
	}
	states := stage.FrameStates(names, r.tp.times, r.sigma)
	if r.sigma != nil {
		if err := runfolder.RecordLoad(r.out, r.sigma); err != nil {
			return err
		}
	}
	if _, err := stage.Zones(r.out, r.zoneCfg, states, ""); err != nil {
		return err
	}
	if r.aeLog != nil {
		s, err := r.aeLog.Series(r.aeClock, aelog.GapRule{Threshold: r.t.AE.GapSeconds})
		if err != nil {
			return fmt.Errorf("acoustic emission: %w", err)
		}
		if _, err := runfolder.RecordAE(r.out, r.aeLog, s, r.t.AE.OnsetRule()); err != nil {
			return fmt.Errorf("acoustic emission: %w", err)
		}
	}
	r.progress("zones", 1, 1)
	return nil
}

// prepareOutputs reads and checks the model file.
func (r *testRun) prepareOutputs() ([]any, error) {
	t, o := r.t, r.t.Outputs
	var err error
	if r.hashes["model"], err = fileHash(t.Resolve(t.Model.File)); err != nil {
		return nil, err
	}
	if t.Model.File != "" {
		f := t.Model.Format()
		f.Scale = r.tp.scale
		if _, err := model.Read(t.Resolve(t.Model.File), f); err != nil {
			return nil, err
		}
	}
	return []any{o.WantOverlays(), o.WantVideo(), o.WantReport(), o.WantVTK(), o.WantNPY(), o.Field, t.Model, r.hashes["model"]}, nil
}

// outputs holds the model against the measurement, draws the overlays
// and the video, writes the report and the open-format exports the config
// asks for.
func (r *testRun) outputs(ctx context.Context, _ bool) error {
	t, o, out := r.t, r.t.Outputs, r.out
	if m := t.Model; m.File != "" {
		if _, err := CompareModel(out, t.Resolve(m.File), t.Model.Format(), m.Frame, m.LoadMPa); err != nil {
			return err
		}
	}
	if o.WantOverlays() || o.WantVideo() {
		os.RemoveAll(filepath.Join(out, render.OverlaysDir))
		if _, err := drawOverlays(ctx, out, render.Options{Field: o.Field, Video: o.WantVideo(),
			Progress: func(n, total int) { r.progress("render", n, total) }}); err != nil {
			return err
		}
	}
	if o.WantReport() {
		if _, err := render.WriteReport(out, render.ReportOptions{Tool: r.tool}); err != nil {
			return err
		}
	}
	if o.WantVTK() || o.WantNPY() {
		if _, err := export.Export(out, export.Options{VTK: o.WantVTK(), NPY: o.WantNPY()}); err != nil {
			return err
		}
	}
	return nil
}

// drawOverlays is render.Run with the collector's growth low while it
// holds the reference photo and the overlays' photo-sized arrays from
// frame to frame (stage.CollectOften). Once they are dead one collection
// frees them before Go's default growth returns, so that the next goal is
// not twice their size (measured at 20 MP: 1.03 GB in the report without
// it); the rest of the outputs stage works on small heaps, where 5 %
// growth would collect hundreds of times.
func drawOverlays(ctx context.Context, dir string, opt render.Options) (render.Result, error) {
	restore := stage.CollectOften()
	defer func() {
		runtime.GC()
		restore()
	}()
	return render.Run(ctx, dir, opt)
}

// unmeasuredNote tells of the frames in which no point was measured.
func unmeasuredNote(names []string, frames int) string {
	list := names
	if len(list) > 5 {
		list = append(slices.Clone(list[:5]), fmt.Sprintf("and %d more", len(names)-5))
	}
	return fmt.Sprintf("%d of %d frames have no measured point (%s): blank, untextured or lost photos; their fields are empty", len(names), frames, strings.Join(list, ", "))
}
