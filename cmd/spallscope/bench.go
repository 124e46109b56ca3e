package main

import (
	"fmt"
	"text/tabwriter"

	"github.com/spf13/cobra"

	"spallscope/dic/baseline"
)

func newBenchCmd() *cobra.Command {
	var window, size int
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
including each method's image preparation; on a busy machine read the ratios
rather than the microseconds.`,
		Args: cobra.NoArgs,
		RunE: func(cmd *cobra.Command, _ []string) error {
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
	return cmd
}
