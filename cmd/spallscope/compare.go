package main

import (
	"fmt"
	"math"
	"path/filepath"
	"text/tabwriter"

	"github.com/spf13/cobra"

	"spallscope/dic"
	"spallscope/dic/frames"
	"spallscope/dic/runfolder"
	"spallscope/dic/testrun"
	"spallscope/render"
	"spallscope/strain"
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
			names, err := runfolder.Frames(run)
			if err != nil {
				return err
			}
			if frame == "" {
				var tl runfolder.TimelineRecord
				if err := runfolder.Section(run, "timeline", &tl); err != nil || stress == 0 {
					return fmt.Errorf("give --frame, or --stress with a run whose zones stage placed the frames on the load log")
				}
				best := math.Inf(1)
				for k, s := range tl.Stress {
					if d := math.Abs(s - stress); d < best {
						best, frame = d, tl.Frames[k]
					}
				}
			}
			index := -1
			for k, n := range names {
				if n == frame {
					index = k
				}
			}
			if index < 0 {
				return fmt.Errorf("--frame %q is not a frame of %s", frame, run)
			}
			f := model.Format{Units: model.Units(units), YUp: yUp, CompressionPositive: compressionPositive, Scale: runfolder.Scale(run)}
			if scale > 0 {
				f.Scale = dic.Scale(scale)
			}
			if origin != "" {
				p, err := parsePoint("--origin", origin)
				if err != nil {
					return err
				}
				f.OriginX, f.OriginY = p[0], p[1]
			}
			m, err := model.Read(modelPath, f)
			if err != nil {
				return err
			}
			disp, err := runfolder.ReadField(runfolder.FieldPath(run, frame))
			if err != nil {
				return err
			}
			disp.Index = index
			sf, _ := runfolder.ReadStrain(runfolder.StrainPath(run, frame)) // strain is optional
			opt := model.Options{}
			var res runfolder.ResolutionRecord
			if runfolder.Section(run, "resolution", &res) == nil {
				opt.Resolution = &res.Resolution
			}
			c, err := model.Compare(disp, sf, m, opt)
			if err != nil {
				return err
			}
			out := filepath.Join(run, "model")
			if err := model.Write(out, c); err != nil {
				return err
			}
			pics, err := drawComparison(run, out, c, disp, sf)
			if err != nil {
				return err
			}
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
			fmt.Fprintf(cmd.OutOrStdout(), "written to %s (%d side-by-side images)\n", out, pics)
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

// drawComparison writes out/compare_<quantity>.png for every compared
// quantity: model, measurement and difference side by side over the
// reference photo. It returns how many it wrote; without the reference
// photo (moved away) it writes none and says nothing went wrong.
func drawComparison(run, out string, c *model.Comparison, disp *dic.Field, sf *strain.Field) (int, error) {
	var tr runfolder.TrackRecord
	if runfolder.Section(run, "track", &tr) != nil {
		return 0, nil
	}
	in, err := testrun.Open(tr.Images, tr.Reference, "", tr.Exclude, "")
	if err != nil {
		return 0, nil
	}
	defer in.Seq.Close()
	n := 0
	for _, q := range c.Quantities {
		rq, err := render.QuantityNamed(q.String())
		if err != nil {
			continue
		}
		g := disp.Grid
		meas, mod, diff := make([]float64, g.Len()), make([]float64, g.Len()), make([]float64, g.Len())
		for i, d := range c.Points {
			m := measuredValue(q, disp, sf, i)
			meas[i], diff[i] = m, d.Values[q]
			mod[i] = m - d.Values[q]
		}
		img, err := render.ModelSideBySide(in.Ref, &render.GridValues{Grid: g, Values: mod}, &render.GridValues{Grid: g, Values: meas},
			&render.GridValues{Grid: g, Values: diff}, rq, in.Mask, tr.MMPerPx, c.FrameName)
		if err != nil {
			continue
		}
		err = frames.WriteMat(filepath.Join(out, "compare_"+q.String()+".png"), img)
		img.Close()
		if err != nil {
			return n, err
		}
		n++
	}
	return n, nil
}

// measuredValue is the measured value of quantity q at grid point i (NaN
// where not measured).
func measuredValue(q model.Quantity, disp *dic.Field, sf *strain.Field, i int) float64 {
	p := &disp.Points[i]
	switch q {
	case model.U, model.V:
		u, v := p.U()
		if q == model.U {
			return u
		}
		return v
	}
	if sf == nil || !sf.Points[i].Valid {
		return math.NaN()
	}
	s := &sf.Points[i]
	switch q {
	case model.Exx:
		return s.Exx
	case model.Eyy:
		return s.Eyy
	}
	return s.Exy
}
