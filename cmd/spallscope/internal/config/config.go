// Package config reads a test config: the YAML file that describes one
// compression test for spallscope — where the photos and the load log are,
// the specimen's geometry and openings, and the settings of every stage.
// Paths in it are relative to the file's folder. An unknown key is an error
// that lists the valid ones; malformed YAML is an error with its line.
package config

import (
	"fmt"
	"os"
	"path/filepath"
	"reflect"
	"regexp"
	"strconv"
	"strings"

	"github.com/goccy/go-yaml"
)

// Test is one test config.
type Test struct {
	// Name labels the test in campaign summaries (default: the file name).
	Name string `yaml:"name"`
	// Images is the photo sequence: a folder, a glob, a list file or a video.
	Images string `yaml:"images"`
	// Reference is the reference: a frame index (default 0) or an image file.
	Reference string `yaml:"reference"`
	Times     Times  `yaml:"times"`
	Scale     Scale  `yaml:"scale"`
	// ROI is the region of interest as a shape (rect:..., polygon:...);
	// empty: the whole image.
	ROI string `yaml:"roi"`
	// Openings are the excavations in the face: excluded from correlation
	// and the centres of sectors.
	Openings []Opening `yaml:"openings"`
	// Exclude lists other excluded shapes (labels, clamps, background).
	Exclude []string `yaml:"exclude"`
	// Mask is a mask image the size of the reference (nonzero = measured).
	Mask        string      `yaml:"mask"`
	Correlation Correlation `yaml:"correlation"`
	Strain      Strain      `yaml:"strain"`
	Zones       Zones       `yaml:"zones"`
	Load        Load        `yaml:"load"`
	AE          AE          `yaml:"ae"`
	Model       Model       `yaml:"model"`
	Outputs     Outputs     `yaml:"outputs"`
	// Camera holds the camera's keys (lens), at the top level.
	Camera `yaml:",inline"`
	// Faces lists the camera views of a test filmed from several sides.
	// Each face is tracked and analysed on its own, with its own photos,
	// geometry, scale and camera clock, against the one load log; keys a
	// face leaves out are taken from the test.
	Faces []Face `yaml:"faces"`

	// Dir is the folder of the config file (paths resolve against it).
	Dir string `yaml:"-"`
	// Path is the config file.
	Path string `yaml:"-"`
}

// Face is one camera's view of the specimen.
type Face struct {
	Name      string    `yaml:"name"`
	Images    string    `yaml:"images"`
	Reference string    `yaml:"reference"`
	Times     Times     `yaml:"times"`
	Scale     Scale     `yaml:"scale"`
	ROI       string    `yaml:"roi"`
	Openings  []Opening `yaml:"openings"`
	Exclude   []string  `yaml:"exclude"`
	Mask      string    `yaml:"mask"`
	// Camera holds the face camera's keys (lens).
	Camera `yaml:",inline"`
	// ClockOffset is the load log's clock minus this camera's, in s (unset:
	// the test's load.clock_offset_s); Sync gives a sync pair instead.
	ClockOffset *float64  `yaml:"clock_offset_s"`
	Sync        []float64 `yaml:"sync"`
}

// FaceTest returns the test as seen by face i: the test with the face's
// keys put in, and no faces of its own.
func (t *Test) FaceTest(i int) *Test {
	f := t.Faces[i]
	c := *t
	c.Faces = nil
	c.Name = f.Name
	if t.Model.Face != f.Name && !(t.Model.Face == "" && i == 0) {
		c.Model = Model{} // the model belongs to another face
	}
	set := func(dst *string, v string) {
		if v != "" {
			*dst = v
		}
	}
	set(&c.Images, f.Images)
	set(&c.Reference, f.Reference)
	set(&c.ROI, f.ROI)
	set(&c.Mask, f.Mask)
	set(&c.Lens, f.Lens)
	if f.Times != (Times{}) {
		c.Times = f.Times
	}
	if f.Scale.MMPerPx != 0 || len(f.Scale.Line) != 0 {
		c.Scale = f.Scale
	}
	if f.Openings != nil {
		c.Openings = f.Openings
	}
	if f.Exclude != nil {
		c.Exclude = f.Exclude
	}
	if f.ClockOffset != nil {
		c.Load.ClockOffset, c.Load.Sync = *f.ClockOffset, nil
	}
	if len(f.Sync) == 2 {
		c.Load.ClockOffset, c.Load.Sync = 0, f.Sync
	}
	return &c
}

// Read reads and checks a test config.
func Read(path string) (*Test, error) {
	data, err := os.ReadFile(path)
	if err != nil {
		return nil, fmt.Errorf("test config: %w", err)
	}
	return Parse(data, path)
}

// Parse reads a config from data as if read from path.
func Parse(data []byte, path string) (*Test, error) {
	t := &Test{}
	if err := yaml.UnmarshalWithOptions(data, t, yaml.DisallowUnknownField()); err != nil {
		return nil, explain(path, data, err)
	}
	abs, _ := filepath.Abs(path)
	t.Path, t.Dir = abs, filepath.Dir(abs)
	if t.Name == "" {
		t.Name = strings.TrimSuffix(filepath.Base(path), filepath.Ext(path))
	}
	if err := t.check(); err != nil {
		return nil, fmt.Errorf("test config %s: %w", path, err)
	}
	return t, nil
}

// Resolve returns p relative to the config's folder (absolute paths and
// globs stay as they are, made relative to the folder when relative).
func (t *Test) Resolve(p string) string {
	if p == "" || filepath.IsAbs(p) {
		return p
	}
	return filepath.Join(t.Dir, p)
}

func (t *Test) check() error {
	var errs []string
	if t.Images == "" && len(t.Faces) == 0 {
		errs = append(errs, "images: required (a folder, a glob, a list file or a video), or faces")
	}
	names := map[string]bool{}
	for i, f := range t.Faces {
		switch {
		case f.Name == "":
			errs = append(errs, fmt.Sprintf("faces[%d]: name is required", i))
		case names[f.Name]:
			errs = append(errs, fmt.Sprintf("faces[%d]: name %q used twice", i, f.Name))
		}
		names[f.Name] = true
		if f.Images == "" && t.Images == "" {
			errs = append(errs, fmt.Sprintf("faces[%d]: images is required", i))
		}
		if len(f.Sync) != 0 && len(f.Sync) != 2 {
			errs = append(errs, fmt.Sprintf("faces[%d].sync: expected [camera_s, log_s]", i))
		}
	}
	n := 0
	for _, set := range []bool{t.Times.FPS != 0, t.Times.CSV != "", t.Times.MTime, t.Times.EXIF} {
		if set {
			n++
		}
	}
	if n > 1 {
		errs = append(errs, "times: give one of fps, csv, mtime and exif")
	}
	if t.Times.FPS < 0 {
		errs = append(errs, fmt.Sprintf("times.fps: %g, expected a positive rate", t.Times.FPS))
	}
	if len(t.Scale.Line) != 0 && len(t.Scale.Line) != 5 {
		errs = append(errs, "scale.line: expected [x1, y1, x2, y2, mm]")
	}
	if t.Scale.MMPerPx != 0 && len(t.Scale.Line) != 0 {
		errs = append(errs, "scale: give mm_per_px or line, not both")
	}
	for i, o := range t.Openings {
		if o.Shape == "" {
			errs = append(errs, fmt.Sprintf("openings[%d]: shape is required", i))
		}
	}
	if t.Load.File != "" && !(t.Load.AreaMM2 > 0) {
		errs = append(errs, "load.area_mm2: required with load.file (nominal stress = force / area)")
	}
	if len(t.Load.Sync) != 0 && len(t.Load.Sync) != 2 {
		errs = append(errs, "load.sync: expected [camera_s, log_s]")
	}
	if len(t.AE.Sync) != 0 && len(t.AE.Sync) != 2 {
		errs = append(errs, "ae.sync: expected [camera_s, ae_s]")
	}
	if t.Model.File != "" && t.Model.LoadMPa == 0 && t.Model.Frame == "" {
		errs = append(errs, "model: give load_mpa (the model's load level) or frame")
	}
	if len(t.Model.Origin) != 0 && len(t.Model.Origin) != 2 {
		errs = append(errs, "model.origin_px: expected [x, y]")
	}
	if len(t.AE.Background) != 0 && len(t.AE.Background) != 2 {
		errs = append(errs, "ae.background_s: expected [t0, t1] in camera seconds")
	}
	for i, s := range t.Correlation.Seeds {
		if len(s) != 2 {
			errs = append(errs, fmt.Sprintf("correlation.seeds[%d]: expected [x, y]", i))
		}
	}
	if len(errs) > 0 {
		return fmt.Errorf("%s", strings.Join(errs, "; "))
	}
	return nil
}

var unknownField = regexp.MustCompile(`\[(\d+):(\d+)\] unknown field "([^"]+)"`)

// explain turns a YAML error into one that names the file and line and,
// for an unknown key, lists the keys valid where it stands.
func explain(path string, data []byte, err error) error {
	msg := yaml.FormatError(err, false, false)
	if m := unknownField.FindStringSubmatch(msg); m != nil {
		line, _ := strconv.Atoi(m[1])
		keys := validKeys(reflect.TypeOf(Test{}), sectionOf(data, line))
		return fmt.Errorf("test config %s line %s: unknown key %q; valid keys here: %s", path, m[1], m[3], strings.Join(keys, ", "))
	}
	if m := position.FindStringSubmatch(msg); m != nil {
		return fmt.Errorf("test config %s line %s column %s: %s", path, m[1], m[2], strings.TrimSpace(m[3]))
	}
	return fmt.Errorf("test config %s: %s", path, strings.TrimSpace(msg))
}

var position = regexp.MustCompile(`^\[(\d+):(\d+)\] ([^\n]*)`)

// sectionOf returns the chain of parent keys of the given 1-based line, by
// indentation.
func sectionOf(data []byte, line int) []string {
	lines := strings.Split(string(data), "\n")
	if line < 1 || line > len(lines) {
		return nil
	}
	indent := func(s string) int { return len(s) - len(strings.TrimLeft(s, " -")) }
	var chain []string
	cur := indent(lines[line-1])
	for i := line - 2; i >= 0 && cur > 0; i-- {
		l := lines[i]
		if strings.TrimSpace(l) == "" || strings.HasPrefix(strings.TrimSpace(l), "#") {
			continue
		}
		if d := indent(l); d < cur {
			key, _, _ := strings.Cut(strings.TrimLeft(l, " -"), ":")
			chain = append([]string{strings.TrimSpace(key)}, chain...)
			cur = d
		}
	}
	return chain
}

// validKeys lists the yaml keys of the struct reached from t by the chain,
// in the order the struct declares them.
func validKeys(t reflect.Type, chain []string) []string {
	for _, k := range chain {
		found := false
		for _, key := range Keys(t) {
			if key.Name == k {
				t, found = key.Type, true
				break
			}
		}
		if !found {
			break
		}
	}
	var names []string
	for _, key := range Keys(t) {
		names = append(names, key.Name)
	}
	return names
}

// Key is one YAML key of a config struct and the type of its value.
type Key struct {
	Name string
	Type reflect.Type
}

// Keys lists the yaml keys of a struct type in declaration order (through
// slices and pointers, with the keys of inline structs put in where they
// are embedded); nil for a type that is not a struct.
func Keys(t reflect.Type) []Key {
	for t.Kind() == reflect.Slice || t.Kind() == reflect.Pointer {
		t = t.Elem()
	}
	if t.Kind() != reflect.Struct {
		return nil
	}
	var keys []Key
	for i := 0; i < t.NumField(); i++ {
		f := t.Field(i)
		tag, opts, _ := strings.Cut(f.Tag.Get("yaml"), ",")
		switch {
		case strings.Contains(opts, "inline"):
			keys = append(keys, Keys(f.Type)...)
		case tag != "" && tag != "-":
			keys = append(keys, Key{tag, f.Type})
		}
	}
	return keys
}
