package main

import (
	"fmt"
	"path/filepath"
	"time"

	"github.com/spf13/cobra"

	"spallscope/cmd/spallscope/internal/config"
	"spallscope/cmd/spallscope/internal/demo"
	"spallscope/cmd/spallscope/internal/job"
	"spallscope/cmd/spallscope/internal/progress"
	"spallscope/dic/synth"
	"spallscope/strain/model"
)

func newDemoCmd() *cobra.Command {
	var out string
	cmd := &cobra.Command{
		Use:   "demo",
		Short: "Run the whole job on the built-in demo test (synthetic blocks with one and with twin openings)",
		Long: `demo builds spallscope's own demo test with the synthetic speckle lab: a
100 mm mortar-analogue block with a 24 mm circular opening, loaded vertically
with lateral confinement to a peak of 32 MPa and beyond, with notches growing
at both sidewalls, a crack from the crown and slabs spalling late in the test,
stacked in the frame on a second block with twin 18 mm openings side by side,
whose damage begins at the pillar walls between them and spreads. Two cameras
film them (front 512 px, twin 384 px, its own paint), and the test comes with
the frame's load log, an acoustic-emission hit list (with a stretch where the
recording stopped) and a model file (the elastic Kirsch solution at 8 MPa). It
writes the test config OUT/demo.yaml and runs it like any test (spallscope
run): both faces tracked and analysed, onsets of both on the load log's clock,
the AE onset, the model held against the front face, overlays, video and the
report OUT/run/report.html. It checks the measured displacements against the
exact field and prints, beside the onsets, the truth of every damage feature
(sector, hidden start, and the first frame any method could report it at the
face's own detection limit), also written to OUT/feature_truth.csv.
Everything is invented for the demo. A complete demo folder is reused; an
interrupted one resumes.`,
		Args: cobra.NoArgs,
		RunE: func(cmd *cobra.Command, _ []string) error {
			start := time.Now()
			r := reporter(cmd)
			d, err := demo.Prepare(out, func(face string) func(int, int) { return progress.Task(r, "demo: render "+face) })
			r.Wait()
			if err != nil {
				return err
			}
			for _, n := range d.Notes {
				fmt.Fprintln(cmd.ErrOrStderr(), "demo:", n)
			}
			t, err := config.Read(d.Config)
			if err != nil {
				return err
			}
			runDir := filepath.Join(out, demo.RunDir)
			r = reporter(cmd)
			sum, err := job.Run(cmd.Context(), t, runDir, "spallscope "+version, testProgress(r, "demo"))
			r.Wait()
			if err != nil {
				return err
			}
			frontDir := filepath.Join(runDir, job.FacesDir, "front")
			check, err := d.CheckFront(frontDir)
			if err != nil {
				return err
			}
			o := cmd.OutOrStdout()
			front, twin, truth := d.Front, d.Twin, d.Truth
			peak := truth.Frames[front.Load.PeakFrame]
			fmt.Fprintf(o, "demo test: two faces, %dx%d px (front, one opening) and %dx%d px (twin, two openings), %d frames each; config %s\n",
				front.Width, front.Height, twin.Width, twin.Height, front.Frames, d.Config)
			fmt.Fprintf(o, "  load log: %s (peak %.1f MPa = %.0f kN at frame %s, t = %.0f s)\n",
				filepath.Join(out, demo.FrontDir, synth.LoadLogCSV), peak.Stress, peak.Force, peak.Name, peak.Time)
			fmt.Fprintf(o, "  front face: %d points per frame (%d px subsets, %d px step) in %s\n", check.Track.Grid.Len(), check.Track.Settings.Subset, check.Track.Settings.Step, frontDir)
			fmt.Fprintf(o, "  check against the exact field at frame %s (%.1f MPa, before damage): %d points, RMS error %.4f px, max %.4f px\n",
				check.Frame, check.Stress, check.Accuracy.Points, check.Accuracy.RMS, check.Accuracy.Max)
			if r := sum.Resolution; r != nil {
				fmt.Fprintf(o, "  resolution from %d static frames: u %.4f px (%.1f µm), exx %.0f µε, eyy %.0f µε, e_eq %.0f µε; VSG %d px = %.1f mm\n",
					r.Frames, r.U, 1000*r.UMM, r.Exx*1e6, r.Eyy*1e6, r.Eeq*1e6, r.VSG, r.VSGmm)
			}
			printFaces(cmd, runDir)
			rows := d.TruthTable(func(face string) string { return filepath.Join(runDir, job.FacesDir, face) })
			truthCSV := filepath.Join(out, demo.TruthCSV)
			if err := demo.WriteTruthTable(truthCSV, rows); err != nil {
				return err
			}
			printTruth(cmd, rows, truthCSV)
			if sum.AE != nil && sum.AE.Onset != nil {
				fmt.Fprintf(o, "  acoustic emission: %d hits, hit-rate onset at camera time %.1f s, %d gap(s) in the record\n", sum.AE.Hits, sum.AE.Onset.Time, len(sum.AE.Gaps))
			}
			printModel(cmd, filepath.Join(frontDir, model.Dir))
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
