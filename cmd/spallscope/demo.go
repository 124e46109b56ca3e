package main

import (
	"fmt"
	"os"
	"path/filepath"
	"reflect"
	"time"

	"github.com/spf13/cobra"

	"spallscope/dic/runfolder"
	"spallscope/dic/synth"
	"spallscope/dic/testconfig"
	"spallscope/dic/testrun"
)

// The demo rock's strength and the lateral stress ratio of its loading,
// invented with the demo specimen.
const (
	demoUCS = 60.0 // MPa
	demoK   = 0.25
)

// demoConfig is the demo test's config, written beside the synthetic
// photos as a worked example of a test config.
func demoConfig(sc *synth.Scenario) string {
	o := sc.Openings[0]
	return fmt.Sprintf(`# spallscope demo test: a synthetic mortar-analogue block (our own invention)
name: demo
images: synth/frames
reference: 0
times: {fps: %g}
scale: {mm_per_px: %g}
openings:
  - {name: A, shape: "circle:%g,%g,%g"}
correlation: {subset: 21, step: 8}
strain: {window: 7, static_frames: %d}
zones: {k: %g, ucs_mpa: %g}
load:
  file: synth/loadlog.csv
  area_mm2: %g
  clock_offset_s: %g
outputs: {overlays: true, video: true, report: true, field: gamma_max}
`, sc.FPS, sc.Specimen.MMPerPx, o.Cx, o.Cy, o.Rx, sc.Load.StartFrame+1, demoK, demoUCS, sc.Specimen.LoadedArea(), sc.Load.ClockOffset)
}

func newDemoCmd() *cobra.Command {
	var out string
	cmd := &cobra.Command{
		Use:   "demo",
		Short: "Run the whole job on the built-in demo test (a synthetic block with one opening)",
		Long: `demo builds spallscope's own demo test with the synthetic speckle lab: a
100 mm mortar-analogue block with a 24 mm circular opening, loaded vertically
with lateral confinement to a peak of 32 MPa and beyond, with notches growing
at both sidewalls, a crack from the crown and slabs spalling late in the test,
plus the frame's load log. It writes the test config OUT/demo.yaml and runs
it like any test (spallscope run), then checks the measured displacements
against the exact field and prints the onsets. A complete demo folder is
reused; an interrupted one resumes.`,
		Args: cobra.NoArgs,
		RunE: func(cmd *cobra.Command, _ []string) error {
			start := time.Now()
			sc := synth.DemoBlock()
			dir := filepath.Join(out, "synth")
			truth, err := synth.ReadTruth(filepath.Join(dir, synth.TruthFile))
			if err != nil || truth.Generator != synth.Generator || !reflect.DeepEqual(truth.Scenario, *sc) {
				if truth, err = synth.Write(sc, dir, progressLine(cmd, "demo: rendered frame")); err != nil {
					return err
				}
			} else {
				fmt.Fprintln(cmd.ErrOrStderr(), "demo: reusing the synthetic test in", dir)
			}
			cfgPath := filepath.Join(out, "demo.yaml")
			if err := os.WriteFile(cfgPath, []byte(demoConfig(sc)), 0o644); err != nil {
				return err
			}
			t, err := testconfig.Read(cfgPath)
			if err != nil {
				return err
			}
			runDir := filepath.Join(out, "run")
			bars := newStageLines(cmd)
			sum, err := testrun.Run(t, runDir, "spallscope "+version, func(stage string, done, total int) { bars.update("demo", stage, done, total) })
			if err != nil {
				return err
			}
			// Check against the exact field at the last frame before damage.
			check := sc.Fields[1].StartFrame
			f, err := runfolder.ReadField(runfolder.FieldPath(runDir, sc.FrameName(check)))
			if err != nil {
				return err
			}
			acc := sc.Compare(f, check)
			var tr runfolder.TrackRecord
			runfolder.Section(runDir, "track", &tr)
			o := cmd.OutOrStdout()
			peak := truth.Frames[sc.Load.PeakFrame]
			fmt.Fprintf(o, "demo test: %d frames of %dx%d px in %s, config %s\n", sum.Frames, sc.Width, sc.Height, filepath.Join(dir, synth.FramesDir), cfgPath)
			fmt.Fprintf(o, "  load log: %s (peak %.1f MPa = %.0f kN at frame %s, t = %.0f s)\n",
				filepath.Join(dir, synth.LoadLogCSV), peak.Stress, peak.Force, peak.Name, peak.Time)
			fmt.Fprintf(o, "  displacements: %d points per frame (%d px subsets, %d px step) in %s\n", tr.Grid.Len(), tr.Settings.Subset, tr.Settings.Step, filepath.Join(runDir, runfolder.FieldsDir))
			fmt.Fprintf(o, "  check against the exact field at frame %s (%.1f MPa, before damage): %d points, RMS error %.4f px, max %.4f px\n",
				truth.Frames[check].Name, truth.Frames[check].Stress, acc.Points, acc.RMS, acc.Max)
			if r := sum.Resolution; r != nil {
				fmt.Fprintf(o, "  resolution from %d static frames: u %.4f px (%.1f µm), exx %.0f µε, eyy %.0f µε, e_eq %.0f µε; VSG %d px = %.1f mm\n",
					r.Frames, r.U, 1000*r.UMM, r.Exx*1e6, r.Eyy*1e6, r.Eeq*1e6, r.VSG, r.VSGmm)
			}
			fmt.Fprintf(o, "  onsets (UCS %.0f MPa, K = %.2f assumed for the context):\n", demoUCS, demoK)
			printOnsets(cmd, &runfolder.OnsetReport{Peak: sum.Peak, Onsets: sum.Onsets}, filepath.Join(runDir, runfolder.OnsetJSON))
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
