package job

import (
	"context"
	"fmt"
	"os"

	"spallscope/cmd/spallscope/internal/config"
	"spallscope/cmd/spallscope/internal/stage"
	"spallscope/dic"
	"spallscope/dic/frames"
	"spallscope/dic/lens"
	"spallscope/dic/runfolder"
	"spallscope/strain/strainfile"
)

// The track, strain and zones commands run one stage over a run folder,
// configured by the same config sections a test config fills: these are
// the functions they call. They keep no fingerprints (Run does).

// Track runs the track stage of test t alone into run folder out: it
// opens the photos, reference and mask, builds the tracker from the
// correlation section and tracks every frame. progress gets the frame
// count, the frames in all and the points of a frame.
func Track(ctx context.Context, t *config.Test, out, tool string, progress func(done, total, points int)) (runfolder.TrackRecord, error) {
	unlock, err := claimAndLock(out, tool)
	if err != nil {
		return runfolder.TrackRecord{}, err
	}
	defer unlock()
	tp, err := prepareTrack(t, tool)
	if err != nil {
		return runfolder.TrackRecord{}, err
	}
	defer tp.in.Seq.Close()
	tracker, err := dic.NewTracker(tp.in.Ref, tp.in.RefIndex, tp.in.Mask, tp.settings)
	if err != nil {
		return runfolder.TrackRecord{}, err
	}
	n, points := tp.in.Seq.Len(), tracker.Grid().Len()
	return stage.Track(ctx, out, tp.in.Seq, tracker, tp.lens, tp.compensation(out, 0), tp.record(t, tool), 0, func(done int, _ *dic.Field) {
		if progress != nil {
			progress(done, n, points)
		}
	})
}

// Strain runs the strain stage alone over run folder dir with test t's
// strain section and scale. subsetSize is the correlation subset for the
// VSG (0: from the track record).
func Strain(ctx context.Context, t *config.Test, dir string, subsetSize int, progress func(done, total int)) (strainfile.StrainRecord, *strainfile.ResolutionRecord, error) {
	win, err := t.Strain.StrainWindow()
	if err != nil {
		return strainfile.StrainRecord{}, nil, err
	}
	scale, err := t.Scale.Value()
	if err != nil {
		return strainfile.StrainRecord{}, nil, err
	}
	unlock, err := lockRun(dir)
	if err != nil {
		return strainfile.StrainRecord{}, nil, err
	}
	defer unlock()
	return stage.Strain(ctx, dir, win, subsetSize, scale, t.Strain.StaticFrames, progress)
}

// Zones runs the zones stage alone over run folder dir with test t's
// zones, openings, load and frame-rate settings. What t leaves out comes
// from the run's own records: the openings from the shapes excluded at
// tracking (named A, B, ...), the frame times from the track record, the
// scale and subset size from the track and strain records. notes are the
// load log's remarks.
func Zones(t *config.Test, dir, tool string) (rep *strainfile.OnsetReport, notes []string, err error) {
	unlock, err := lockRun(dir)
	if err != nil {
		return nil, nil, err
	}
	defer unlock()
	var tr runfolder.TrackRecord
	haveTrack := runfolder.Section(dir, "track", &tr) == nil
	openings := t.Openings
	if len(openings) == 0 && haveTrack {
		for i, s := range tr.Exclude {
			openings = append(openings, config.Opening{Name: stage.DefaultOpeningName(i), Shape: s})
		}
	}
	st, err := t.Zones.Stage(openings)
	if err != nil {
		return nil, nil, err
	}
	if haveTrack {
		st.Finder.SubsetHalf = tr.Settings.Subset / 2
		if tr.Lens != nil {
			m, err := lens.Read(tr.Lens.File)
			if err != nil {
				return nil, nil, fmt.Errorf("the fields of %s are corrected for a lens, whose file is needed to place the openings: %w", dir, err)
			}
			if err := tr.Lens.Unchanged(tr.Lens.File); err != nil {
				return nil, nil, fmt.Errorf("run folder %s: %w", dir, err)
			}
			if err := undistortOpenings(&st, &m); err != nil {
				return nil, nil, err
			}
		}
	}
	st.Finder.Scale = strainfile.Scale(dir)
	names, err := runfolder.Frames(dir)
	if err != nil {
		return nil, nil, err
	}
	times := tr.Times
	if t.Times.FPS > 0 {
		if times, err = frames.FixedRate(len(names), t.Times.FPS, 0); err != nil {
			return nil, nil, err
		}
	}
	if len(times) != len(names) {
		return nil, nil, fmt.Errorf("frame times of %s are unknown: give a frame rate here, or track with a frame rate, a times CSV, file times or EXIF times", dir)
	}
	sigma, err := t.Load.Stress(t.Load.File)
	if err != nil {
		return nil, nil, err
	}
	if sigma != nil {
		notes = sigma.Log.Notes
		if err := runfolder.RecordLoad(dir, sigma); err != nil {
			return nil, nil, err
		}
	}
	rep, err = stage.Zones(dir, st, stage.FrameStates(names, times, sigma), tool)
	return rep, notes, err
}

// lockRun locks an existing run folder that a stage run alone is about to
// write: it must be a run folder (a folder of the user's is refused).
func lockRun(dir string) (unlock func(), err error) {
	if _, err := os.Stat(dir); err != nil {
		return nil, err
	}
	if !runfolder.IsRunFolder(dir) {
		return nil, fmt.Errorf("%s is not a run folder (no %s with a track record): %w", dir, runfolder.ManifestFile, runfolder.ErrForeignFolder)
	}
	return runfolder.Lock(dir)
}
