package main

import (
	"fmt"
	"path/filepath"
	"text/tabwriter"

	"github.com/spf13/cobra"

	"spallscope/cmd/spallscope/internal/config"
	"spallscope/cmd/spallscope/internal/job"
	"spallscope/strain"
	"spallscope/strain/strainfile"
)

func newZonesCmd() *cobra.Command { return zonesCommand(&config.Test{}) }

// zonesCommand is the zones command filling test config t from its options.
func zonesCommand(t *config.Test) *cobra.Command {
	var run, out string
	cmd := &cobra.Command{
		Use:   "zones --strain RUN [--load FILE --area MM2] [--opening NAME=SHAPE ...] [--out RUN]",
		Short: "Find localized zones frame by frame and time the onset of spalling, notching and cracking with its stress",
		Long: `zones finds where strain localizes or correlation is lost, follows each zone from
frame to frame, and says when and where fracturing began, at what stress.

Elastic baseline: each point's strain is compared with its own elastic
response, fitted over the calibration frames (stress up to --calibrate-below
of the peak; without a load log, the first --calibrate-frames frames). What is
left — inelastic strain — does not light up the elastic stress concentration
at an opening's wall, so a zone means the rock did something the elastic
start of the test did not predict.

Indicators (--indicator): e1 (maximum principal inelastic strain: extension,
tensile cracks, slabs), e_eq (equivalent strain), gamma_max (maximum shear:
the arms of a notch, shear bands) and decorrelation (points measured in the
reference that are now lost or diverged, or match below --min-zncc: material
that spalled off or cracked open).

Threshold (--threshold): a point is in a zone when its indicator exceeds the
frame's median by K robust standard deviations (1.4826·MAD over the frame,
written "6mad") and by an absolute floor in microstrain ("500ue"); give one
or both, comma-separated. Zones are connected groups (8-neighbour) of at
least --min-cells grid points; a zone keeps its id from frame to frame while
it overlaps its predecessor.

Sectors: each zone is placed at the opening whose wall it is nearest to and
in a sector by its angle from that opening's centre relative to the load
axis (--load-angle, default vertical): crown (top, the side the load comes
from), invert (bottom), left-sidewall and right-sidewall (the springlines),
or pillar (the ligament between two openings); --crown-half-angle sets the
crown and invert widths, --reach how far from the wall (in radii) sectors
extend. Openings default to the shapes excluded at tracking.

Onset: for each opening, sector and class — localization, decorrelation
(spalling) and through-going (a zone linking two openings, or an opening and
a free edge) — the first frame of a zone that then lasts --persistence
frames in a row, with its time, nominal stress and percent of the peak, and
which indicator fired first.

Context: for the sidewall and crown of a circular opening, the elastic
(Kirsch) boundary stress (3 − K)·σv at the sidewall and (3K − 1)·σv at the
crown, and with --ucs its ratio to the UCS beside the published spalling-
initiation range of about 0.4 ± 0.1 UCS. An approximation for a single
circular opening in an elastic medium: a comparison, not a verdict.

Output: RUN/zones.csv
  frame,time_s,zone,sector,opening,area_mm2,peak,cx,cy,indicator,class,area_px2,orientation_deg,through
and RUN/onset.json (see README, "onset.json").

Compression tests of brittle specimens can fail violently; onset times are
measured events, not design values; support design belongs to licensed
engineers under local codes.`,
		Example: `  spallscope zones --strain run1 --load frame.csv --area 5000 --clock-offset 3.5 --ucs 55 --k 0.25
  spallscope zones --strain run1 --opening west=circle:400,512,120 --opening east=circle:1600,512,120 --threshold 6mad,800ue`,
		Args: cobra.NoArgs,
		RunE: func(cmd *cobra.Command, _ []string) error {
			if run == "" {
				return fmt.Errorf("--strain RUN is required (the run folder with strain/ and fields/)")
			}
			if out == "" {
				out = run
			}
			if out != run {
				return fmt.Errorf("--out must be the run folder of --strain (%s)", run)
			}
			if err := checkOptions(cmd.Flags(), t); err != nil {
				return err
			}
			rep, notes, err := job.Zones(t, run, "spallscope "+version)
			for _, n := range notes {
				fmt.Fprintln(cmd.ErrOrStderr(), "load log:", n)
			}
			if err != nil {
				return err
			}
			printOnsets(cmd, rep, filepath.Join(run, strainfile.OnsetJSON))
			return nil
		},
	}
	f := cmd.Flags()
	f.StringVar(&run, "strain", "", "run folder with strain/ (from strain) and fields/ (from track)")
	f.StringVar(&run, "fields", "", "the same run folder (alias of --strain)")
	f.StringVar(&out, "out", "", "run folder to write into (default and only choice: the --strain run folder)")
	bindOpenings(f, t)
	bindZones(f, &t.Zones)
	sectionFlags{f}.float(&t.Times.FPS, "fps", "times.fps", 0, "frame rate, when the run has no frame times")
	bindLoad(f, &t.Load)
	return cmd
}

// printOnsets prints the onset table: each onset (back-dated) with its
// interval and the trigger frame that confirmed it, then the detection
// limits.
func printOnsets(cmd *cobra.Command, rep *strainfile.OnsetReport, path string) {
	o := cmd.OutOrStdout()
	if len(rep.Onsets) == 0 {
		fmt.Fprintf(o, "no onset found (%s)\n", path)
	} else {
		w := tabwriter.NewWriter(o, 2, 4, 2, ' ', 0)
		fmt.Fprintln(w, "class\topening\tsector\tindicator\tonset\tinterval\ttrigger\ttime_s\tstress_MPa\tpct_of_peak\tarea_mm2\tboundary/UCS")
		for _, on := range rep.Onsets {
			ratio := "-"
			if on.Context != nil && on.Context.RatioToUCS != 0 {
				ratio = fmt.Sprintf("%.2f", on.Context.RatioToUCS)
			}
			interval, stress := intervalColumns(on.Onset)
			fmt.Fprintf(w, "%s\t%s\t%s\t%s\t%s\t%s\t%d\t%.1f\t%s\t%.0f\t%.1f\t%s\n", on.Class, on.OpeningName, on.Sector, on.Indicator,
				on.Name, interval, on.TriggerFrame, on.Time, stress, on.Percent, on.AreaMM2, ratio)
		}
		w.Flush()
		fmt.Fprintf(o, "peak %.2f MPa at %.1f s (%s); onsets in %s\n", rep.Peak.Stress, rep.Peak.Time, rep.Peak.Frame, path)
	}
	for _, l := range rep.DetectionLimits {
		opening := fmt.Sprintf("%.3f px", l.OpeningPx)
		if l.OpeningMM > 0 {
			opening = fmt.Sprintf("%.1f µm (%.3f px)", 1000*l.OpeningMM, l.OpeningPx)
		}
		fmt.Fprintf(o, "detection limit (%s): a localized strain below %.0f µε over the %d px VSG, or a crack opening below %s, cannot be seen in this run\n",
			l.Indicator, l.Strain*1e6, l.VSG, opening)
	}
}

// intervalColumns are an onset's interval and stress columns in the
// printed onset tables: the interval's frames with its confidence, and the
// stress with the interval's stresses ("-" and the stress alone without
// an interval).
func intervalColumns(on strain.Onset) (interval, stress string) {
	iv := on.Interval
	if iv == nil {
		return "-", fmt.Sprintf("%.2f", on.Stress)
	}
	return fmt.Sprintf("%d–%d (%.0f %%)", iv.FirstFrame, iv.LastFrame, 100*iv.Confidence),
		fmt.Sprintf("%.2f (%.2f–%.2f)", on.Stress, iv.StressLo, iv.StressHi)
}
