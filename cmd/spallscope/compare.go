package main

import (
	"fmt"
	"path/filepath"
	"text/tabwriter"

	"github.com/spf13/cobra"

	"spallscope/cmd/spallscope/internal/config"
	"spallscope/cmd/spallscope/internal/job"
	"spallscope/dic"
	"spallscope/strain/model"
)

func newCompareCmd() *cobra.Command {
	var (
		m      config.Model // the flags fill the model section of a test config
		origin string
		scale  float64
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
			if m.File == "" {
				return fmt.Errorf("--model FILE is required")
			}
			if origin != "" {
				p, err := parsePoint("--origin", origin)
				if err != nil {
					return err
				}
				m.Origin = p[:]
			}
			if m.Frame == "" && m.LoadMPa == 0 {
				return fmt.Errorf("give --frame, or --stress with a run whose zones stage placed the frames on the load log")
			}
			f := m.Format()
			f.Scale = dic.Scale(scale)
			c, err := job.CompareModel(run, m.File, f, m.Frame, m.LoadMPa)
			if err != nil {
				return err
			}
			frame := c.FrameName
			modelPath := m.File
			out := filepath.Join(run, model.Dir)
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
	fl.StringVar(&m.File, "model", "", "model field CSV")
	fl.StringVar(&m.Frame, "frame", "", "measured frame to compare (name)")
	fl.Float64Var(&m.LoadMPa, "stress", 0, "model load level in MPa: compare the frame with the nearest nominal stress")
	fl.StringVar(&m.Units, "units", "mm", "model lengths: mm (specimen) or px (reference pixels)")
	fl.Float64Var(&scale, "scale", 0, "mm per px (default: the run's scale)")
	fl.StringVar(&origin, "origin", "0,0", "reference pixel X,Y of the model's origin")
	fl.BoolVar(&m.YUp, "y-up", false, "the model's y axis points up the image")
	fl.BoolVar(&m.CompressionPositive, "compression-positive", false, "the model's strains are compression positive")
	return cmd
}
