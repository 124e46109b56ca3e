package job

import (
	"context"
	"errors"
	"fmt"
	"io/fs"
	"os"
	"path/filepath"
	"time"

	"spallscope/cmd/spallscope/internal/config"
	"spallscope/cmd/spallscope/internal/stage"
	"spallscope/dic/aelog"
	"spallscope/dic/loadlog"
	"spallscope/dic/runfolder"
	"spallscope/render"
	"spallscope/render/export"
	"spallscope/strain"
	"spallscope/strain/model"
	"spallscope/strain/strainfile"
)

// A step is one row of the stage table: a stage of a test's run.
type step struct {
	// name is the stage's key in run.json's stages section.
	name string
	// prepare opens and parses what the stage will need and returns what
	// decides its output besides the stage before it (settings, input
	// hashes), for its fingerprint. Every stage is prepared before the
	// first one runs, so that a typo in a late stage's input costs
	// seconds, not the hours of tracking before it.
	prepare func(r *testRun) (inputs []any, err error)
	// run runs the stage into the run folder. resume is true when the
	// folder holds an interrupted run of the stage with the same
	// fingerprint; a stage that cannot resume ignores it.
	run func(r *testRun, ctx context.Context, resume bool) error
	// resumable says run continues an interrupted run itself; the outputs
	// of any other stage are removed before it runs.
	resumable bool
	// outputs are the stage's files and folders in the run folder,
	// removed before it runs afresh and whenever a stage before it runs.
	outputs []string
	// done, if set, lets go of what only this stage needed, once it has
	// run or been skipped.
	done func(r *testRun)
}

// pipeline is the stage table of a test's run, in order.
var pipeline = []step{
	{name: "track", prepare: (*testRun).prepareTrack, run: (*testRun).track, resumable: true,
		outputs: []string{runfolder.FieldsDir, runfolder.PhotoFieldsDir}, done: (*testRun).doneTracking},
	{name: "strain", prepare: (*testRun).prepareStrain, run: (*testRun).strain,
		outputs: []string{strainfile.StrainDir}},
	{name: "zones", prepare: (*testRun).prepareZones, run: (*testRun).zones,
		outputs: []string{strainfile.ZonesCSV, strainfile.ZoneCellsCSV, strainfile.NoiseScaleCSV, strainfile.OnsetJSON}},
	{name: "outputs", prepare: (*testRun).prepareOutputs, run: (*testRun).outputs,
		outputs: []string{render.OverlaysDir, render.VideoFile(render.VideoMP4), render.VideoFile(render.VideoAVI),
			render.ReportFile, render.PlotsDir, model.Dir, export.VTKDir, export.NPYDir}},
}

// Stages are the stage names of a test's run, in order.
var Stages = stageNames()

func stageNames() []string {
	var names []string
	for _, s := range pipeline {
		names = append(names, s.name)
	}
	return names
}

// stageFingerprint is the fingerprint of stage name with the given inputs
// after a stage with fingerprint prev ("" for the first).
func stageFingerprint(name, prev string, inputs []any) string {
	return fingerprint(append([]any{name, prev}, inputs...)...)
}

// testRun is one test's run in progress: the test, its run folder, and
// what the stages prepared.
type testRun struct {
	t         *config.Test
	out, tool string
	progress  Progress
	hashes    map[string]string // run.json's input_sha256
	notes     []string          // what the user should know of the inputs and results

	tp      *trackInputs
	resumed int // frames kept from an interrupted tracking run

	window  strain.Window
	zoneCfg stage.ZoneStage
	sigma   *loadlog.Stress // nil without a load log
	aeLog   *aelog.Log      // nil without an AE log
	aeClock loadlog.Clock
}

// runStages runs the stage table over r's run folder: it prepares every
// stage, then skips each stage whose fingerprint is unchanged and whose
// outputs are complete, and runs the others — a stage that runs makes
// every stage after it run too. It returns the names of the stages it
// skipped and each stage's time.
func runStages(ctx context.Context, r *testRun) (skipped []string, seconds map[string]float64, err error) {
	inputs := make([][]any, len(pipeline))
	for i, s := range pipeline {
		if inputs[i], err = s.prepare(r); err != nil {
			return nil, nil, inTest(r.t, fmt.Errorf("%s: %w", s.name, err))
		}
	}
	var records map[string]stageRecord
	if err := runfolder.Section(r.out, "stages", &records); err != nil && !errors.Is(err, fs.ErrNotExist) {
		return nil, nil, err
	}
	if records == nil {
		records = map[string]stageRecord{}
	}
	seconds = map[string]float64{}
	prev, rerun := "", false
	for i, s := range pipeline {
		start := time.Now()
		fp := stageFingerprint(s.name, prev, inputs[i])
		prev = fp
		old := records[s.name]
		if !rerun && old.Fingerprint == fp && old.Complete {
			skipped = append(skipped, s.name)
			seconds[s.name] = time.Since(start).Seconds()
			if s.done != nil {
				s.done(r)
			}
			continue
		}
		if err := ctx.Err(); err != nil {
			return skipped, seconds, r.stopped(&stage.Stopped{Stage: s.name, Cause: context.Cause(ctx)})
		}
		resume := !rerun && s.resumable && old.Fingerprint == fp
		rerun = true
		for _, later := range pipeline[i:] {
			if later.name != s.name || !resume {
				removeOutputs(r.out, later.outputs)
			}
			delete(records, later.name)
		}
		records[s.name] = stageRecord{Fingerprint: fp}
		if err := runfolder.SetSection(r.out, "stages", records); err != nil {
			return skipped, seconds, err
		}
		if err := s.run(r, ctx, resume); err != nil {
			var st *stage.Stopped
			switch {
			case errors.As(err, &st):
				return skipped, seconds, r.stopped(st)
			case ctx.Err() != nil: // a stage that stops between its own units
				return skipped, seconds, r.stopped(&stage.Stopped{Stage: s.name, Cause: context.Cause(ctx)})
			}
			return skipped, seconds, inTest(r.t, err)
		}
		if s.done != nil {
			s.done(r)
		}
		seconds[s.name] = time.Since(start).Seconds()
		records[s.name] = stageRecord{Fingerprint: fp, Complete: true, Seconds: seconds[s.name]}
		if err := runfolder.SetSection(r.out, "stages", records); err != nil {
			return skipped, seconds, err
		}
	}
	return skipped, seconds, nil
}

// removeOutputs removes a stage's outputs from run folder out.
func removeOutputs(out string, outputs []string) {
	for _, o := range outputs {
		os.RemoveAll(filepath.Join(out, o))
	}
}
