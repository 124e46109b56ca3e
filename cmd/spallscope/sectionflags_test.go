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
	"exclude":   {"circle:9,9,4", `["circle:9,9,4"]`},
	"openings":  {"W=circle:9,9,4", `[{name: W, shape: "circle:9,9,4"}]`},

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
var cliTopKeys = []string{"images", "reference", "roi", "mask", "lens", "exclude", "openings"}

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
