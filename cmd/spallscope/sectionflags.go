package main

import (
	"errors"
	"fmt"
	"os"
	"strconv"
	"strings"

	"github.com/spf13/pflag"

	"spallscope/cmd/spallscope/internal/config"
	"spallscope/cmd/spallscope/internal/stage"
	"spallscope/dic"
	"spallscope/dic/loadlog"
	"spallscope/dic/region"
)

// The command-line options of track, strain and zones fill the same
// config sections a test config's YAML fills (package config); each
// section turns itself into its stage's settings. A flag carries the YAML
// key it sets as an annotation, so a test can check that every option is
// settable both ways.

// yamlKeyAnnotation names the flag annotation that holds the YAML key
// (dotted: "correlation.subset") a flag sets.
const yamlKeyAnnotation = "yaml-key"

// zeroDefaultAnnotation marks numeric flags whose zero value means "the
// default": typed on the command line, 0 is refused rather than silently
// taken as the default.
const zeroDefaultAnnotation = "zero-means-default"

// sectionFlags binds flags to config fields, recording the YAML key of each.
type sectionFlags struct{ fs *pflag.FlagSet }

func (b sectionFlags) key(name, key string, zeroDefault bool) {
	b.fs.SetAnnotation(name, yamlKeyAnnotation, []string{key})
	if zeroDefault {
		b.fs.SetAnnotation(name, zeroDefaultAnnotation, []string{"true"})
	}
}

func (b sectionFlags) str(p *string, name, key, def, usage string) {
	b.fs.StringVar(p, name, def, usage)
	b.key(name, key, false)
}

func (b sectionFlags) int(p *int, name, key string, def int, usage string) {
	b.fs.IntVar(p, name, def, usage)
	b.key(name, key, true)
}

func (b sectionFlags) float(p *float64, name, key string, def float64, usage string) {
	b.fs.Float64Var(p, name, def, usage)
	b.key(name, key, true)
}

// plainInt binds an int whose zero is a value of its own.
func (b sectionFlags) plainInt(p *int, name, key string, usage string) {
	b.fs.IntVar(p, name, 0, usage)
	b.key(name, key, false)
}

// plainFloat binds a float whose zero is a value of its own (an offset).
func (b sectionFlags) plainFloat(p *float64, name, key string, usage string) {
	b.fs.Float64Var(p, name, 0, usage)
	b.key(name, key, false)
}

func (b sectionFlags) bool(p *bool, name, key string, usage string) {
	b.fs.BoolVar(p, name, false, usage)
	b.key(name, key, false)
}

func (b sectionFlags) value(v pflag.Value, name, key, usage string) {
	b.fs.Var(v, name, usage)
	b.key(name, key, false)
}

// bindInputs binds the options that say what is tracked: photos,
// reference, region, exclusions, mask, frame times and scale.
func bindInputs(fs *pflag.FlagSet, t *config.Test) {
	b := sectionFlags{fs}
	b.str(&t.Images, "images", "images", "", "frames: a folder, a quoted glob, a list file or a video")
	b.str(&t.Reference, "ref", "reference", "", "reference image file, or a frame index of --images (default: the first frame)")
	b.str(&t.ROI, "roi", "roi", "", "region of interest x0,y0,x1,y1 in px, or a shape such as polygon:x1,y1,... (default: whole image)")
	b.str(&t.Mask, "mask", "mask", "", "mask image the size of the reference: nonzero pixels are measured")
	b.value(&listValue[string]{dst: &t.Exclude, typ: "shape", parse: func(s string) (string, error) { return s, nil }},
		"exclude", "exclude", "exclude a shape, repeatable: circle:cx,cy,r  ellipse:cx,cy,rx,ry[,deg]  polygon:x1,y1,...  rect:x0,y0,x1,y1")
	b.str(&t.Lens, "lens", "lens", "", "lens file from 'spallscope calibrate': take the lens distortion out of the fields (fields then in undistorted px)")
	b.str(&t.CompensationPlate, "compensation-plate", "compensation_plate", "", "a rigid, unloaded plate in view beside the specimen, as a shape (rect:x0,y0,x1,y1, ...): its apparent magnification (out-of-plane motion) is taken out of every frame")
	b.float(&t.StandoffMM, "standoff", "standoff_mm", 0, "distance from the face to the lens in mm: reports the face's motion towards the camera from its magnification")
	bindTimes(fs, &t.Times)
	bindScale(fs, &t.Scale)
}

// bindTimes binds the frame-time options.
func bindTimes(fs *pflag.FlagSet, t *config.Times) {
	b := sectionFlags{fs}
	b.str(&t.CSV, "times", "times.csv", "", "frame times: CSV with columns frame,time_s")
	b.float(&t.FPS, "fps", "times.fps", 0, "frame times: fixed rate in frames per second (default for video: its stated rate)")
	b.bool(&t.MTime, "mtime", "times.mtime", "frame times: file modification times")
	b.bool(&t.EXIF, "exif", "times.exif", "frame times: the photos' EXIF capture times (DateTimeOriginal, SubSecTimeOriginal, OffsetTimeOriginal)")
}

// bindScale binds the image-scale options.
func bindScale(fs *pflag.FlagSet, s *config.Scale) {
	b := sectionFlags{fs}
	b.float(&s.MMPerPx, "scale", "scale.mm_per_px", 0, "image scale in mm per px")
	b.value(&numbersValue{dst: &s.Line, n: 5, form: "X1,Y1,X2,Y2,MM"}, "scale-line", "scale.line",
		"image scale from a known distance: x1,y1,x2,y2,MM (two reference points in px and their distance in mm)")
}

// bindCorrelation binds the tracking options to the correlation section.
func bindCorrelation(fs *pflag.FlagSet, c *config.Correlation) {
	d := dic.DefaultSettings()
	b := sectionFlags{fs}
	b.int(&c.Subset, "subset", "correlation.subset", d.Subset, "subset size in px (odd, ≥ 7)")
	b.int(&c.Step, "step", "correlation.step", d.Step, "grid step in px")
	b.str(&c.Order, "order", "correlation.order", "affine", "shape function: affine (1) or quadratic (2)")
	b.str(&c.Interpolation, "interp", "correlation.interpolation", "cubic", "B-spline interpolation: cubic or quintic")
	b.str(&c.Reference, "reference", "correlation.reference", string(d.Reference), "reference strategy: fixed or incremental")
	b.float(&c.UpdateBelow, "update-below", "correlation.update_below", d.UpdateBelow, "incremental: move the reference when the median ZNCC falls below this")
	b.float(&c.MinZNCC, "min-zncc", "correlation.min_zncc", d.MinZNCC, "lowest ZNCC of a measured point")
	b.float(&c.ResidualFactor, "residual-factor", "correlation.residual_factor", d.ResidualFactor, "flag points whose ZNSSD exceeds this many times the frame median (negative: off)")
	b.int(&c.SearchRadius, "search-radius", "correlation.search_radius", d.SearchRadius, "integer search radius of seed points in px (largest jump between frames)")
	b.int(&c.EdgeGuard, "edge-guard", "correlation.edge_guard", d.EdgeGuard, "px along the rim of exclusions left out of subsets (negative: none)")
	b.float(&c.MinValid, "min-valid", "correlation.min_valid", d.MinValidFraction, "smallest measured fraction of a subset's pixels")
	b.value(&listValue[[]int]{dst: &c.Seeds, typ: "x,y", parse: parseSeed}, "seed", "correlation.seeds", "seed point x,y in px, repeatable (automatic seeds cover the rest)")
	b.plainInt(&c.Workers, "workers", "correlation.workers", "goroutines (default: all cores); results do not depend on it")
}

// bindStrain binds the strain options to the strain section.
func bindStrain(fs *pflag.FlagSet, s *config.Strain) {
	b := sectionFlags{fs}
	b.int(&s.Window, "window", "strain.window", 9, "strain window in grid points per side (odd, ≥ 3)")
	b.int(&s.Order, "order", "strain.order", 1, "fit over the window: 1 plane, 2 quadratic")
	b.int(&s.MinPoints, "min-points", "strain.min_points", 0, "fewest valid points in a window (default: half of it)")
	b.str(&s.Measure, "measure", "strain.measure", "engineering", "strain measure: engineering, green or hencky")
	b.int(&s.StaticFrames, "static", "strain.static_frames", 0, "the first K frames are static shots for the noise floor")
}

// bindZones binds the zone and onset options to the zones section.
func bindZones(fs *pflag.FlagSet, z *config.Zones) {
	b := sectionFlags{fs}
	z.Indicators = []string{"e1", "gamma_max", "decorrelation"}
	b.value(&commaListValue{dst: &z.Indicators}, "indicator", "zones.indicators", "indicators, comma-separated: e1, e_eq, gamma_max, decorrelation")
	b.str(&z.Threshold, "threshold", "zones.threshold", "6mad", `zone threshold: "Kmad" (robust deviations above the frame median) and/or "Nue" (absolute microstrain)`)
	b.int(&z.MinCells, "min-cells", "zones.min_cells", 4, "smallest zone in grid points")
	b.float(&z.MinZNCC, "min-zncc", "zones.min_zncc", 0.9, "decorrelation: ZNCC below which a point counts as decorrelated")
	b.int(&z.Persistence, "persistence", "zones.persistence", 3, "frames a zone must last to count as an onset")
	b.float(&z.CalibrateBelow, "calibrate-below", "zones.calibrate_below", 0.2, "fraction of the peak stress up to which frames calibrate the elastic baseline")
	b.int(&z.CalibrateFrames, "calibrate-frames", "zones.calibrate_frames", 3, "without a load log: the first N frames calibrate")
	b.plainFloat(&z.K, "k", "zones.k", "lateral to vertical far-field stress ratio, for the Kirsch context")
	b.plainFloat(&z.UCS, "ucs", "zones.ucs_mpa", "uniaxial compressive strength in MPa, for the context")
	b.float(&z.LoadAngleDeg, "load-angle", "zones.load_angle_deg", 90, "direction of the load axis in degrees from +x towards +y (90: vertical)")
	b.float(&z.CrownHalfAngle, "crown-half-angle", "zones.crown_half_angle_deg", 45, "half-width of the crown and invert sectors in degrees")
	b.float(&z.Reach, "reach", "zones.reach", 1, "how far sectors extend from an opening's wall, in equivalent radii")
}

// bindOpenings binds the openings (NAME=SHAPE, repeatable, or a file of
// them) to the test's openings.
func bindOpenings(fs *pflag.FlagSet, t *config.Test) {
	b := sectionFlags{fs}
	b.value(&listValue[config.Opening]{dst: &t.Openings, typ: "name=shape", parse: func(s string) (config.Opening, error) {
		return parseOpening(s, len(t.Openings))
	}}, "opening", "openings", "opening NAME=SHAPE (e.g. A=circle:256,256,60), repeatable")
	b.value(&openingsFileValue{dst: &t.Openings}, "openings", "openings", "file of openings, one NAME=SHAPE per line")
}

// bindLoad binds the load-log options to the load section.
func bindLoad(fs *pflag.FlagSet, l *config.Load) {
	b := sectionFlags{fs}
	b.str(&l.File, "load", "load.file", "", "load log of the test frame (CSV or whitespace-delimited text)")
	b.float(&l.AreaMM2, "area", "load.area_mm2", 0, "loaded area in mm² (nominal stress = force / area)")
	b.str(&l.TimeColumn, "time-col", "load.time_column", "", "load log: time column, by header name or 1-based index (default: first time-like column)")
	b.str(&l.ForceColumn, "force-col", "load.force_column", "", "load log: force column, by name or index")
	b.str(&l.StrokeColumn, "stroke-col", "load.stroke_column", "", "load log: stroke column, by name or index (optional)")
	b.str(&l.TimeUnit, "time-unit", "load.time_unit", "", "load log: time unit s, ms, min, h or hms (h:mm:ss)")
	b.str(&l.ForceUnit, "force-unit", "load.force_unit", "", "load log: force unit N, kN, lbf or kip")
	b.str(&l.StrokeUnit, "stroke-unit", "load.stroke_unit", "", "load log: stroke unit mm or in")
	b.value(&delimiterValue{dst: &l.Delimiter}, "delimiter", "load.delimiter", `load log: cell delimiter ",", ";", "tab" or "whitespace" (default: detected)`)
	b.plainInt(&l.SkipLines, "skip-lines", "load.skip_lines", "load log: lines to skip at the top, whatever they hold")
	b.str(&l.Comment, "comment", "load.comment", "", `load log: comment marker (default "#")`)
	b.bool(&l.CompressionNegative, "compression-negative", "load.compression_negative", "load log: compressive forces are logged negative")
	b.plainFloat(&l.ClockOffset, "clock-offset", "load.clock_offset_s", "load log clock minus camera clock, s")
	b.value(&numbersValue{dst: &l.Sync, n: 2, form: "CAMERA_S,LOG_S"}, "sync", "load.sync", "clock sync pair CAMERA_S,LOG_S: this camera time is this log time")
}

// refuseTypedZeros reports a numeric option typed as 0 whose zero means
// "the default": on the command line that is a slip, not a choice.
func refuseTypedZeros(fs *pflag.FlagSet) error {
	var err error
	fs.Visit(func(f *pflag.Flag) {
		if err != nil || f.Annotations[zeroDefaultAnnotation] == nil {
			return
		}
		if v, perr := strconv.ParseFloat(f.Value.String(), 64); perr == nil && v == 0 {
			def := f.DefValue
			if def == "0" {
				def = "as --help says"
			}
			err = fmt.Errorf("--%s 0: 0 is not a setting here; leave the option out for its default (%s)", f.Name, def)
		}
	})
	return err
}

// listValue is a repeatable flag: every use appends one parsed item.
type listValue[T any] struct {
	dst   *[]T
	typ   string
	parse func(string) (T, error)
}

func (v *listValue[T]) Set(s string) error {
	x, err := v.parse(s)
	if err != nil {
		return err
	}
	*v.dst = append(*v.dst, x)
	return nil
}

func (v *listValue[T]) String() string { return "" }
func (v *listValue[T]) Type() string   { return v.typ }

// commaListValue is a comma-separated list that replaces its default.
type commaListValue struct {
	dst *[]string
	set bool
}

func (v *commaListValue) Set(s string) error {
	if !v.set {
		*v.dst, v.set = nil, true
	}
	for _, part := range strings.Split(s, ",") {
		if part = strings.TrimSpace(part); part != "" {
			*v.dst = append(*v.dst, part)
		}
	}
	return nil
}

func (v *commaListValue) String() string { return strings.Join(*v.dst, ",") }
func (v *commaListValue) Type() string   { return "list" }

// numbersValue is a fixed count of comma-separated numbers.
type numbersValue struct {
	dst  *[]float64
	n    int
	form string
}

func (v *numbersValue) Set(s string) error {
	parts := strings.Split(s, ",")
	if len(parts) != v.n {
		return fmt.Errorf("%q, expected %s", s, v.form)
	}
	out := make([]float64, v.n)
	for i, p := range parts {
		x, err := strconv.ParseFloat(strings.TrimSpace(p), 64)
		if err != nil {
			return fmt.Errorf("%q: %q is not a number (expected %s)", s, p, v.form)
		}
		out[i] = x
	}
	*v.dst = out
	return nil
}

func (v *numbersValue) String() string { return "" }
func (v *numbersValue) Type() string   { return "numbers" }

// delimiterValue is a load log's cell delimiter, written as in the YAML.
type delimiterValue struct{ dst *loadlog.Delimiter }

func (v *delimiterValue) Set(s string) error { return v.dst.UnmarshalText([]byte(s)) }
func (v *delimiterValue) String() string     { return "" }
func (v *delimiterValue) Type() string       { return "delimiter" }

// openingsFileValue reads a file of openings, one NAME=SHAPE per line
// (blank lines and # comments skipped).
type openingsFileValue struct{ dst *[]config.Opening }

func (v *openingsFileValue) Set(path string) error {
	data, err := os.ReadFile(path)
	if err != nil {
		return err
	}
	for n, l := range strings.Split(string(data), "\n") {
		if l = strings.TrimSpace(l); l == "" || strings.HasPrefix(l, "#") {
			continue
		}
		o, err := parseOpening(l, len(*v.dst))
		if err != nil {
			return fmt.Errorf("%s line %d: %w", path, n+1, err)
		}
		*v.dst = append(*v.dst, o)
	}
	return nil
}

func (v *openingsFileValue) String() string { return "" }
func (v *openingsFileValue) Type() string   { return "file" }

// parseOpening reads "NAME=SHAPE" or "SHAPE" (the i-th opening, named A,
// B, ... by position).
func parseOpening(s string, i int) (config.Opening, error) {
	o := config.Opening{Name: stage.DefaultOpeningName(i), Shape: s}
	if n, rest, ok := strings.Cut(s, "="); ok {
		o.Name, o.Shape = strings.TrimSpace(n), rest
	}
	if _, err := region.ParseShape(o.Shape); err != nil {
		return o, fmt.Errorf("opening %q: %w", o.Name, err)
	}
	return o, nil
}

// parseSeed reads a seed point "x,y" in whole px: a fraction is refused,
// not cut off (it was, to the pixel left of it).
func parseSeed(s string) ([]int, error) {
	a, b, ok := strings.Cut(s, ",")
	x, err1 := strconv.Atoi(strings.TrimSpace(a))
	y, err2 := strconv.Atoi(strings.TrimSpace(b))
	if !ok || err1 != nil || err2 != nil {
		return nil, fmt.Errorf("--seed %q, expected X,Y in whole px such as 256,120", s)
	}
	return []int{x, y}, nil
}

// asFlagError restates config field errors under the names of the
// options that set the fields, when options do: "--order 3: expected
// ...", "--area: required with --load, expected ...". Each of several
// problems (config.Problems) is restated on its own.
func asFlagError(fs *pflag.FlagSet, err error) error {
	if ps, ok := err.(config.Problems); ok {
		out := make(config.Problems, len(ps))
		for i, e := range ps {
			out[i] = asFlagError(fs, e)
		}
		return out
	}
	var fe *config.FieldError
	if !errors.As(err, &fe) {
		return err
	}
	name, with := flagFor(fs, fe.Key), flagFor(fs, fe.With)
	switch {
	case fe.With != "" && name != "":
		if with == "" {
			with = fe.With
		} else {
			with = "--" + with
		}
		return fmt.Errorf("--%s: required with %s, expected %s", name, with, fe.Expected)
	case name != "":
		return fmt.Errorf("--%s %s: expected %s", name, fe.ShownValue(), fe.Expected)
	}
	return err
}

// flagFor names the option that sets a YAML key ("" when none does).
func flagFor(fs *pflag.FlagSet, key string) string {
	var name string
	fs.VisitAll(func(f *pflag.Flag) {
		if k := f.Annotations[yamlKeyAnnotation]; name == "" && len(k) == 1 && k[0] == key {
			name = f.Name
		}
	})
	return name
}

// checkOptions checks the settings the options filled, before any work,
// reporting each under its option's name.
func checkOptions(fs *pflag.FlagSet, t *config.Test) error {
	if err := refuseTypedZeros(fs); err != nil {
		return err
	}
	return asFlagError(fs, t.CheckSettings())
}
