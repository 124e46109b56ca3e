package main

import (
	"fmt"
	"path/filepath"

	"github.com/spf13/cobra"

	"spallscope/cmd/spallscope/internal/config"
	"spallscope/cmd/spallscope/internal/job"
	"spallscope/cmd/spallscope/internal/progress"
	"spallscope/dic/runfolder"
	"spallscope/strain/strainfile"
)

func newStrainCmd() *cobra.Command { return strainCommand(&config.Test{}) }

// strainCommand is the strain command filling test config t from its options.
func strainCommand(t *config.Test) *cobra.Command {
	var (
		fields, out string
		subsetSize  int
	)
	cmd := &cobra.Command{
		Use:   "strain --fields RUN --window N [--measure M] [--static K] [--out RUN]",
		Short: "Differentiate displacement fields into strain maps over a strain window, with the noise floor",
		Long: `strain turns the displacement fields of a run folder into strain fields.

At every grid point, u and v are fitted by least squares with a plane (or,
with --order 2, a quadratic surface) over the N×N grid points of the strain
window around it, and the fitted gradient gives the strain (pointwise least
squares, equivalent to a two-dimensional Savitzky–Golay differentiator).
Only valid points connected to the centre inside the window are used, so a
window keeps to its side of an opening or of a crack whose straddling points
were flagged; with fewer than half the window's points the strain is invalid.

Measures (--measure): engineering (infinitesimal, ½(∇u + ∇uᵀ)), green
(Green–Lagrange, ½(FᵀF − I), free of rotation) and hencky (logarithmic,
½ ln FᵀF). Sign convention: tension positive, compression negative; exy is
the tensor shear (half the engineering shear γxy); e1 ≥ e2 are the principal
strains, angle_deg the direction of e1 from +x towards +y (clockwise on the
screen, y is down); gamma_max = e1 − e2 is the engineering maximum shear;
e_eq the von Mises equivalent strain (2/√3)√(exx² + eyy² + exx·eyy + exy²).

The virtual strain gauge (VSG), the length over which one strain value
averages, is (window − 1)·step + subset px; it is printed and recorded.

Resolution: with --static K the first K frames are static shots (no load);
the standard deviation over the field of u, v and each strain component on
them is the noise floor, recorded in run.json as the measurement resolution
with the settings that produced it.

Output: RUN/strain/<frame>.csv with columns
  x,y,exx,eyy,exy,e1,e2,angle_deg,gamma_max,e_eq,valid
(+ x_mm,y_mm with a scale), and the "strain" and "resolution" sections of
RUN/run.json. Re-running with another window does not re-track.`,
		Example: `  spallscope strain --fields run1 --window 9 --static 4 --scale 0.05
  spallscope strain --fields run1 --window 15 --measure green --scale-line 102,880,1890,880,100`,
		Args: cobra.NoArgs,
		RunE: func(cmd *cobra.Command, _ []string) error {
			if fields == "" {
				return fmt.Errorf("--fields RUN is required (a run folder with fields/, or the fields folder)")
			}
			if filepath.Base(filepath.Clean(fields)) == runfolder.FieldsDir {
				fields = filepath.Dir(filepath.Clean(fields))
			}
			if out == "" {
				out = fields
			}
			if out != fields {
				return fmt.Errorf("--out must be the run folder of --fields (%s): strain files sit beside the fields they come from", fields)
			}
			if err := checkOptions(cmd.Flags(), t); err != nil {
				return err
			}
			r := reporter(cmd)
			defer r.Wait()
			rec, res, err := job.Strain(cmd.Context(), t, fields, subsetSize, progress.Task(r, "strain"))
			if err != nil {
				return err
			}
			o := cmd.OutOrStdout()
			fmt.Fprintf(o, "strain of %d frames in %s: window %d points, %s, VSG %d px", len(rec.Frames), filepath.Join(fields, strainfile.StrainDir), rec.Window, rec.Measure, rec.VSG)
			if rec.VSGmm > 0 {
				fmt.Fprintf(o, " (%.2f mm)", rec.VSGmm)
			}
			fmt.Fprintln(o)
			if res != nil {
				fmt.Fprintf(o, "resolution from %d static frames: u %.4f px, v %.4f px, exx %.0f µε, eyy %.0f µε, exy %.0f µε, e_eq %.0f µε\n",
					res.Frames, res.U, res.V, res.Exx*1e6, res.Eyy*1e6, res.Exy*1e6, res.Eeq*1e6)
			}
			return nil
		},
	}
	f := cmd.Flags()
	f.StringVar(&fields, "fields", "", "run folder holding fields/ (from track)")
	f.StringVar(&out, "out", "", "run folder to write into (default and only choice: the --fields run folder)")
	f.IntVar(&subsetSize, "subset", 0, "subset size in px for the VSG (default: from the track record)")
	bindStrain(f, &t.Strain)
	bindScale(f, &t.Scale)
	return cmd
}
