package main

import (
	"fmt"
	"math"
	"path/filepath"

	"github.com/spf13/cobra"

	"spallscope/cmd/spallscope/internal/config"
	"spallscope/cmd/spallscope/internal/job"
	"spallscope/dic/runfolder"
)

func newTrackCmd() *cobra.Command { return trackCommand(&config.Test{}) }

// trackCommand is the track command filling test config t from its options.
func trackCommand(t *config.Test) *cobra.Command {
	var out string
	cmd := &cobra.Command{
		Use:   "track --images SOURCE [--ref FILE|INDEX] --out DIR",
		Short: "Track a grid of subsets through a photo sequence (ZNCC seeds, IC-GN subpixel, reliability-guided)",
		Long: `track measures displacements on a grid of points over the speckled face,
frame by frame, against a reference image.

Each point's subset (square, --subset px) is matched by zero-normalized
cross-correlation (ZNCC, insensitive to lighting offset and gain) and refined
to subpixel accuracy by the inverse compositional Gauss–Newton method (IC-GN)
with an affine (--order 1) or quadratic (--order 2) shape function on a bicubic
or biquintic B-spline. Seed points are found by an integer ZNCC search of
±--search-radius px; from them the solution spreads over the grid, most
reliable points first, each neighbour starting from its neighbour's solution
(reliability-guided DIC). Parts of the face cut off by openings get their own
seeds.

Masks: --roi, --exclude and --mask define the measured pixels (a mask image
measures its nonzero pixels). A subset that overlaps an opening or a masked
area uses only its measured pixels, minus --edge-guard px along the rim of the
exclusion (rims are not speckle texture); with fewer than --min-valid of its
pixels left the point is reported "masked". Points whose subset leaves the
image are "out-of-image", flat subsets "low-texture".

Flagged, not forced: a point whose match falls below --min-zncc, or whose
residual is --residual-factor times the frame's median (a subset straddling a
crack, material that spalled off), is reported "lost" and does not guide its
neighbours; "diverged" points did not converge.

Reference: "fixed" correlates every frame with the reference; "incremental"
moves the reference to the previous frame whenever the median ZNCC falls
below --update-below and adds the increments up, so results stay in the
original reference's pixels.

Output: DIR/fields/<frame>.csv with columns
  x,y,u,v,dudx,dudy,dvdx,dvdy,cc,iterations,status
(px in the reference, origin at the top-left pixel centre, x right, y down;
u, v in px; NaN where a point has no measurement) and a "track" section in
DIR/run.json. Each file is complete once it exists; a frame that cannot be
read stops the run with an error naming it and keeps the fields written.

Lens: with --lens FILE (from 'spallscope calibrate') the distortion is taken
out of the coordinates, not the photos: each grid point's reference and
deformed positions are undistorted and the displacement is their difference.
The grid of DIR/fields is then regular in undistorted px (the photo's pixels
at the principal point), and strains and a scale line come from undistorted
positions; the tracker's own fields, in photo px, are kept in
DIR/photo_fields.

Out-of-plane motion: with --compensation-plate SHAPE (a rigid, unloaded,
speckled plate beside the specimen, in photo px, at least half a subset clear
of the region of interest) the plate is tracked with the specimen, each frame's
apparent magnification is fitted to it and taken out of the specimen's field
about the lens's principal point (the image centre without a lens), and the
plate's points are left out of DIR/fields. The fits go to DIR/run.json's
"motion" section; --standoff MM adds the motion towards the camera in mm.`,
		Example: `  spallscope track --images photos/ --ref 0 --exclude circle:1012,980,240 --out run1
  spallscope track --images "cam1/*.tif" --subset 31 --step 10 --order 2 --out run2`,
		Args: cobra.NoArgs,
		RunE: func(cmd *cobra.Command, _ []string) error {
			if err := checkOptions(cmd.Flags(), t); err != nil {
				return err
			}
			r := reporter(cmd)
			rec, err := job.Track(cmd.Context(), t, out, "spallscope "+version, func(done, total, points int) {
				r.Update(fmt.Sprintf("track (%d points a frame)", points), done, total)
			})
			r.Wait()
			if err != nil {
				return asFlagError(cmd.Flags(), err)
			}
			for _, n := range rec.Notes {
				fmt.Fprintln(cmd.OutOrStdout(), "note:", n)
			}
			fmt.Fprintf(cmd.OutOrStdout(), "tracked %d frames, %d points each, in %.1f s: %s\n",
				len(rec.Frames), rec.Grid.Len(), rec.Seconds, filepath.Join(out, runfolder.FieldsDir))
			if rec.Lens != nil {
				fmt.Fprintf(cmd.OutOrStdout(), "lens distortion taken out with %s: fields in undistorted px; the tracker's own fields in %s\n",
					rec.Lens.File, filepath.Join(out, runfolder.PhotoFieldsDir))
			}
			var mo runfolder.MotionRecord
			if t.CompensationPlate != "" && runfolder.Section(out, runfolder.MotionSection, &mo) == nil && len(mo.Frames) > 0 {
				worst := 0.0
				for _, m := range mo.Frames {
					worst = math.Max(worst, math.Abs(m.Magnification))
				}
				fmt.Fprintf(cmd.OutOrStdout(), "compensation plate %s: apparent magnification up to %.0f µε taken out of every frame (about the %s); each frame's fit in run.json's %s section\n",
					mo.Plate, 1e6*worst, mo.CentreIs, runfolder.MotionSection)
			}
			return nil
		},
	}
	bindInputs(cmd.Flags(), t)
	bindCorrelation(cmd.Flags(), &t.Correlation)
	cmd.Flags().StringVar(&out, "out", "", "run folder")
	cmd.MarkFlagRequired("images")
	cmd.MarkFlagRequired("out")
	return cmd
}
