package main

import (
	"fmt"
	"os"
	"path/filepath"
	"reflect"
	"time"

	"github.com/spf13/cobra"

	"spallscope/cmd/spallscope/internal/config"
	"spallscope/cmd/spallscope/internal/job"
	"spallscope/cmd/spallscope/internal/progress"
	"spallscope/dic/runfolder"
	"spallscope/dic/synth"
)

// The demo rock's strength and the lateral stress ratio of its loading,
// invented with the demo specimen.
const (
	demoUCS = 60.0 // MPa
	demoK   = 0.25
)

// demoModelMPa is the load level of the demo's model file (an elastic
// Kirsch solution), held against the front face's measurement.
const demoModelMPa = 8.0

// demoConfig is the demo test's config, written beside the synthetic
// photos as a worked example of a test config: two faces, one load log, an
// acoustic-emission record and a model file.
func demoConfig(front, back *synth.Scenario) string {
	f, b := front.Openings[0], back.Openings[0]
	return fmt.Sprintf(`# spallscope demo test: a synthetic mortar-analogue block (our own invention)
name: demo
times: {fps: %g}
faces:
  - {name: front, images: synth/frames, scale: {mm_per_px: %g}, openings: [{name: A, shape: "circle:%g,%g,%g"}]}
  - {name: back, images: back/frames, scale: {mm_per_px: %g}, openings: [{name: A, shape: "circle:%g,%g,%g"}]}
correlation: {subset: 21, step: 8}
strain: {window: 7, static_frames: %d}
zones: {k: %g, ucs_mpa: %g}
load:
  file: synth/loadlog.csv
  area_mm2: %g
  clock_offset_s: %g
ae: {file: synth/ae_hits.csv, clock_offset_s: %g, gap_s: 8}
model: {file: synth/model.csv, load_mpa: %g, units: mm, origin_px: [%g, %g], y_up: true, face: front}
outputs: {overlays: true, video: true, report: true, field: gamma_max}
`, front.FPS, front.Specimen.MMPerPx, f.Cx, f.Cy, f.Rx, back.Specimen.MMPerPx, b.Cx, b.Cy, b.Rx,
		front.Load.StartFrame+1, demoK, demoUCS, front.Specimen.LoadedArea(), front.Load.ClockOffset, synth.DemoAEOffset,
		demoModelMPa, f.Cx, f.Cy)
}

// renderFace writes a synthetic face into dir unless a complete one with the
// same scenario and rendering model is there already.
func renderFace(cmd *cobra.Command, sc *synth.Scenario, dir string) (*synth.Truth, error) {
	truth, err := synth.ReadTruth(filepath.Join(dir, synth.TruthFile))
	if err == nil && truth.Generator == synth.Generator && reflect.DeepEqual(truth.Scenario, *sc) {
		fmt.Fprintln(cmd.ErrOrStderr(), "demo: reusing the synthetic face in", dir)
		return truth, nil
	}
	r := reporter(cmd)
	defer r.Wait()
	return synth.Write(sc, dir, progress.Task(r, "demo: render "+sc.Name))
}

func newDemoCmd() *cobra.Command {
	var out string
	cmd := &cobra.Command{
		Use:   "demo",
		Short: "Run the whole job on the built-in demo test (a synthetic block with one opening)",
		Long: `demo builds spallscope's own demo test with the synthetic speckle lab: a
100 mm mortar-analogue block with a 24 mm circular opening, loaded vertically
with lateral confinement to a peak of 32 MPa and beyond, with notches growing
at both sidewalls, a crack from the crown and slabs spalling late in the test.
Two cameras film it (front 512 px, back 384 px, mirrored, its own paint), and
the test comes with the frame's load log, an acoustic-emission hit list (with
a stretch where the recording stopped) and a model file (the elastic Kirsch
solution at 8 MPa). It writes the test config OUT/demo.yaml and runs it like
any test (spallscope run): both faces tracked and analysed, onsets of both on
the load log's clock, the AE onset, the model held against the front face,
overlays, video and the report OUT/run/report.html. It checks the measured
displacements against the exact field. Everything is invented for the demo.
A complete demo folder is reused; an interrupted one resumes.`,
		Args: cobra.NoArgs,
		RunE: func(cmd *cobra.Command, _ []string) error {
			start := time.Now()
			front, back := synth.DemoBlock(), synth.DemoBack()
			dir := filepath.Join(out, "synth")
			truth, err := renderFace(cmd, front, dir)
			if err != nil {
				return err
			}
			if _, err := renderFace(cmd, back, filepath.Join(out, "back")); err != nil {
				return err
			}
			if err := synth.WriteDemoAE(filepath.Join(dir, "ae_hits.csv"), front); err != nil {
				return err
			}
			k := *front.Fields[0].Kirsch
			k.Stress = demoModelMPa
			if err := synth.WriteKirschModel(filepath.Join(dir, "model.csv"), k, front.Specimen.MMPerPx, 48, 1); err != nil {
				return err
			}
			cfgPath := filepath.Join(out, "demo.yaml")
			if err := os.WriteFile(cfgPath, []byte(demoConfig(front, back)), 0o644); err != nil {
				return err
			}
			t, err := config.Read(cfgPath)
			if err != nil {
				return err
			}
			runDir := filepath.Join(out, "run")
			r := reporter(cmd)
			sum, err := job.Run(t, runDir, "spallscope "+version, testProgress(r, "demo"))
			r.Wait()
			if err != nil {
				return err
			}
			frontDir := filepath.Join(runDir, job.FacesDir, "front")
			// Check against the exact field at the last frame before damage.
			check := front.Fields[1].StartFrame
			f, err := runfolder.ReadField(runfolder.FieldPath(frontDir, front.FrameName(check)))
			if err != nil {
				return err
			}
			acc := front.Compare(f, check)
			var tr runfolder.TrackRecord
			runfolder.Section(frontDir, "track", &tr)
			o := cmd.OutOrStdout()
			sc := front
			peak := truth.Frames[sc.Load.PeakFrame]
			fmt.Fprintf(o, "demo test: two faces, %dx%d px (front) and %dx%d px (back), %d frames each; config %s\n",
				front.Width, front.Height, back.Width, back.Height, front.Frames, cfgPath)
			fmt.Fprintf(o, "  load log: %s (peak %.1f MPa = %.0f kN at frame %s, t = %.0f s)\n",
				filepath.Join(dir, synth.LoadLogCSV), peak.Stress, peak.Force, peak.Name, peak.Time)
			fmt.Fprintf(o, "  front face: %d points per frame (%d px subsets, %d px step) in %s\n", tr.Grid.Len(), tr.Settings.Subset, tr.Settings.Step, frontDir)
			fmt.Fprintf(o, "  check against the exact field at frame %s (%.1f MPa, before damage): %d points, RMS error %.4f px, max %.4f px\n",
				truth.Frames[check].Name, truth.Frames[check].Stress, acc.Points, acc.RMS, acc.Max)
			if r := sum.Resolution; r != nil {
				fmt.Fprintf(o, "  resolution from %d static frames: u %.4f px (%.1f µm), exx %.0f µε, eyy %.0f µε, e_eq %.0f µε; VSG %d px = %.1f mm\n",
					r.Frames, r.U, 1000*r.UMM, r.Exx*1e6, r.Eyy*1e6, r.Eeq*1e6, r.VSG, r.VSGmm)
			}
			printFaces(cmd, runDir)
			if sum.AE != nil && sum.AE.Onset != nil {
				fmt.Fprintf(o, "  acoustic emission: %d hits, hit-rate onset at camera time %.1f s, %d gap(s) in the record\n", sum.AE.Hits, sum.AE.Onset.Time, len(sum.AE.Gaps))
			}
			printModel(cmd, filepath.Join(frontDir, job.ModelDir))
			if sum.Report != "" {
				fmt.Fprintf(o, "report: %s\n", sum.Report)
			}
			fmt.Fprintf(o, "done in %.1f s\n", time.Since(start).Seconds())
			return nil
		},
	}
	cmd.Flags().StringVar(&out, "out", filepath.Join("out", "demo"), "output folder")
	return cmd
}
