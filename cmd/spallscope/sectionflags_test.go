package main

import (
	"fmt"
	"os"
	"path/filepath"
	"reflect"
	"strings"
	"testing"

	"github.com/goccy/go-yaml"
	"github.com/spf13/cobra"
	"github.com/spf13/pflag"

	"spallscope/cmd/spallscope/internal/config"
	"spallscope/strain"
)

// optionSamples gives, for every YAML key a stage command can set, a value
// as typed on the command line and the same value as written in YAML.
var optionSamples = map[string][2]string{
	"images":    {"photos", "photos"},
	"reference": {"3", `"3"`},
	"roi":       {"rect:0,0,50,50", `"rect:0,0,50,50"`},
	"mask":      {"mask.png", "mask.png"},
	"lens":      {"lens.json", "lens.json"},

	"compensation_plate": {"rect:60,0,90,40", `"rect:60,0,90,40"`},
	"standoff_mm":        {"450", "450"},
	"exclude":            {"circle:9,9,4", `["circle:9,9,4"]`},
	"openings":           {"W=circle:9,9,4", `[{name: W, shape: "circle:9,9,4"}]`},

	"times.csv":       {"times.csv", "times.csv"},
	"times.fps":       {"2.5", "2.5"},
	"times.mtime":     {"true", "true"},
	"times.exif":      {"true", "true"},
	"scale.mm_per_px": {"0.05", "0.05"},
	"scale.line":      {"0,0,100,0,5", "[0, 0, 100, 0, 5]"},

	"correlation.subset":          {"31", "31"},
	"correlation.step":            {"5", "5"},
	"correlation.order":           {"quadratic", "quadratic"},
	"correlation.interpolation":   {"quintic", "quintic"},
	"correlation.reference":       {"incremental", "incremental"},
	"correlation.update_below":    {"0.85", "0.85"},
	"correlation.min_zncc":        {"0.7", "0.7"},
	"correlation.residual_factor": {"5", "5"},
	"correlation.search_radius":   {"20", "20"},
	"correlation.edge_guard":      {"3", "3"},
	"correlation.min_valid":       {"0.6", "0.6"},
	"correlation.seeds":           {"10,20", "[[10, 20]]"},
	"correlation.workers":         {"2", "2"},

	"strain.window":        {"11", "11"},
	"strain.order":         {"2", "2"},
	"strain.min_points":    {"30", "30"},
	"strain.measure":       {"green", "green"},
	"strain.static_frames": {"2", "2"},

	"zones.indicators":           {"e1,e_eq", "[e1, e_eq]"},
	"zones.threshold":            {"5mad,400ue", `"5mad,400ue"`},
	"zones.min_cells":            {"6", "6"},
	"zones.min_zncc":             {"0.8", "0.8"},
	"zones.persistence":          {"2", "2"},
	"zones.calibrate_below":      {"0.3", "0.3"},
	"zones.calibrate_frames":     {"4", "4"},
	"zones.k":                    {"0.5", "0.5"},
	"zones.ucs_mpa":              {"60", "60"},
	"zones.load_angle_deg":       {"80", "80"},
	"zones.crown_half_angle_deg": {"30", "30"},
	"zones.reach":                {"2", "2"},

	"load.file":                 {"frame.csv", "frame.csv"},
	"load.area_mm2":             {"5000", "5000"},
	"load.time_column":          {"t", "t"},
	"load.force_column":         {"f", "f"},
	"load.stroke_column":        {"s", "s"},
	"load.time_unit":            {"ms", "ms"},
	"load.force_unit":           {"N", "N"},
	"load.stroke_unit":          {"in", "in"},
	"load.delimiter":            {";", `";"`},
	"load.skip_lines":           {"2", "2"},
	"load.comment":              {"%", `"%"`},
	"load.compression_negative": {"true", "true"},
	"load.clock_offset_s":       {"1.5", "1.5"},
	"load.sync":                 {"1,2", "[1, 2]"},
}

// stageCommands builds the commands whose options fill config sections.
var stageCommands = map[string]func(*config.Test) *cobra.Command{
	"track": trackCommand, "strain": strainCommand, "zones": zonesCommand,
}

// Options that are not config settings: the run folder, and the subset
// size strain takes for the VSG when the run has no track record.
var runFolderOptions = map[string]bool{"out": true, "fields": true, "strain": true, "subset@strain": true, "help": true}

// The YAML keys of the sections the stage commands configure; every one
// must be settable from the command line.
var cliSections = []string{"correlation", "strain", "zones", "load", "times", "scale"}
var cliTopKeys = []string{"images", "reference", "roi", "mask", "lens", "compensation_plate", "standoff_mm", "exclude", "openings"}

// Every option of track, strain and zones sets a YAML key, every YAML key
// of their sections has an option, and an option and its key give the same
// stage settings, defaults included.
func TestEveryOptionIsAConfigKey(t *testing.T) {
	covered := map[string]bool{}
	for name, build := range stageCommands {
		build(&config.Test{}).Flags().VisitAll(func(f *pflag.Flag) {
			key := f.Annotations[yamlKeyAnnotation]
			if runFolderOptions[f.Name] || runFolderOptions[f.Name+"@"+name] {
				return
			}
			if len(key) != 1 {
				t.Errorf("%s --%s sets no config key", name, f.Name)
				return
			}
			covered[key[0]] = true
			sample, ok := optionSamples[key[0]]
			if !ok {
				t.Errorf("%s --%s sets %s, which has no sample value in this test", name, f.Name, key[0])
				return
			}
			checkOptionMatchesKey(t, name, build, f.Name, key[0], sample)
		})
	}
	want := append([]string{}, cliTopKeys...)
	for _, sec := range cliSections {
		for _, k := range config.Keys(sectionType(sec)) {
			want = append(want, sec+"."+k.Name)
		}
	}
	for _, k := range want {
		if !covered[k] {
			t.Errorf("config key %s has no command-line option in track, strain or zones", k)
		}
	}
}

// checkOptionMatchesKey sets one option on the command line and its key in
// YAML and compares what the stage would be given.
func checkOptionMatchesKey(t *testing.T, cmdName string, build func(*config.Test) *cobra.Command, flag, key string, sample [2]string) {
	t.Helper()
	cli := &config.Test{}
	cmd := build(cli)
	value := sample[0]
	if flag == "openings" { // a file of openings
		value = filepath.Join(t.TempDir(), "openings.txt")
		if err := os.WriteFile(value, []byte("# openings\n"+sample[0]+"\n"), 0o644); err != nil {
			t.Fatal(err)
		}
	}
	if err := cmd.Flags().Parse([]string{"--" + flag, value}); err != nil {
		t.Errorf("%s --%s %s: %v", cmdName, flag, sample[0], err)
		return
	}
	defaults := &config.Test{}
	build(defaults)
	fromYAML := &config.Test{}
	if err := yaml.UnmarshalWithOptions([]byte(yamlFor(key, sample[1])), fromYAML, yaml.DisallowUnknownField()); err != nil {
		t.Errorf("%s: YAML %q: %v", key, yamlFor(key, sample[1]), err)
		return
	}
	sec, _, nested := strings.Cut(key, ".")
	if !nested {
		sec = ""
	}
	got, err1 := stageSettings(cli, sec, key)
	want, err2 := stageSettings(fromYAML, sec, key)
	def, _ := stageSettings(defaults, sec, key)
	if err1 != nil || err2 != nil {
		t.Errorf("%s --%s %s / YAML %s: %v / %v", cmdName, flag, sample[0], key, err1, err2)
		return
	}
	if !reflect.DeepEqual(got, want) {
		t.Errorf("%s --%s %s gives %+v; YAML %s: %s gives %+v", cmdName, flag, sample[0], got, key, sample[1], want)
	}
	if reflect.DeepEqual(got, def) {
		t.Errorf("%s --%s %s changes nothing (still %+v)", cmdName, flag, sample[0], def)
	}
}

// yamlFor writes a one-key YAML document.
func yamlFor(key, value string) string {
	if sec, k, ok := strings.Cut(key, "."); ok {
		return fmt.Sprintf("%s:\n  %s: %s\n", sec, k, value)
	}
	return fmt.Sprintf("%s: %s\n", key, value)
}

// stageSettings is what a stage gets from a section: the converted
// settings where the section converts itself, the section's value of the
// key otherwise.
func stageSettings(c *config.Test, sec, key string) (any, error) {
	switch sec {
	case "correlation":
		return c.Correlation.Settings()
	case "strain":
		w, err := c.Strain.StrainWindow()
		return struct {
			strain.Window
			Static int
		}{w, c.Strain.StaticFrames}, err
	case "zones":
		return c.Zones.Stage(nil)
	case "":
		return fieldByKey(reflect.ValueOf(*c), key), nil
	}
	_, k, _ := strings.Cut(key, ".")
	return fieldByKey(reflect.ValueOf(c).Elem().FieldByName(sectionField(sec)), k), nil
}

// fieldByKey returns the value of the field with the given yaml key
// (inline structs searched).
func fieldByKey(v reflect.Value, key string) any {
	for i := 0; i < v.NumField(); i++ {
		f := v.Type().Field(i)
		tag, opts, _ := strings.Cut(f.Tag.Get("yaml"), ",")
		if strings.Contains(opts, "inline") {
			if x := fieldByKey(v.Field(i), key); x != nil {
				return x
			}
		}
		if tag == key {
			return v.Field(i).Interface()
		}
	}
	return nil
}

// sectionField is the name of config.Test's field for a YAML section.
func sectionField(sec string) string {
	tt := reflect.TypeOf(config.Test{})
	for i := 0; i < tt.NumField(); i++ {
		if tag, _, _ := strings.Cut(tt.Field(i).Tag.Get("yaml"), ","); tag == sec {
			return tt.Field(i).Name
		}
	}
	return ""
}

func sectionType(sec string) reflect.Type {
	f, _ := reflect.TypeOf(config.Test{}).FieldByName(sectionField(sec))
	return f.Type
}

// Options out of range are refused before any work, under the option's
// name (the config key's FieldError restated), and a missing companion
// option is named: --area with --load. The run folder and photos given
// here do not exist, so an error about them would mean the options were
// not checked first. Before, each of these reached the stage: --load
// without --area failed on the run folder (or, on a real one, after the
// load log was read, as "loaded area 0 mm²"), a ZNCC limit of 1.5 and a
// NaN threshold ran and gave onsets at the reference frame or none, a
// seed of 10.5 px was cut to 10.
func TestOptionsCheckedBeforeWork(t *testing.T) {
	gone := filepath.Join(t.TempDir(), "no-such-run")
	for _, c := range []struct {
		args []string
		want []string
	}{
		{[]string{"zones", "--strain", gone, "--load", "frame.csv"}, []string{"--area: required with --load, expected the loaded area in mm²"}},
		{[]string{"zones", "--strain", gone, "--area", "5000"}, []string{"--load: required with --area"}},
		{[]string{"zones", "--strain", gone, "--min-zncc", "1.5"}, []string{"--min-zncc 1.5: expected a ZNCC between -1 and 1"}},
		{[]string{"zones", "--strain", gone, "--threshold", "nanmad"}, []string{`--threshold nanmad: expected "Kmad", "Nue" or both`}},
		{[]string{"zones", "--strain", gone, "--threshold", "0mad"}, []string{`--threshold 0mad: expected`}},
		{[]string{"zones", "--strain", gone, "--persistence", "-1"}, []string{"--persistence -1: expected 1 frame or more"}},
		{[]string{"zones", "--strain", gone, "--min-cells", "-4"}, []string{"--min-cells -4: expected a zone size of 1 grid point or more"}},
		{[]string{"zones", "--strain", gone, "--calibrate-below", "2"}, []string{"--calibrate-below 2: expected a fraction of the peak stress in (0, 1]"}},
		{[]string{"zones", "--strain", gone, "--reach", "NaN"}, []string{"--reach NaN: expected a finite positive number"}},
		{[]string{"zones", "--strain", gone, "--fps", "NaN"}, []string{"--fps NaN: expected a finite positive rate"}},
		{[]string{"zones", "--strain", gone, "--load", "f.csv", "--area", "5000", "--clock-offset", "Inf"}, []string{"--clock-offset +Inf: expected a finite number of seconds"}},
		{[]string{"zones", "--strain", gone, "--load", "f.csv", "--area", "5000", "--sync", "1,NaN"}, []string{"--sync [1 NaN]: expected [camera_s, log_s]"}},
		{[]string{"zones", "--strain", gone, "--load", "f.csv", "--area", "Inf"}, []string{"--area +Inf: expected a finite positive area"}},
		{[]string{"zones", "--strain", gone, "--opening", "A\x1b[2J=circle:5,5,2"}, []string{`openings[0].name "A\x1b[2J" holds the control or formatting character U+001B`}},
		{[]string{"track", "--images", gone, "--out", gone, "--min-zncc", "1.5", "--step", "-1"}, []string{"--step -1: expected a positive number of px; --min-zncc 1.5: expected a ZNCC between 0 and 1"}},
		{[]string{"track", "--images", gone, "--out", gone, "--seed", "10.5,3"}, []string{`--seed "10.5,3", expected X,Y in whole px`}},
		{[]string{"track", "--images", gone, "--out", gone, "--subset", "25.5"}, []string{`invalid argument "25.5" for "--subset"`}},
		{[]string{"track", "--images", gone, "--out", gone, "--workers", "100000000"}, []string{"--workers 100000000: expected 0 (all cores) up to 1024"}},
		{[]string{"track", "--images", gone, "--out", gone, "--scale", "NaN"}, []string{"--scale NaN: expected a finite positive number of mm per px"}},
		{[]string{"track", "--images", gone, "--out", gone, "--scale-line", "0,0,Inf,0,5"}, []string{"--scale-line [0 0 +Inf 0 5]: expected [x1, y1, x2, y2, mm]"}},
		{[]string{"track", "--images", gone, "--out", gone, "--fps", "Inf"}, []string{"--fps +Inf: expected a finite positive rate"}},
		{[]string{"track", "--images", gone, "--out", gone, "--fps", "2", "--mtime"}, []string{"times: give one of fps, csv, mtime and exif"}},
		{[]string{"track", "--images", gone, "--out", gone, "--roi", "circle:1,1,NaN"}, []string{`roi: roi "circle:1,1,NaN": expected x0,y0,x1,y1`}},
		{[]string{"strain", "--fields", gone, "--min-points", "1000"}, []string{"--min-points 1000: expected 0 (half the window) up to the window's 81 points"}},
		{[]string{"strain", "--fields", gone, "--window", "4"}, []string{"--window 4: expected an odd number of grid points, at least 3"}},
		{[]string{"strain", "--fields", gone, "--static", "-1"}, []string{"--static -1: expected 0 or more frames"}},
	} {
		_, err := run(t, c.args...)
		for _, w := range c.want {
			if err == nil || !strings.Contains(err.Error(), w) {
				t.Errorf("%q: error %v, want %q", c.args, err, w)
			}
		}
		if err != nil && strings.Contains(err.Error(), "no-such-run") {
			t.Errorf("%q: %v: the options were not checked before the run folder", c.args, err)
		}
	}
}
