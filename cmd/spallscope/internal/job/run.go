package job

import (
	"context"
	"os"
	"path/filepath"
	"time"

	"spallscope/cmd/spallscope/internal/config"
	"spallscope/dic/runfolder"
	"spallscope/render"
	"spallscope/strain/strainfile"
)

// Progress reports a stage's progress: done of total units.
type Progress func(stage string, done, total int)

// Summary is what a run produced, for the console and campaign tables.
type Summary struct {
	Name       string                       `json:"name"`
	Out        string                       `json:"out"`
	Frames     int                          `json:"frames"`
	Peak       strainfile.PeakRecord        `json:"peak"`
	Onsets     []strainfile.OnsetRecord     `json:"onsets"`
	Resolution *strainfile.ResolutionRecord `json:"resolution,omitempty"`
	// DetectionLimits are the smallest fractures the run could see.
	DetectionLimits []strainfile.DetectionLimit `json:"detection_limits,omitempty"`
	Skipped         []string                    `json:"skipped_stages,omitempty"`
	// Notes are what the user should know of the inputs and results: frames
	// outside the load log, a video shorter than declared, frames without
	// a measured point.
	Notes   []string            `json:"notes,omitempty"`
	Resumed int                 `json:"resumed_after_frames,omitempty"`
	Report  string              `json:"report,omitempty"`
	AE      *runfolder.AERecord `json:"ae,omitempty"`
	Seconds float64             `json:"seconds"`
}

// stageRecord is one stage's entry in the run.json "stages" section.
type stageRecord struct {
	Fingerprint string  `json:"fingerprint"`
	Complete    bool    `json:"complete"`
	Seconds     float64 `json:"seconds"`
}

// runRecord is the run.json "run" section: what ran, on what.
type runRecord struct {
	Tool    string             `json:"tool"`
	Config  string             `json:"config"`
	Hashes  map[string]string  `json:"input_sha256"`
	Started string             `json:"started"`
	Seconds map[string]float64 `json:"stage_seconds"`
	Notes   []string           `json:"notes,omitempty"`
}

// Run does the whole job for test t into run folder out (default: a folder
// named after the test beside its config) by the stage table (pipeline.go):
// what is up to date is skipped, an interrupted tracking run resumes.
// tool names the program and version for the records.
//
// The run folder is claimed (a non-empty folder that is not a run folder
// is refused, untouched) and locked while Run writes it. When ctx is done
// Run stops at the next frame boundary and returns a *Stopped error that
// says what is kept and how to resume; no file is left half-written.
func Run(ctx context.Context, t *config.Test, out, tool string, progress Progress) (*Summary, error) {
	start := time.Now()
	if out == "" {
		out = filepath.Join(t.Dir, t.Name+"_run")
	}
	unlock, err := claimAndLock(out, tool)
	if err != nil {
		return nil, inTest(t, err)
	}
	defer unlock()
	if progress == nil {
		progress = func(string, int, int) {}
	}
	if len(t.Faces) > 0 {
		return runFaces(ctx, t, out, tool, progress)
	}
	r := &testRun{t: t, out: out, tool: tool, progress: progress, hashes: map[string]string{}}
	if r.hashes["config"], err = fileHash(t.Path); err != nil {
		return nil, err
	}
	defer func() {
		if r.tp != nil {
			r.tp.in.Seq.Close()
		}
	}()
	skipped, seconds, err := runStages(ctx, r)
	if err != nil {
		return nil, err
	}
	var tr runfolder.TrackRecord
	if runfolder.Section(out, "track", &tr) == nil && len(tr.Unmeasured) > 0 {
		r.notes = append(r.notes, unmeasuredNote(tr.Unmeasured, len(tr.Frames)))
	}
	if n := motionNote(out); n != "" {
		r.notes = append(r.notes, n)
	}
	sum := &Summary{Name: t.Name, Out: out, Frames: r.tp.in.Seq.Len(), Skipped: skipped, Resumed: r.resumed, Notes: r.notes}
	if t.Outputs.WantReport() {
		sum.Report = filepath.Join(out, render.ReportFile)
	}
	var rep strainfile.OnsetReport
	if err := readJSON(filepath.Join(out, strainfile.OnsetJSON), &rep); err != nil {
		return nil, err
	}
	sum.Peak, sum.Onsets, sum.Resolution, sum.DetectionLimits = rep.Peak, rep.Onsets, rep.Resolution, rep.DetectionLimits
	var aer runfolder.AERecord
	if t.AE.File != "" && runfolder.Section(out, "ae", &aer) == nil {
		sum.AE = &aer
	}
	sum.Seconds = time.Since(start).Seconds()
	rr := runRecord{Tool: tool, Config: t.Path, Hashes: r.hashes, Started: start.UTC().Format(time.RFC3339), Seconds: seconds, Notes: r.notes}
	if err := runfolder.SetSection(out, "run", rr); err != nil {
		return nil, err
	}
	return sum, nil
}

// claimAndLock locks out for this process (creating it when missing),
// claims it as a run folder (see runfolder.Claim; a foreign folder is
// refused and left as it was) and removes the temporary files of writes
// that an earlier process was killed in the middle of.
func claimAndLock(out, tool string) (unlock func(), err error) {
	if err := os.MkdirAll(out, 0o755); err != nil {
		return nil, err
	}
	if unlock, err = runfolder.Lock(out); err != nil {
		return nil, err
	}
	if err := runfolder.Claim(out, tool); err != nil {
		unlock()
		return nil, err
	}
	if _, err := runfolder.RemovePartials(out); err != nil {
		unlock()
		return nil, err
	}
	return unlock, nil
}
