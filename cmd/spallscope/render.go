package main

import (
	"fmt"
	"strings"

	"github.com/spf13/cobra"

	"spallscope/cmd/spallscope/internal/progress"
	"spallscope/render"
)

func newRenderCmd() *cobra.Command {
	var (
		opt         render.Options
		percentiles []float64
	)
	var fields []string
	for _, q := range render.Quantities {
		fields = append(fields, fmt.Sprintf("  %-10s %s (%s)", q.Name, q.Label, q.Convention))
	}
	cmd := &cobra.Command{
		Use:   "render RUN_DIR [--field e1] [--on reference|current] [--limits sequence|auto|MIN,MAX] [--video]",
		Short: "Draw strain or displacement overlays on the photos, one PNG per frame, and a video",
		Long: `render draws a field of a run folder over the photos: the coloured field blended
into the gray photo, with a side panel holding the colour bar, the quantity and
unit, how the limits were chosen, the frame's name, time and nominal stress (and
its share of the test's peak), a scale bar and the legend.

Fields (--field):
` + strings.Join(fields, "\n") + `

Units: strain in microstrain (µε) up to 1 %, in % beyond; displacement in mm
when the run knows the image scale, else px; ZNCC has no unit.
Conventions: reference pixels, x right, y down; tension positive, compression
negative; exy is the tensor shear (half the engineering shear).

Colours: signed fields (exx, eyy, exy, e1, e2, u, v) use a diverging map, blue
for negative, neutral gray at zero, red for positive (Moreland's cool to warm),
with limits symmetric about zero; magnitudes (gamma_max, e_eq, disp, zncc) use
viridis. Values beyond the limits take the end colours, marked by a triangle at
that end of the colour bar.

Limits (--limits): "sequence" (default) takes the --percentiles (1st to 99th)
of the values of all frames together, so a colour means the same value in
every frame; "auto" takes them frame by frame; MIN,MAX fixes them, as plain
numbers (strain 0.002, displacement px) or with a unit: 2000ue or 0.2% for
strain, px or mm for displacement.

Photo (--on): "reference" draws every frame's field on the reference photo,
where it was measured; "current" draws it on each frame's own photo, moved
with the material (each pixel shows the value of the material point now
there).

Only measured points are coloured: inside grid cells whose four corners are
valid the field is interpolated bilinearly, at the edge of the measured region
a point colours up to half a step around it, and openings and lost points stay
clear (the photo shows). Zone outlines (white: localized strain; black: points
lost) and numbered onset badges (from the frame an onset was first seen on,
with its class, place and nominal stress) are drawn when the run has zones and
onsets; --vectors adds displacement arrows at every --every-th grid point with
one gain for the whole sequence. The panel states the virtual strain gauge and
the noise floor when the run has them. Overlays show measurements; they are no
design values and no warning system.

Output: RUN/overlays/<frame>.png, and with --video RUN/video.mp4 (MPEG-4, or
AVI Motion JPEG where this machine's OpenCV cannot write MP4, which is said).`,
		Example: `  spallscope render run1 --field e1 --video
  spallscope render run1 --field gamma_max --on current --video --side-by-side --fps 5
  spallscope render run1 --field v --vectors --every 3 --limits -2px,2px`,
		Args: cobra.ExactArgs(1),
		RunE: func(cmd *cobra.Command, args []string) error {
			if len(percentiles) != 2 {
				return fmt.Errorf("--percentiles takes LOW,HIGH, got %d numbers", len(percentiles))
			}
			if !(opt.Alpha > 0 && opt.Alpha <= 1) {
				return fmt.Errorf("--alpha %g: expected an opacity in (0, 1]", opt.Alpha)
			}
			opt.LowPct, opt.HighPct = percentiles[0], percentiles[1]
			r := reporter(cmd)
			defer r.Wait()
			opt.Progress = progress.Task(r, "render")
			res, err := render.Run(cmd.Context(), args[0], opt)
			if err != nil {
				return err
			}
			o := cmd.OutOrStdout()
			lim := res.Limits
			lo, hi := lim.Lo*res.Unit.Factor, lim.Hi*res.Unit.Factor
			how := map[render.LimitMode]string{
				render.LimitsSequence: fmt.Sprintf("%g–%g %% of all frames", lim.LowPct, lim.HighPct),
				render.LimitsFrame:    fmt.Sprintf("%g–%g %% frame by frame; last frame", lim.LowPct, lim.HighPct),
				render.LimitsFixed:    "fixed",
			}[lim.Mode]
			fmt.Fprintf(o, "rendered %d overlays of %s (%s), limits %.4g to %.4g %s (%s): %s\n",
				res.Frames, res.Quantity.Name, res.Quantity.Label, lo, hi, res.Unit.Symbol, how, res.Dir)
			if res.Video != "" {
				fmt.Fprintf(o, "video: %s (%s, %d frames at %g fps)\n", res.Video, res.VideoFormat, res.Frames, opt.FPS)
			}
			for _, n := range res.Notes {
				fmt.Fprintln(o, "note:", n)
			}
			return nil
		},
	}
	f := cmd.Flags()
	f.StringVar(&opt.Field, "field", "e1", "field to show: "+quantityNames())
	f.StringVar(&opt.On, "on", render.OnReference, "photo underneath: reference or current")
	f.StringVar(&opt.Limits, "limits", string(render.LimitsSequence), "colour limits: sequence, auto or MIN,MAX")
	f.Float64SliceVar(&percentiles, "percentiles", []float64{render.DefaultLowPercentile, render.DefaultHighPercentile}, "percentiles of automatic limits, LOW,HIGH")
	f.Float64Var(&opt.Alpha, "alpha", render.DefaultAlpha, "opacity of the field over the photo, in (0, 1]")
	f.BoolVar(&opt.Vectors, "vectors", false, "draw displacement arrows")
	f.IntVar(&opt.VectorEvery, "every", render.DefaultVectorEvery, "with --vectors: an arrow at every N-th grid point along x and y")
	f.BoolVar(&opt.Video, "video", false, "also write RUN/video.mp4 of the overlays")
	f.StringVar(&opt.Format, "format", render.VideoMP4, "video format: mp4 or avi")
	f.Float64Var(&opt.FPS, "fps", render.DefaultFPS, "video frame rate, frames per second")
	f.BoolVar(&opt.SideBySide, "side-by-side", false, "video: the raw frame to the left of each overlay")
	f.IntVar(&opt.VideoWidth, "video-width", render.DefaultVideoWidth, "video: frame width in px; wider frames are scaled down to it (negative: the overlays' own size)")
	f.StringVar(&opt.Images, "images", "", "photos, when they are no longer where the track record says")
	return cmd
}

// quantityNames lists the fields render can show.
func quantityNames() string {
	var names []string
	for _, q := range render.Quantities {
		names = append(names, q.Name)
	}
	return strings.Join(names, ", ")
}
