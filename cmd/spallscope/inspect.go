package main

import (
	"errors"
	"fmt"
	"math"
	"text/tabwriter"

	"github.com/spf13/cobra"

	"spallscope/cmd/spallscope/internal/config"
	"spallscope/cmd/spallscope/internal/job"
	"spallscope/dic/frames"
	"spallscope/dic/region"
)

// brightnessJump is the change of a frame's mean gray level over the
// frame before that inspect tells of: 5 % (common practice, no source).
const brightnessJump = 0.05

func newInspectCmd() *cobra.Command {
	var tt config.Times
	var flash bool
	var flashRegion string
	cmd := &cobra.Command{
		Use:   "inspect SOURCE",
		Short: "Check that every frame of a photo sequence or video decodes, with sizes, depth, exposure and times",
		Long: `inspect opens a sequence the way the tracker will and decodes every frame:
SOURCE is a folder of images, a glob in quotes ("cam1/*.tif"), a list file
(.txt/.lst, one path per line) or a video (.mp4/.avi/...). Frames are sorted in
natural order (f_2 before f_10). It prints each frame's size, bit depth, gray
levels and clipped fractions, and its time and the interval since the frame
before when a rule is given (--times, --fps, --mtime or --exif), and lists
every frame that fails instead of stopping at the first.

--exif reads each photo's capture time from its EXIF tags (DateTimeOriginal,
with SubSecTimeOriginal and OffsetTimeOriginal when the camera writes them)
and notes missing subseconds (1 s resolution) and an irregular interval; a
time that repeats or goes back is an error naming the frames.

--flash looks for a visible event to sync the camera with the load log: a
frame brighter by more than 5 % than each of the 5 frames before it (a flash,
or an LED in view switched on at a known time of the load log), over the whole
frame or inside --flash-region SHAPE (rect:x0,y0,x1,y1, circle:..., polygon:...;
an LED is best given its own region). It prints the strongest such frame with
its camera time as a sync pair for a test config's load.sync key or zones' --sync
option: [camera_s, log_s], log_s being the log's time of the event. The event
happened while that frame was exposed, so the pair is good to one frame
interval.`,
		Args: cobra.ExactArgs(1),
		RunE: func(cmd *cobra.Command, args []string) error {
			var inside func(x, y float64) bool
			if flashRegion != "" {
				if !flash {
					return fmt.Errorf("--flash-region: give --flash too")
				}
				shape, err := region.ParseShape(flashRegion)
				if err != nil {
					return fmt.Errorf("--flash-region %q: %w", flashRegion, err)
				}
				inside = shape.Contains
			}
			seq, err := frames.Open(args[0])
			if err != nil {
				return err
			}
			defer seq.Close()
			times, notes, err := job.Times(seq, tt, func(p string) string { return p })
			if err != nil {
				return err
			}
			w := tabwriter.NewWriter(cmd.OutOrStdout(), 2, 4, 2, ' ', 0)
			fmt.Fprintln(w, "frame\tname\tsize\tdepth\tmin\tmean\tmax\tsaturated\tdark\ttime_s\tinterval_s")
			var bad []error
			prevMean := math.NaN()
			var regionMeans []float64
			for i := 0; i < seq.Len(); i++ {
				img, err := seq.Read(i)
				if err != nil {
					bad = append(bad, err)
					fmt.Fprintf(w, "%d\t%s\tERROR\n", i, seq.Name(i))
					regionMeans = append(regionMeans, math.NaN())
					continue
				}
				st := frames.Describe(img)
				if flash {
					m := st.Mean // the whole frame's, already summed by Describe
					if inside != nil {
						var n int
						if m, n = frames.RegionMean(img, inside); n == 0 {
							return fmt.Errorf("--flash-region %q: holds no pixel of frame %d (%s), %dx%d px", flashRegion, i, seq.Name(i), img.Width, img.Height)
						}
					}
					regionMeans = append(regionMeans, m)
				}
				if jump := st.Mean/prevMean - 1; math.Abs(jump) > brightnessJump {
					notes = append(notes, fmt.Sprintf("frame %d (%s): the mean gray level jumps by %+.0f %% from the frame before (a flash, a lamp, an exposure change?); correlation ignores gain and offset, but look at the frames", i, seq.Name(i), 100*jump))
				}
				prevMean = st.Mean
				if st.NonFinite > 0 {
					notes = append(notes, fmt.Sprintf("frame %d (%s): %d pixels are NaN or infinite; tracking treats them as unmeasured", i, seq.Name(i), st.NonFinite))
				}
				t, dt := "-", "-"
				if times != nil {
					t = fmt.Sprintf("%.3f", times[i])
					if i > 0 {
						dt = fmt.Sprintf("%.3f", times[i]-times[i-1])
					}
				}
				fmt.Fprintf(w, "%d\t%s\t%dx%d\t%d\t%.0f\t%.1f\t%.0f\t%.2f%%\t%.2f%%\t%s\t%s\n", i, seq.Name(i),
					img.Width, img.Height, img.Depth, st.Min, st.Mean, st.Max, 100*st.Saturated, 100*st.Dark, t, dt)
			}
			w.Flush()
			if flash {
				printFlash(cmd, seq, times, regionMeans, flashRegion)
			}
			for _, n := range append(notes, frames.Notes(seq)...) {
				fmt.Fprintln(cmd.OutOrStdout(), "note:", n)
			}
			if len(bad) > 0 {
				return fmt.Errorf("%d of %d frames failed:\n%w", len(bad), seq.Len(), errors.Join(bad...))
			}
			return nil
		},
	}
	cmd.Flags().StringVar(&tt.CSV, "times", "", "CSV of frame times with columns frame,time_s")
	cmd.Flags().Float64Var(&tt.FPS, "fps", 0, "frames per second (fixed rate)")
	cmd.Flags().BoolVar(&tt.MTime, "mtime", false, "take frame times from file modification times")
	cmd.Flags().BoolVar(&tt.EXIF, "exif", false, "take frame times from the photos' EXIF capture times, and print the intervals")
	cmd.Flags().BoolVar(&flash, "flash", false, "find a frame-by-frame brightness jump (a flash or an LED in view) and print it as a sync pair")
	cmd.Flags().StringVar(&flashRegion, "flash-region", "", "with --flash: look inside this shape only (rect:x0,y0,x1,y1, circle:cx,cy,r, polygon:...)")
	return cmd
}

// printFlash prints the strongest brightness jump of the frames' means
// (inside the shape given, "" for the whole frame) as a sync-pair candidate, and
// the others.
func printFlash(cmd *cobra.Command, seq frames.Sequence, times, means []float64, given string) {
	out := cmd.OutOrStdout()
	where := "the whole frame"
	if given != "" {
		where = given
	}
	fl := frames.FindFlashes(means, brightnessJump)
	if len(fl) == 0 {
		fmt.Fprintf(out, "flash: no frame is brighter than each of the %d before it by more than %.0f %% in %s\n", frames.FlashBaseline, 100*brightnessJump, where)
		return
	}
	f := fl[0]
	fmt.Fprintf(out, "flash: frame %d (%s) is %+.0f %% brighter than the brightest of the frames before it, in %s\n", f.Frame, seq.Name(f.Frame), 100*f.Jump, where)
	if times == nil {
		fmt.Fprintln(out, "flash: give frame times (--fps, --times, --mtime or --exif) for its camera time and sync pair")
	} else {
		dt := "?"
		if f.Frame > 0 {
			dt = fmt.Sprintf("%.3f", times[f.Frame]-times[f.Frame-1])
		}
		fmt.Fprintf(out, "flash: sync pair [%.3f, LOG_S]: camera time %.3f s ↔ LOG_S, the load log's time of the event (load: {sync: [%.3f, LOG_S]} in the test config, or --sync %.3f,LOG_S); good to one frame interval (%s s)\n",
			times[f.Frame], times[f.Frame], times[f.Frame], times[f.Frame], dt)
	}
	for _, o := range fl[1:] {
		fmt.Fprintf(out, "flash: also frame %d (%s), %+.0f %%\n", o.Frame, seq.Name(o.Frame), 100*o.Jump)
	}
}
