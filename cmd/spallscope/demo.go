package main

import (
	"fmt"
	"path/filepath"
	"reflect"
	"time"

	"github.com/spf13/cobra"

	"spallscope/dic"
	"spallscope/dic/frames"
	"spallscope/dic/loadlog"
	"spallscope/dic/region"
	"spallscope/dic/runfolder"
	"spallscope/dic/synth"
	"spallscope/strain"
)

// The demo rock's strength and the lateral stress ratio of its loading,
// invented with the demo specimen.
const (
	demoUCS = 60.0 // MPa
	demoK   = 0.25
)

func newDemoCmd() *cobra.Command {
	var out string
	cmd := &cobra.Command{
		Use:   "demo",
		Short: "Run the whole job on the built-in demo test (a synthetic block with one opening)",
		Long: `demo builds spallscope's own demo test with the synthetic speckle lab: a
100 mm mortar-analogue block with a 24 mm circular opening, loaded vertically
with lateral confinement to a peak of 32 MPa and beyond, with notches growing
at both sidewalls, a crack from the crown and slabs spalling late in the test,
plus the frame's load log. It then runs the pipeline stages on it and prints
a summary. A demo folder that is already complete is reused.`,
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
			seq, err := frames.Open(filepath.Join(dir, synth.FramesDir))
			if err != nil {
				return err
			}
			defer seq.Close()
			ref, err := seq.Read(0)
			if err != nil {
				return err
			}
			var mask region.Layout
			for _, o := range sc.Openings {
				mask.Exclude = append(mask.Exclude, o)
			}
			m, err := mask.Rasterise(ref.Width, ref.Height)
			if err != nil {
				return err
			}
			tracker, err := dic.NewTracker(ref, 0, m, dic.Settings{Subset: 21, Step: 8})
			if err != nil {
				return err
			}
			runDir := filepath.Join(out, "run")
			prog := newRateLine(cmd, "demo: track", seq.Len(), tracker.Grid().Len())
			check := sc.Fields[1].StartFrame - 1 // last frame before any damage
			var acc synth.Accuracy
			rec := runfolder.TrackRecord{Tool: "spallscope " + version, Images: filepath.Join(dir, synth.FramesDir), Reference: "0",
				MMPerPx: dic.Scale(sc.Specimen.MMPerPx)}
			for _, o := range sc.Openings {
				rec.Exclude = append(rec.Exclude, fmt.Sprintf("ellipse:%g,%g,%g,%g,%g", o.Cx, o.Cy, o.Rx, o.Ry, o.AngleDeg))
			}
			if rec.Times, err = frames.FixedRate(seq.Len(), sc.FPS, 0); err != nil {
				return err
			}
			if _, err := runfolder.Track(runDir, seq, tracker, rec, func(n int, f *dic.Field) {
				prog.done(n, f.Valid())
				if f.Index == check {
					acc = sc.Compare(f, check)
				}
			}); err != nil {
				return err
			}
			win := strain.Window{Size: 7}
			_, res, err := runfolder.Strain(runDir, win, 0, dic.Scale(sc.Specimen.MMPerPx), sc.Load.StartFrame+1, nil)
			if err != nil {
				return err
			}
			// Zones and onsets, with the stress from the synthetic load log read
			// like any test frame's log.
			lg, err := loadlog.Read(filepath.Join(dir, synth.LoadLogCSV), loadlog.Format{})
			if err != nil {
				return err
			}
			sigma, err := loadlog.NewStress(lg, sc.Specimen.LoadedArea(), loadlog.Clock{Offset: sc.Load.ClockOffset})
			if err != nil {
				return err
			}
			if err := runfolder.RecordLoad(runDir, sigma); err != nil {
				return err
			}
			var states []runfolder.FrameState
			for k, t := range rec.Times {
				s, in := sigma.At(t)
				states = append(states, runfolder.FrameState{Name: seq.Name(k), Time: t, Stress: s, InSpan: in})
			}
			zs := runfolder.ZoneStage{K: demoK, UCS: demoUCS}
			for _, o := range sc.Openings {
				zs.Finder.Sectors.Openings = append(zs.Finder.Sectors.Openings, strain.Opening{Name: "A", Shape: o})
			}
			zs.OpeningNames = []string{"A"}
			zs.Finder.Scale = dic.Scale(sc.Specimen.MMPerPx)
			zs.Finder.SubsetHalf = tracker.Settings().Subset / 2
			report, err := runfolder.Zones(runDir, zs, states, "spallscope "+version)
			if err != nil {
				return err
			}
			peak := truth.Frames[sc.Load.PeakFrame]
			o := cmd.OutOrStdout()
			fmt.Fprintf(o, "demo test: %d frames of %dx%d px, %d-bit, in %s\n", seq.Len(), ref.Width, ref.Height, ref.Depth, filepath.Join(dir, synth.FramesDir))
			fmt.Fprintf(o, "  load log: %s (peak %.1f MPa = %.0f kN at frame %s, t = %.0f s)\n",
				filepath.Join(dir, synth.LoadLogCSV), peak.Stress, peak.Force, peak.Name, peak.Time)
			fmt.Fprintf(o, "  ground truth: %s and %s\n", filepath.Join(dir, synth.TruthFile), filepath.Join(dir, synth.TruthDir))
			fmt.Fprintf(o, "  displacements: %s (%d points per frame, 21 px subsets, 8 px step)\n", filepath.Join(runDir, runfolder.FieldsDir), tracker.Grid().Len())
			fmt.Fprintf(o, "  check against the exact field at frame %s (%.1f MPa, before damage): %d points, RMS error %.4f px, max %.4f px\n",
				truth.Frames[check].Name, truth.Frames[check].Stress, acc.Points, acc.RMS, acc.Max)
			fmt.Fprintf(o, "  strain: %s (window %d points, VSG %d px = %.1f mm)\n", filepath.Join(runDir, runfolder.StrainDir), res.Window, res.VSG, res.VSGmm)
			fmt.Fprintf(o, "  resolution from %d static frames: u %.4f px (%.1f µm), exx %.0f µε, eyy %.0f µε, e_eq %.0f µε\n",
				res.Frames, res.U, 1000*res.UMM, res.Exx*1e6, res.Eyy*1e6, res.Eeq*1e6)
			fmt.Fprintf(o, "  onsets (UCS %.0f MPa, K = %.2f assumed for the context):\n", demoUCS, demoK)
			printOnsets(cmd, report, filepath.Join(runDir, runfolder.OnsetJSON))
			fmt.Fprintf(o, "  stages run: synthetic lab, tracking, strain, zones and onset (overlays and report are not built yet)\n")
			fmt.Fprintf(o, "done in %.1f s\n", time.Since(start).Seconds())
			return nil
		},
	}
	cmd.Flags().StringVar(&out, "out", filepath.Join("out", "demo"), "output folder")
	return cmd
}
