package job

import (
	"errors"
	"fmt"
	"io/fs"
	"os"
	"path/filepath"
	"strconv"
	"time"

	"spallscope/cmd/spallscope/internal/config"
	"spallscope/cmd/spallscope/internal/stage"
	"spallscope/dic"
	"spallscope/dic/runfolder"
	"spallscope/render"
	"spallscope/render/export"
	"spallscope/strain/model"
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
	Skipped    []string                     `json:"skipped_stages,omitempty"`
	Resumed    int                          `json:"resumed_after_frames,omitempty"`
	Report     string                       `json:"report,omitempty"`
	AE         *runfolder.AERecord          `json:"ae,omitempty"`
	Seconds    float64                      `json:"seconds"`
}

// StageRecord is one stage's entry in the run.json "stages" section.
type StageRecord struct {
	Fingerprint string  `json:"fingerprint"`
	Complete    bool    `json:"complete"`
	Seconds     float64 `json:"seconds"`
}

// RunRecord is the run.json "run" section: what ran, on what.
type RunRecord struct {
	Tool    string             `json:"tool"`
	Config  string             `json:"config"`
	Hashes  map[string]string  `json:"input_sha256"`
	Started string             `json:"started"`
	Seconds map[string]float64 `json:"stage_seconds"`
}

// Stages in order.
var Stages = []string{"track", "strain", "zones", "outputs"}

// Run does the whole job for test t into run folder out (default: a folder
// named after the test beside its config). tool names the program and
// version for the records.
func Run(t *config.Test, out, tool string, progress Progress) (*Summary, error) {
	start := time.Now()
	if out == "" {
		out = filepath.Join(t.Dir, t.Name+"_run")
	}
	if err := os.MkdirAll(out, 0o755); err != nil {
		return nil, err
	}
	if progress == nil {
		progress = func(string, int, int) {}
	}
	if len(t.Faces) > 0 {
		return runFaces(t, out, tool, progress)
	}
	sum := &Summary{Name: t.Name, Out: out}
	var stages map[string]StageRecord
	if err := runfolder.Section(out, "stages", &stages); err != nil && !errors.Is(err, fs.ErrNotExist) {
		return nil, err
	}
	if stages == nil {
		stages = map[string]StageRecord{}
	}
	rr := RunRecord{Tool: tool, Config: t.Path, Hashes: map[string]string{}, Started: start.UTC().Format(time.RFC3339), Seconds: map[string]float64{}}
	var err error
	if rr.Hashes["config"], err = fileHash(t.Path); err != nil {
		return nil, err
	}

	tp, err := prepareTrack(t, tool)
	if err != nil {
		return nil, err
	}
	defer tp.in.Seq.Close()
	in, settings, scale, times := tp.in, tp.settings, tp.scale, tp.times
	for k, v := range tp.hashes {
		rr.Hashes[k] = v
	}
	sum.Frames = in.Seq.Len()

	// Track.
	fpTrack := tp.fingerprint
	stageStart := time.Now()
	if st := stages["track"]; st.Fingerprint == fpTrack && st.Complete {
		sum.Skipped = append(sum.Skipped, "track")
	} else {
		from := 0
		tracker, err := dic.NewTracker(in.Ref, max(in.RefIndex, 0), in.Mask, settings)
		if err != nil {
			return nil, fmt.Errorf("test %s: %w", t.Name, err)
		}
		if st.Fingerprint == fpTrack && tracker.Settings().Reference == dic.FixedReference {
			from = tp.resume(out, tracker, 0, in.Seq.Len())
		}
		if from == 0 {
			clearFrom(out, "track")
		}
		sum.Resumed = from
		stages["track"] = StageRecord{Fingerprint: fpTrack}
		for _, s := range Stages[1:] {
			delete(stages, s)
		}
		if err := runfolder.SetSection(out, "stages", stages); err != nil {
			return nil, err
		}
		rec := tp.record(t, tool)
		if _, err := stage.Track(out, in.Seq, tracker, rec, from, func(n int, _ *dic.Field) { progress("track", n, in.Seq.Len()) }); err != nil {
			return nil, fmt.Errorf("test %s: %w", t.Name, err)
		}
		stages["track"] = StageRecord{Fingerprint: fpTrack, Complete: true, Seconds: time.Since(stageStart).Seconds()}
		if err := runfolder.SetSection(out, "stages", stages); err != nil {
			return nil, err
		}
	}
	rr.Seconds["track"] = time.Since(stageStart).Seconds()

	// Strain.
	win, err := t.Strain.StrainWindow()
	if err != nil {
		return nil, fmt.Errorf("test %s: strain: %w", t.Name, err)
	}
	fpStrain := fingerprint("strain", fpTrack, win, t.Strain.StaticFrames, scale)
	stageStart = time.Now()
	if st := stages["strain"]; st.Fingerprint == fpStrain && st.Complete {
		sum.Skipped = append(sum.Skipped, "strain")
	} else {
		clearFrom(out, "strain")
		if _, _, err := stage.Strain(out, win, 0, scale, t.Strain.StaticFrames, func(n, total int) { progress("strain", n, total) }); err != nil {
			return nil, fmt.Errorf("test %s: %w", t.Name, err)
		}
		stages["strain"] = StageRecord{Fingerprint: fpStrain, Complete: true, Seconds: time.Since(stageStart).Seconds()}
		delete(stages, "zones")
		delete(stages, "outputs")
		if err := runfolder.SetSection(out, "stages", stages); err != nil {
			return nil, err
		}
	}
	rr.Seconds["strain"] = time.Since(stageStart).Seconds()

	// Zones and onsets.
	loadPath := t.Resolve(t.Load.File)
	if rr.Hashes["load_log"], err = fileHash(loadPath); err != nil {
		return nil, err
	}
	if rr.Hashes["ae_log"], err = fileHash(t.Resolve(t.AE.File)); err != nil {
		return nil, err
	}
	fpZones := fingerprint("zones", fpStrain, t.Zones, t.Load, rr.Hashes["load_log"], times, t.Openings, t.AE, rr.Hashes["ae_log"])
	stageStart = time.Now()
	if st := stages["zones"]; st.Fingerprint == fpZones && st.Complete {
		sum.Skipped = append(sum.Skipped, "zones")
	} else {
		if err := zones(t, out, times, loadPath, scale, settings.Subset); err != nil {
			return nil, fmt.Errorf("test %s: %w", t.Name, err)
		}
		if t.AE.File != "" {
			if _, err := ae(t, out); err != nil {
				return nil, fmt.Errorf("test %s: acoustic emission: %w", t.Name, err)
			}
		}
		stages["zones"] = StageRecord{Fingerprint: fpZones, Complete: true, Seconds: time.Since(stageStart).Seconds()}
		delete(stages, "outputs")
		if err := runfolder.SetSection(out, "stages", stages); err != nil {
			return nil, err
		}
	}
	rr.Seconds["zones"] = time.Since(stageStart).Seconds()
	progress("zones", 1, 1)

	// Outputs: overlays, video, report, open formats.
	if rr.Hashes["model"], err = fileHash(t.Resolve(t.Model.File)); err != nil {
		return nil, err
	}
	fpOut := fingerprint("outputs", fpZones, t.Outputs.WantOverlays(), t.Outputs.WantVideo(), t.Outputs.WantReport(),
		t.Outputs.WantVTK(), t.Outputs.WantNPY(), t.Outputs.Field, t.Model, rr.Hashes["model"])
	stageStart = time.Now()
	if st := stages["outputs"]; st.Fingerprint == fpOut && st.Complete {
		sum.Skipped = append(sum.Skipped, "outputs")
	} else {
		if err := outputs(t, out, tool, progress); err != nil {
			return nil, fmt.Errorf("test %s: %w", t.Name, err)
		}
		stages["outputs"] = StageRecord{Fingerprint: fpOut, Complete: true, Seconds: time.Since(stageStart).Seconds()}
		if err := runfolder.SetSection(out, "stages", stages); err != nil {
			return nil, err
		}
	}
	rr.Seconds["outputs"] = time.Since(stageStart).Seconds()
	if t.Outputs.WantReport() {
		sum.Report = filepath.Join(out, render.ReportFile)
	}

	var rep strainfile.OnsetReport
	if err := readJSON(filepath.Join(out, strainfile.OnsetJSON), &rep); err != nil {
		return nil, err
	}
	sum.Peak, sum.Onsets, sum.Resolution = rep.Peak, rep.Onsets, rep.Resolution
	var aer runfolder.AERecord
	if t.AE.File != "" && runfolder.Section(out, "ae", &aer) == nil {
		sum.AE = &aer
	}
	sum.Seconds = time.Since(start).Seconds()
	if err := runfolder.SetSection(out, "run", rr); err != nil {
		return nil, err
	}
	return sum, nil
}

// zones runs the zones stage with the config's load log and openings.
func zones(t *config.Test, out string, times []float64, loadPath string, scale dic.Scale, subsetSize int) error {
	names, err := runfolder.Frames(out)
	if err != nil {
		return err
	}
	if len(times) != len(names) {
		return fmt.Errorf("frame times are unknown: give times (fps, csv or mtime) in the test config")
	}
	st, err := t.Zones.Stage(t.Openings)
	if err != nil {
		return err
	}
	st.Finder.Scale, st.Finder.SubsetHalf = scale, subsetSize/2
	sigma, err := t.Load.Stress(loadPath)
	if err != nil {
		return err
	}
	states := stage.FrameStates(names, times, sigma)
	if sigma != nil {
		if err := runfolder.RecordLoad(out, sigma); err != nil {
			return err
		}
	}
	_, err = stage.Zones(out, st, states, "")
	return err
}

// clearFrom removes the outputs of a stage and of every later one.
func clearFrom(out, stage string) {
	dirs := map[string][]string{
		"track":  {runfolder.FieldsDir},
		"strain": {strainfile.StrainDir},
	}
	files := []string{strainfile.ZonesCSV, strainfile.ZoneCellsCSV, strainfile.OnsetJSON}
	on := false
	for _, s := range Stages {
		if s == stage {
			on = true
		}
		if on {
			for _, d := range dirs[s] {
				os.RemoveAll(filepath.Join(out, d))
			}
		}
	}
	for _, f := range files {
		os.Remove(filepath.Join(out, f))
	}
}

func resolveRef(t *config.Test) string {
	if t.Reference == "" {
		return "0"
	}
	if _, err := strconv.Atoi(t.Reference); err == nil {
		return t.Reference
	}
	return t.Resolve(t.Reference)
}

// outputs draws the overlays and the video, writes the report and the
// open-format exports the config asks for.
func outputs(t *config.Test, out, tool string, progress Progress) error {
	o := t.Outputs
	if m := t.Model; m.File != "" {
		f := model.Format{Units: model.Units(m.Units), YUp: m.YUp, CompressionPositive: m.CompressionPositive}
		if f.Units == "" {
			f.Units = model.MM
		}
		if len(m.Origin) == 2 {
			f.OriginX, f.OriginY = m.Origin[0], m.Origin[1]
		}
		if _, err := CompareModel(out, t.Resolve(m.File), f, m.Frame, m.LoadMPa); err != nil {
			return err
		}
	}
	if o.WantOverlays() || o.WantVideo() {
		os.RemoveAll(filepath.Join(out, render.OverlaysDir))
		if _, err := render.Run(out, render.Options{Field: o.Field, Video: o.WantVideo(),
			Progress: func(n, total int) { progress("render", n, total) }}); err != nil {
			return err
		}
	}
	if o.WantReport() {
		if _, err := render.WriteReport(out, render.ReportOptions{Tool: tool}); err != nil {
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
