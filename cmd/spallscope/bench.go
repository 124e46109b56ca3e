package main

import (
	"fmt"
	"io"
	"text/tabwriter"

	"github.com/spf13/cobra"

	"spallscope/dic/baseline"
)

func newBenchCmd() *cobra.Command {
	var window, size, frames int
	var sequence string
	var noise float64
	var heldOut bool
	var subsets, steps []int
	cmd := &cobra.Command{
		Use:   "bench",
		Short: "Compare spallscope's subset correlation with OpenCV baselines on synthetic frames with exact truth",
		Long: `bench renders synthetic speckle frames whose displacement is known exactly
(rigid subpixel shifts without noise, and a homogeneous strain with a shift
and sensor noise of 1 gray level), measures a grid of points with spallscope's
subset correlation and with OpenCV's Lucas–Kanade and Farneback optical flow,
phase correlation and template matching with a parabolic peak fit, and prints
each method's error against the truth and its time per point.

rmse/best is the RMSE over that of the best baseline on the same case (below 1
is better than every baseline); time/LK is the time per point over that of
Lucas–Kanade in the same run. Times are wall times, fastest of several runs,
including each method's image preparation (splines, pyramids, dense fields) but
not the conversion of the frames to OpenCV's 8-bit images; on a busy machine
read the ratios rather than the microseconds. missing counts the points a
method reported as failed, left out of its RMSE.

With --sequence WxH it renders instead a sequence that looks like a test: a
strain ramp with a small rotation and a drift, with sensor noise (--noise),
over --frames frames, and tracks it frame after frame as a run does, for each
subset size and grid step given. Each line is the frames after the first
tracked one: time per frame, points/s, mean IC-GN iterations per point, RMSE
against the exact field, peak resident memory, and Lucas–Kanade's RMSE, the
points it reported lost (left out of its RMSE) and time/LK on the same frames
and points (OpenCV's call alone). Frames of 20 MP and more are rendered
one at a time, as a run reads them; rendering takes longer than tracking.`,
		Args: cobra.NoArgs,
		RunE: func(cmd *cobra.Command, _ []string) error {
			if sequence != "" {
				spec := baseline.SequenceSpec{Frames: frames, Noise: noise, HeldOut: heldOut}
				var err error
				if spec.Width, spec.Height, err = parseSize(sequence); err != nil {
					return fmt.Errorf("bench: --sequence %q: want WIDTHxHEIGHT in px, such as 1024x1024 or 5472x3648", sequence)
				}
				return benchSequence(cmd.OutOrStdout(), spec, subsets, steps)
			}
			cases, err := baseline.Cases(size)
			if err != nil {
				return fmt.Errorf("bench: %w", err)
			}
			rows, err := baseline.Compare(cases, window)
			if err != nil {
				return fmt.Errorf("bench: %w", err)
			}
			fmt.Fprintf(cmd.OutOrStdout(), "%dx%d px frames, %d points per case, %d px subsets\n", size, size, len(cases[0].Points), window)
			w := tabwriter.NewWriter(cmd.OutOrStdout(), 2, 4, 2, ' ', 0)
			fmt.Fprintln(w, "case\tmethod\trmse_px\tmax_px\tmissing\tus_per_point\trmse/best\ttime/LK")
			for _, r := range rows {
				fmt.Fprintf(w, "%s\t%s\t%.4f\t%.4f\t%d\t%.1f\t%.2f\t%.2f\n", r.Case, r.Method,
					r.RMSE, r.MaxErr, r.Missing, 1e6*r.TimePerPoint, r.VsBest, r.VsLK)
			}
			return w.Flush()
		},
	}
	cmd.Flags().IntVar(&window, "subset", 21, "subset (window) size in px, odd")
	cmd.Flags().IntVar(&size, "size", 512, "side of the square synthetic frames in px")
	cmd.Flags().StringVar(&sequence, "sequence", "", "track a noisy strain-ramp sequence of frames of this size (WIDTHxHEIGHT px) instead")
	cmd.Flags().IntVar(&frames, "frames", 6, "with --sequence: frames including the reference, at least 3")
	cmd.Flags().Float64Var(&noise, "noise", 1.5, "with --sequence: sensor noise σ in gray levels (8-bit)")
	cmd.Flags().BoolVar(&heldOut, "held-out", false, "with --sequence: the held-out variant (another pattern, ramp and rotation)")
	cmd.Flags().IntSliceVar(&subsets, "subsets", []int{21, 31}, "with --sequence: subset sizes in px, odd")
	cmd.Flags().IntSliceVar(&steps, "steps", []int{10, 5}, "with --sequence: grid steps in px")
	return cmd
}

// benchSequence renders spec and prints a line of TrackSequence for each
// subset size and step.
func benchSequence(out io.Writer, spec baseline.SequenceSpec, subsets, steps []int) error {
	for _, sub := range subsets {
		if sub < 3 || sub%2 == 0 {
			return fmt.Errorf("bench: --subsets: %d px, want an odd size of at least 3", sub)
		}
	}
	for _, st := range steps {
		if st < 1 {
			return fmt.Errorf("bench: --steps: %d px, want at least 1", st)
		}
	}
	spec.OnDemand = spec.Width*spec.Height > 4<<20
	seq, err := baseline.NewSequence(spec)
	if err != nil {
		return fmt.Errorf("bench: %w", err)
	}
	variant := "main"
	if spec.HeldOut {
		variant = "held out"
	}
	fmt.Fprintf(out, "%dx%d px, %d frames, noise σ %g, %s variant; frames after the first tracked one\n", spec.Width, spec.Height, spec.Frames, spec.Noise, variant)
	// Fixed columns rather than a tabwriter: each line is printed as soon
	// as it is measured (a 20 MP line takes minutes).
	const line = "%6v  %4v  %7v  %7v  %8v  %10v  %7v  %11v  %10v  %7v  %7v\n"
	fmt.Fprintf(out, line, "subset", "step", "points", "s/frame", "points/s", "iterations", "rmse_px", "peak_RSS_MB", "LK_rmse_px", "LK_lost", "time/LK")
	for _, sub := range subsets {
		for _, st := range steps {
			r, err := baseline.TrackSequence(seq, sub, st)
			if err != nil {
				return fmt.Errorf("bench: subset %d, step %d: %w", sub, st, err)
			}
			f := func(format string, v float64) string { return fmt.Sprintf(format, v) }
			fmt.Fprintf(out, line, sub, st, f("%.0f", r.Points), f("%.3f", r.SecondsPerFrame), f("%.0f", r.PointsPerSecond),
				f("%.2f", r.Iterations), f("%.4f", r.RMSE), f("%.0f", float64(r.PeakRSS)/(1<<20)), f("%.4f", r.LKRMSE), f("%.0f", r.LKLost), f("%.2f", r.VsLK))
		}
	}
	return nil
}
