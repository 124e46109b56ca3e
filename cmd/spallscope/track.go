package main

import (
	"fmt"
	"path/filepath"

	"github.com/spf13/cobra"

	"spallscope/cmd/spallscope/internal/job"
	"spallscope/cmd/spallscope/internal/stage"
	"spallscope/dic"
	"spallscope/dic/runfolder"
	"spallscope/subset"
)

// trackFlags are the correlation options shared by commands that track.
type trackFlags struct {
	ref, images, roi, maskFile string
	exclude, seeds             []string
	order                      int
	interp, reference          string
	s                          dic.Settings
	timesCSV                   string
	fps                        float64
	mtime                      bool
	scale                      scaleFlags
}

func (f *trackFlags) register(cmd *cobra.Command) {
	d := dic.DefaultSettings()
	fl := cmd.Flags()
	fl.StringVar(&f.ref, "ref", "", "reference image file, or a frame index of --images (default: the first frame)")
	fl.StringVar(&f.images, "images", "", "frames: a folder, a quoted glob, a list file or a video")
	fl.StringVar(&f.roi, "roi", "", "region of interest x0,y0,x1,y1 in px, or a shape such as polygon:x1,y1,... (default: whole image)")
	fl.StringVar(&f.maskFile, "mask", "", "mask image the size of the reference: nonzero pixels are measured")
	fl.StringArrayVar(&f.exclude, "exclude", nil, "exclude a shape, repeatable: circle:cx,cy,r  ellipse:cx,cy,rx,ry[,deg]  polygon:x1,y1,...  rect:x0,y0,x1,y1")
	fl.StringArrayVar(&f.seeds, "seed", nil, "seed point x,y in px, repeatable (automatic seeds cover the rest)")
	fl.IntVar(&f.s.Subset, "subset", d.Subset, "subset size in px (odd, ≥ 7)")
	fl.IntVar(&f.s.Step, "step", d.Step, "grid step in px")
	fl.IntVar(&f.order, "order", 1, "shape function: 1 affine, 2 quadratic")
	fl.StringVar(&f.interp, "interp", "cubic", "B-spline interpolation: cubic or quintic")
	fl.StringVar(&f.reference, "reference", string(d.Reference), "reference strategy: fixed or incremental")
	fl.Float64Var(&f.s.UpdateBelow, "update-below", d.UpdateBelow, "incremental: move the reference when the median ZNCC falls below this")
	fl.Float64Var(&f.s.MinZNCC, "min-zncc", d.MinZNCC, "lowest ZNCC of a measured point")
	fl.Float64Var(&f.s.ResidualFactor, "residual-factor", d.ResidualFactor, "flag points whose ZNSSD exceeds this many times the frame median (negative: off)")
	fl.IntVar(&f.s.SearchRadius, "search-radius", d.SearchRadius, "integer search radius of seed points in px (largest jump between frames)")
	fl.IntVar(&f.s.EdgeGuard, "edge-guard", d.EdgeGuard, "px along the rim of exclusions left out of subsets (negative: none)")
	fl.Float64Var(&f.s.MinValidFraction, "min-valid", d.MinValidFraction, "smallest measured fraction of a subset's pixels")
	fl.IntVar(&f.s.Workers, "workers", 0, "goroutines (default: all cores); results do not depend on it")
	fl.StringVar(&f.timesCSV, "times", "", "frame times: CSV with columns frame,time_s")
	fl.Float64Var(&f.fps, "fps", 0, "frame times: fixed rate in frames per second (default for video: its stated rate)")
	fl.BoolVar(&f.mtime, "mtime", false, "frame times: file modification times")
	f.scale.register(cmd)
}

// settings completes the settings from the flags that need parsing.
func (f *trackFlags) settings() (dic.Settings, error) {
	s := f.s
	// Zero settings mean "default" to the library; on the command line they
	// were typed, so they are errors.
	if s.Step <= 0 {
		return s, fmt.Errorf("--step %d: step %d px, expected a positive number of pixels", s.Step, s.Step)
	}
	if s.Subset <= 0 {
		return s, fmt.Errorf("--subset %d: subset %d px, expected an odd size of at least 7 px", s.Subset, s.Subset)
	}
	switch f.order {
	case 1:
		s.Order = subset.Affine
	case 2:
		s.Order = subset.Quadratic
	default:
		return s, fmt.Errorf("--order %d, expected 1 (affine) or 2 (quadratic)", f.order)
	}
	var err error
	if s.Interpolation, err = subset.ParseInterpolation(f.interp); err != nil {
		return s, fmt.Errorf("--interp %q, expected cubic or quintic", f.interp)
	}
	s.Reference = dic.ReferenceMode(f.reference)
	for _, p := range f.seeds {
		xy, err := parsePoint("--seed", p)
		if err != nil {
			return s, err
		}
		s.Seeds = append(s.Seeds, [2]int{int(xy[0]), int(xy[1])})
	}
	return s, s.Validate()
}

// open opens the sequence and the reference image, and builds the mask.
func (f *trackFlags) open() (*job.Inputs, error) {
	if f.images == "" {
		return nil, fmt.Errorf("--images is required (a folder, glob, list file or video)")
	}
	return job.Open(f.images, f.ref, f.roi, f.exclude, f.maskFile)
}

func newTrackCmd() *cobra.Command {
	var tf trackFlags
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
read stops the run with an error naming it and keeps the fields written.`,
		Example: `  spallscope track --images photos/ --ref 0 --exclude circle:1012,980,240 --out run1
  spallscope track --images "cam1/*.tif" --subset 31 --step 10 --order 2 --out run2`,
		Args: cobra.NoArgs,
		RunE: func(cmd *cobra.Command, _ []string) error {
			if out == "" {
				return fmt.Errorf("--out DIR is required")
			}
			s, err := tf.settings()
			if err != nil {
				return err
			}
			in, err := tf.open()
			if err != nil {
				return err
			}
			seq := in.Seq
			defer seq.Close()
			tracker, err := dic.NewTracker(in.Ref, in.RefIndex, in.Mask, s)
			if err != nil {
				return err
			}
			rec := runfolder.TrackRecord{Tool: "spallscope " + version, Images: tf.images, Reference: tf.ref, Exclude: tf.exclude}
			if rec.Times, err = job.Times(seq, tf.timesCSV, tf.fps, tf.mtime); err != nil {
				return err
			}
			if rec.MMPerPx, err = tf.scale.scale(); err != nil {
				return err
			}
			if rec.Reference == "" {
				rec.Reference = "0"
			}
			prog := newRateLine(cmd, "track", seq.Len(), tracker.Grid().Len())
			rec, err = stage.Track(out, seq, tracker, rec, 0, func(n int, f *dic.Field) { prog.done(n, f.Valid()) })
			if err != nil {
				return err
			}
			fmt.Fprintf(cmd.OutOrStdout(), "tracked %d frames, %d points each, in %.1f s: %s\n",
				seq.Len(), tracker.Grid().Len(), rec.Seconds, filepath.Join(out, runfolder.FieldsDir))
			return nil
		},
	}
	tf.register(cmd)
	cmd.Flags().StringVar(&out, "out", "", "run folder")
	return cmd
}
