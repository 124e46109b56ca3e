package main

import (
	"fmt"
	"os"
	"path/filepath"
	"strings"
	"text/tabwriter"

	"github.com/spf13/cobra"

	"spallscope/cmd/spallscope/internal/config"
	"spallscope/cmd/spallscope/internal/job"
	"spallscope/cmd/spallscope/internal/stage"
	"spallscope/dic/frames"
	"spallscope/dic/loadlog"
	"spallscope/dic/region"
	"spallscope/dic/runfolder"
	"spallscope/strain"
	"spallscope/strain/strainfile"
)

// loadFlags read a test frame's load log.
type loadFlags struct {
	path, sync   string
	area, offset float64
	format       loadlog.Format
}

func (l *loadFlags) register(cmd *cobra.Command) {
	f := cmd.Flags()
	f.StringVar(&l.path, "load", "", "load log of the test frame (CSV or whitespace-delimited text)")
	f.Float64Var(&l.area, "area", 0, "loaded area in mm² (nominal stress = force / area)")
	f.StringVar(&l.format.TimeColumn, "time-col", "", "load log: time column, by header name or 1-based index (default: first time-like column)")
	f.StringVar(&l.format.ForceColumn, "force-col", "", "load log: force column, by name or index")
	f.StringVar(&l.format.TimeUnit, "time-unit", "", "load log: time unit s, ms, min, h or hms (h:mm:ss)")
	f.StringVar(&l.format.ForceUnit, "force-unit", "", "load log: force unit N, kN, lbf or kip")
	f.BoolVar(&l.format.CompressionNegative, "compression-negative", false, "load log: compressive forces are logged negative")
	f.Float64Var(&l.offset, "clock-offset", 0, "load log clock minus camera clock, s")
	f.StringVar(&l.sync, "sync", "", "clock sync pair CAMERA_S,LOG_S: this camera time is this log time")
}

// stress returns the nominal stress of the log, or nil without --load.
func (l *loadFlags) stress() (*loadlog.Stress, error) {
	if l.path == "" {
		if l.area != 0 || l.sync != "" || l.offset != 0 {
			return nil, fmt.Errorf("--area, --sync and --clock-offset need --load")
		}
		return nil, nil
	}
	cfg := config.Load{AreaMM2: l.area, TimeColumn: l.format.TimeColumn, ForceColumn: l.format.ForceColumn,
		TimeUnit: l.format.TimeUnit, ForceUnit: l.format.ForceUnit, CompressionNegative: l.format.CompressionNegative,
		ClockOffset: l.offset}
	if l.sync != "" {
		p, err := parsePoint("--sync", l.sync)
		if err != nil {
			return nil, err
		}
		cfg.Sync = p[:]
	}
	return job.Stress(cfg, l.path)
}

func newZonesCmd() *cobra.Command {
	var (
		run, out, indicators, threshold, openingsFile string
		openings                                      []string
		fps                                           float64
		st                                            stage.ZoneStage
		lf                                            loadFlags
	)
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
			if _, err := os.Stat(run); err != nil {
				return fmt.Errorf("--strain: %w", err)
			}
			var err error
			if st.Finder.Indicators, err = strain.ParseIndicators(indicators); err != nil {
				return err
			}
			if err := job.Threshold(threshold, &st.Finder.Thresholds); err != nil {
				return err
			}
			specs := openings
			if openingsFile != "" {
				lines, err := readLines(openingsFile)
				if err != nil {
					return err
				}
				specs = append(specs, lines...)
			}
			var tr runfolder.TrackRecord
			haveTrack := runfolder.Section(run, "track", &tr) == nil
			if len(specs) == 0 && haveTrack {
				specs = tr.Exclude
			}
			for i, s := range specs {
				name, shape, err := parseNamedShape(s, i)
				if err != nil {
					return err
				}
				st.OpeningNames = append(st.OpeningNames, name)
				st.Finder.Sectors.Openings = append(st.Finder.Sectors.Openings, strain.Opening{Name: name, Shape: shape})
			}
			if haveTrack {
				st.Finder.SubsetHalf = tr.Settings.Subset / 2
			}
			st.Finder.Scale = strainfile.Scale(run)
			names, err := runfolder.Frames(run)
			if err != nil {
				return err
			}
			times := tr.Times
			if fps > 0 {
				times, _ = frames.FixedRate(len(names), fps, 0)
			}
			if len(times) != len(names) {
				return fmt.Errorf("frame times of %s are unknown: give --fps here, or track with --fps, --times or --mtime", run)
			}
			sigma, err := lf.stress()
			if err != nil {
				return err
			}
			if sigma != nil {
				for _, n := range sigma.Log.Notes {
					fmt.Fprintln(cmd.ErrOrStderr(), "load log:", n)
				}
				if err := runfolder.RecordLoad(run, sigma); err != nil {
					return err
				}
			}
			states := stage.FrameStates(names, times, sigma)
			rep, err := stage.Zones(run, st, states, "spallscope "+version)
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
	f.StringArrayVar(&openings, "opening", nil, "opening NAME=SHAPE (e.g. A=circle:256,256,60), repeatable")
	f.StringVar(&openingsFile, "openings", "", "file of openings, one NAME=SHAPE per line")
	f.StringVar(&indicators, "indicator", "e1,gamma_max,decorrelation", "indicators, comma-separated: e1, e_eq, gamma_max, decorrelation")
	f.StringVar(&threshold, "threshold", "6mad", `zone threshold: "Kmad" (robust deviations above the frame median) and/or "Nue" (absolute microstrain)`)
	f.IntVar(&st.Finder.Thresholds.MinCells, "min-cells", 4, "smallest zone in grid points")
	f.Float64Var(&st.Finder.Thresholds.MinZNCC, "min-zncc", 0.9, "decorrelation: ZNCC below which a point counts as decorrelated")
	f.IntVar(&st.Finder.Persistence, "persistence", 3, "frames a zone must last to count as an onset")
	f.Float64Var(&st.CalibrateBelow, "calibrate-below", 0.2, "fraction of the peak stress up to which frames calibrate the elastic baseline")
	f.IntVar(&st.CalibrateFrames, "calibrate-frames", 3, "without a load log: the first N frames calibrate")
	f.Float64Var(&st.K, "k", 0, "lateral to vertical far-field stress ratio, for the Kirsch context")
	f.Float64Var(&st.UCS, "ucs", 0, "uniaxial compressive strength in MPa, for the context")
	f.Float64Var(&st.Finder.Sectors.LoadAngleDeg, "load-angle", 90, "direction of the load axis in degrees from +x towards +y (90: vertical)")
	f.Float64Var(&st.Finder.Sectors.CrownHalfAngle, "crown-half-angle", 45, "half-width of the crown and invert sectors in degrees")
	f.Float64Var(&st.Finder.Sectors.Reach, "reach", 1, "how far sectors extend from an opening's wall, in equivalent radii")
	f.Float64Var(&fps, "fps", 0, "frame rate, when the run has no frame times")
	lf.register(cmd)
	return cmd
}

// printOnsets prints the onset table.
func printOnsets(cmd *cobra.Command, rep *strainfile.OnsetReport, path string) {
	o := cmd.OutOrStdout()
	if len(rep.Onsets) == 0 {
		fmt.Fprintf(o, "no onset found (%s)\n", path)
		return
	}
	w := tabwriter.NewWriter(o, 2, 4, 2, ' ', 0)
	fmt.Fprintln(w, "class\topening\tsector\tindicator\tframe\ttime_s\tstress_MPa\tpct_of_peak\tarea_mm2\tboundary/UCS")
	for _, on := range rep.Onsets {
		ratio := "-"
		if on.Context != nil && on.Context.RatioToUCS != 0 {
			ratio = fmt.Sprintf("%.2f", on.Context.RatioToUCS)
		}
		fmt.Fprintf(w, "%s\t%s\t%s\t%s\t%s\t%.1f\t%.2f\t%.0f\t%.1f\t%s\n", on.Class, on.OpeningName, on.Sector, on.Indicator,
			on.Name, on.Time, on.Stress, on.Percent, on.AreaMM2, ratio)
	}
	w.Flush()
	fmt.Fprintf(o, "peak %.2f MPa at %.1f s (%s); onsets in %s\n", rep.Peak.Stress, rep.Peak.Time, rep.Peak.Frame, path)
}

// parseNamedShape reads "NAME=SHAPE" or "SHAPE" (named A, B, ... by position).
func parseNamedShape(s string, i int) (string, region.Shape, error) {
	name := string(rune('A' + i%26))
	if n, rest, ok := strings.Cut(s, "="); ok {
		name, s = strings.TrimSpace(n), rest
	}
	shape, err := region.ParseShape(s)
	if err != nil {
		return "", nil, fmt.Errorf("opening %q: %w", name, err)
	}
	return name, shape, nil
}

// readLines returns the non-blank, non-comment lines of a file.
func readLines(path string) ([]string, error) {
	data, err := os.ReadFile(path)
	if err != nil {
		return nil, err
	}
	var out []string
	for _, l := range strings.Split(string(data), "\n") {
		if l = strings.TrimSpace(l); l != "" && !strings.HasPrefix(l, "#") {
			out = append(out, l)
		}
	}
	return out, nil
}
