package main

import (
	"fmt"
	"path/filepath"
	"text/tabwriter"

	"github.com/spf13/cobra"

	"spallscope/cmd/spallscope/internal/job"
	"spallscope/dic"
	"spallscope/strain/model"
)

func newCompareCmd() *cobra.Command {
	var (
		modelPath, frame, units, origin string
		stress, scale                   float64
		yUp, compressionPositive        bool
	)
	cmd := &cobra.Command{
		Use:   "compare RUN --model FILE (--frame NAME | --stress MPA) [--units mm --origin X,Y --y-up]",
		Short: "Compare a numerical model's field with the measurement at one frame",
		Long: `compare reads a model's field — a CSV of points with columns x, y and any of
u, v, exx, eyy, exy (exy the tensor shear; tension positive unless
--compression-positive) — maps it to reference pixels (model origin at
--origin px, y up with --y-up, mm converted with the run's scale), and compares
it with the measured field of one frame: the frame named by --frame, or the one
whose nominal stress is nearest --stress (the model's load level, from the
zones stage's timeline). It writes RUN/model/model-diff.csv (measured − model
on the DIC grid) and RUN/model/model-summary.json (bias, RMS, max, correlation
per quantity, beside the measurement resolution), and prints the summary.`,
		Args: cobra.ExactArgs(1),
		RunE: func(cmd *cobra.Command, args []string) error {
			run := args[0]
			if modelPath == "" {
				return fmt.Errorf("--model FILE is required")
			}
			f := model.Format{Units: model.Units(units), YUp: yUp, CompressionPositive: compressionPositive, Scale: dic.Scale(scale)}
			if origin != "" {
				p, err := parsePoint("--origin", origin)
				if err != nil {
					return err
				}
				f.OriginX, f.OriginY = p[0], p[1]
			}
			if frame == "" && stress == 0 {
				return fmt.Errorf("give --frame, or --stress with a run whose zones stage placed the frames on the load log")
			}
			c, err := job.CompareModel(run, modelPath, f, frame, stress)
			if err != nil {
				return err
			}
			frame = c.FrameName
			out := filepath.Join(run, job.ModelDir)
			pics, _ := filepath.Glob(filepath.Join(out, "compare_*.png"))
			w := tabwriter.NewWriter(cmd.OutOrStdout(), 2, 4, 2, ' ', 0)
			fmt.Fprintf(w, "frame %s against %s\n", frame, modelPath)
			fmt.Fprintln(w, "quantity\tpoints\tbias\trms\tmax\tcorrelation\trms/resolution")
			for _, s := range c.Stats {
				fmt.Fprintf(w, "%s\t%d\t%.3g\t%.3g\t%.3g\t%.3f\t%.2f\n", s.Quantity, s.Count, s.Bias, s.RMS, s.MaxAbs, s.Correlation, s.Ratio())
			}
			w.Flush()
			for _, warn := range c.Warnings() {
				fmt.Fprintln(cmd.ErrOrStderr(), "warning:", warn)
			}
			fmt.Fprintf(cmd.OutOrStdout(), "written to %s (%d side-by-side images)\n", out, len(pics))
			return nil
		},
	}
	fl := cmd.Flags()
	fl.StringVar(&modelPath, "model", "", "model field CSV")
	fl.StringVar(&frame, "frame", "", "measured frame to compare (name)")
	fl.Float64Var(&stress, "stress", 0, "model load level in MPa: compare the frame with the nearest nominal stress")
	fl.StringVar(&units, "units", "mm", "model lengths: mm (specimen) or px (reference pixels)")
	fl.Float64Var(&scale, "scale", 0, "mm per px (default: the run's scale)")
	fl.StringVar(&origin, "origin", "0,0", "reference pixel X,Y of the model's origin")
	fl.BoolVar(&yUp, "y-up", false, "the model's y axis points up the image")
	fl.BoolVar(&compressionPositive, "compression-positive", false, "the model's strains are compression positive")
	return cmd
}
