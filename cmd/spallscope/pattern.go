package main

import (
	"fmt"
	"os"
	"path/filepath"

	"github.com/spf13/cobra"

	"spallscope/dic/frames"
	"spallscope/dic/speckle"
	"spallscope/subset"
)

func newPatternCmd() *cobra.Command {
	var (
		size          int
		noise, target float64
		static        string
		interp, out   string
	)
	cmd := &cobra.Command{
		Use:   "pattern IMAGE [--subset N] [--noise SIGMA | --static IMAGE2] [--target PX] [--out DIR]",
		Short: "Judge a speckle pattern from a photo: clipping, contrast, speckle size, noise and the subset size it needs",
		Long: `pattern checks a photo of the speckled face before the test: gray levels and
clipped pixels, contrast, the mean intensity gradient, the speckle size (twice
the lag at which the image's autocorrelation falls to one half), and the
displacement noise σ_u = √2·σ/√SSSIG that subsets of each odd size from 11 to
61 px can be expected to show (the median over a grid of subsets).

σ is the image noise in gray levels: give it with --noise, or give a second
photo of the same still face with --static (σ = std(I1 − I2)/√2, clipped
pixels left out). Without either, SSSIG and σ_u per gray level of noise are
still listed. The smallest subset whose σ_u is at most --target px is
reported ("none" if no size up to 61 px reaches it, "unknown" without noise).

Output: a summary on standard output, DIR/pattern.json (every figure of the
summary) and DIR/pattern_map.png, the image-sized map of --subset px subsets
every half subset in the viridis colours: with a noise level, yellow is a
quarter of the target or better, teal just meets it, purple is four times
the target or worse (or no texture); without one, the scale runs from the
poorest subset (purple) to the best (yellow). DIR is created if needed
(default "pattern" in the current folder).`,
		Example: `  spallscope pattern face_000.tif --static face_001.tif
  spallscope pattern face_000.tif --noise 2.5 --target 0.02 --out checks/pattern`,
		Args: cobra.ExactArgs(1),
		RunE: func(cmd *cobra.Command, args []string) error {
			opt := speckle.Options{Subset: size, Target: target}
			switch {
			case size <= 0:
				return fmt.Errorf("--subset %d: expected an odd size of at least 7 px", size)
			case target <= 0:
				return fmt.Errorf("--target %g: expected a positive displacement noise in px", target)
			case cmd.Flags().Changed("noise") && noise <= 0:
				return fmt.Errorf("--noise %g: expected a positive noise level in gray levels", noise)
			case cmd.Flags().Changed("noise") && static != "":
				return fmt.Errorf("--noise and --static both given: give one")
			}
			opt.Noise = noise
			var err error
			if opt.Interpolation, err = subset.ParseInterpolation(interp); err != nil {
				return fmt.Errorf("--interp %q, expected cubic or quintic", interp)
			}
			img, err := frames.ReadImage(args[0])
			if err != nil {
				return err
			}
			if static != "" {
				if opt.Static, err = frames.ReadImage(static); err != nil {
					return fmt.Errorf("--static: %w", err)
				}
			}
			r, err := speckle.Assess(img, opt)
			if err != nil {
				if static != "" {
					return fmt.Errorf("%s with --static %s: %w", args[0], static, err)
				}
				return fmt.Errorf("%s: %w", args[0], err)
			}
			if err := os.MkdirAll(out, 0o755); err != nil {
				return fmt.Errorf("--out: %w", err)
			}
			jsonPath := filepath.Join(out, "pattern.json")
			mapPath := filepath.Join(out, "pattern_map.png")
			if err := speckle.WriteJSON(jsonPath, r); err != nil {
				return err
			}
			if err := speckle.WriteMap(mapPath, r); err != nil {
				return err
			}
			w := cmd.OutOrStdout()
			fmt.Fprintf(w, "%s\n", args[0])
			if err := r.WriteSummary(w); err != nil {
				return err
			}
			fmt.Fprintf(w, "wrote %s and %s\n", jsonPath, mapPath)
			return nil
		},
	}
	fl := cmd.Flags()
	fl.IntVar(&size, "subset", speckle.DefaultSubset, "subset size in px of the map (odd, ≥ 7)")
	fl.Float64Var(&noise, "noise", 0, "image noise σ in gray levels, if known")
	fl.StringVar(&static, "static", "", "second photo of the same still face, to measure the noise")
	fl.Float64Var(&target, "target", speckle.DefaultTarget, "displacement noise in px the subset must reach")
	fl.StringVar(&interp, "interp", "cubic", "B-spline of the gradients: cubic or quintic (as tracked)")
	fl.StringVar(&out, "out", "pattern", "folder for pattern.json and pattern_map.png")
	return cmd
}
