package main

import (
	"fmt"
	"os"
	"path/filepath"
	"strings"

	"github.com/spf13/cobra"

	"spallscope/cmd/spallscope/internal/config"
	"spallscope/cmd/spallscope/internal/progress"
	"spallscope/render/export"
)

func newExportCmd() *cobra.Command {
	var (
		vtk, npy bool
		fields   []string
		sc       config.Scale
	)
	cmd := &cobra.Command{
		Use:   "export RUN [--vtk] [--npy] [--fields u,v,exx,...]",
		Short: "Write a run folder's fields as VTK StructuredGrid files (ParaView) and NumPy arrays",
		Long: `export writes the displacement and strain fields of a run folder to open
formats, for ParaView and for Python.

  RUN/vtk/<frame>.vts   VTK XML StructuredGrid per frame
  RUN/vtk/series.pvd    the frames as a time series (open this in ParaView)
  RUN/npy/x.npy, y.npy  reference positions, (rows, cols)
  RUN/npy/<field>.npy   one array per field, (frames, rows, cols), float64
  RUN/npy/times.npy     frame times in s (frame indices when none recorded)
  RUN/npy/index.json    arrays, shapes, units and frame names

Positions and u, v are in mm when the image scale is known, else in px;
y points down as in the images (view along -Z in ParaView). Points without
a measurement hold NaN; the VTK files also carry valid (1/0) and status
(0 unsolved, 1 converged, 2 diverged, 3 out-of-image, 4 low-texture,
5 masked, 6 lost).

Fields (--fields): ` + strings.Join(export.FieldNames(), ",") + `.
By default u, v, zncc and status, and every strain component when strain
was run for each frame. Without --vtk or --npy, both are written.`,
		Example: `  spallscope export run1
  spallscope export run1 --npy --fields u,v,exx,eyy,e_eq`,
		Args: cobra.ExactArgs(1),
		RunE: func(cmd *cobra.Command, args []string) error {
			dir := args[0]
			if st, err := os.Stat(dir); err != nil {
				return fmt.Errorf("run folder: %w", err)
			} else if !st.IsDir() {
				return fmt.Errorf("run folder %s is not a folder", dir)
			}
			scale, err := sc.Value()
			if err != nil {
				return asFlagError(cmd.Flags(), err)
			}
			r := reporter(cmd)
			defer r.Wait()
			opt := export.Options{VTK: vtk, NPY: npy, Scale: scale, Progress: progress.Task(r, "export")}
			if cmd.Flags().Changed("fields") {
				opt.Fields = fields
				if opt.Fields == nil {
					opt.Fields = []string{}
				}
			}
			res, err := export.Export(dir, opt)
			if err != nil {
				return err
			}
			o := cmd.OutOrStdout()
			fmt.Fprintf(o, "exported %d frames (%s; lengths in %s, times from %s)\n", res.Frames, strings.Join(res.Fields, ","), res.LengthUnit, res.TimeSource)
			if res.VTK != "" {
				fmt.Fprintf(o, "  VTK: %s\n", filepath.Join(res.VTK, export.SeriesFile))
			}
			if res.NPY != "" {
				fmt.Fprintf(o, "  NPY: %s\n", filepath.Join(res.NPY, export.IndexFile))
			}
			for _, n := range res.Notes {
				fmt.Fprintf(o, "  note: %s\n", n)
			}
			return nil
		},
	}
	f := cmd.Flags()
	f.BoolVar(&vtk, "vtk", false, "write VTK files (RUN/vtk)")
	f.BoolVar(&npy, "npy", false, "write NumPy arrays (RUN/npy)")
	f.StringSliceVar(&fields, "fields", nil, "fields to export, comma-separated (default: u,v,zncc,status and strain)")
	bindScale(cmd.Flags(), &sc)
	return cmd
}
