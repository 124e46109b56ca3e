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

// Times says when each frame was taken: give one of FPS, CSV or MTime.
type Times struct {
	FPS   float64 `yaml:"fps"`
	CSV   string  `yaml:"csv"`
	MTime bool    `yaml:"mtime"`
}

// Scale is the image scale: a factor, or a known distance between two
// reference points [x1, y1, x2, y2, mm].
type Scale struct {
	MMPerPx float64   `yaml:"mm_per_px"`
	Line    []float64 `yaml:"line"`
}

// Opening names an opening and its shape (circle:cx,cy,r,
// ellipse:cx,cy,rx,ry[,deg], polygon:x1,y1,...).
type Opening struct {
	Name  string `yaml:"name"`
	Shape string `yaml:"shape"`
}

// Correlation are the tracking settings (zero: defaults).
type Correlation struct {
	Subset        int     `yaml:"subset"`
	Step          int     `yaml:"step"`
	Order         string  `yaml:"order"`         // affine | quadratic
	Interpolation string  `yaml:"interpolation"` // bicubic | biquintic
	Reference     string  `yaml:"reference"`     // fixed | incremental
	UpdateBelow   float64 `yaml:"update_below"`
	MinZNCC       float64 `yaml:"min_zncc"`
	SearchRadius  int     `yaml:"search_radius"`
	EdgeGuard     int     `yaml:"edge_guard"`
	Seeds         [][]int `yaml:"seeds"`
}

// Strain are the strain settings.
type Strain struct {
	Window       int    `yaml:"window"`
	Order        int    `yaml:"order"`
	Measure      string `yaml:"measure"`
	StaticFrames int    `yaml:"static_frames"`
}

// Zones are the zone and onset settings.
type Zones struct {
	Indicators      []string `yaml:"indicators"`
	Threshold       string   `yaml:"threshold"` // "6mad", "500ue" or both
	MinCells        int      `yaml:"min_cells"`
	MinZNCC         float64  `yaml:"min_zncc"`
	Persistence     int      `yaml:"persistence"`
	CalibrateBelow  float64  `yaml:"calibrate_below"`
	CalibrateFrames int      `yaml:"calibrate_frames"`
	K               float64  `yaml:"k"`
	UCS             float64  `yaml:"ucs_mpa"`
	LoadAngleDeg    float64  `yaml:"load_angle_deg"`
	CrownHalfAngle  float64  `yaml:"crown_half_angle_deg"`
	Reach           float64  `yaml:"reach"`
}

// Load maps the test frame's log.
type Load struct {
	File                string    `yaml:"file"`
	AreaMM2             float64   `yaml:"area_mm2"`
	TimeColumn          string    `yaml:"time_column"`
	ForceColumn         string    `yaml:"force_column"`
	TimeUnit            string    `yaml:"time_unit"`
	ForceUnit           string    `yaml:"force_unit"`
	CompressionNegative bool      `yaml:"compression_negative"`
	ClockOffset         float64   `yaml:"clock_offset_s"`
	Sync                []float64 `yaml:"sync"` // [camera_s, log_s]
}

// AE maps an acoustic-emission hit list recorded beside the load, and the
// rule for its onset: the hit rate in Window-second windows first exceeds
// K times the early-test background for Persistence windows in a row.
type AE struct {
	File            string    `yaml:"file"`
	TimeColumn      string    `yaml:"time_column"`
	AmplitudeColumn string    `yaml:"amplitude_column"`
	EnergyColumn    string    `yaml:"energy_column"`
	CountsColumn    string    `yaml:"counts_column"`
	ChannelColumn   string    `yaml:"channel_column"`
	TimeUnit        string    `yaml:"time_unit"`
	ClockOffset     float64   `yaml:"clock_offset_s"` // AE time = camera time + offset
	Sync            []float64 `yaml:"sync"`           // [camera_s, ae_s]
	Window          float64   `yaml:"window_s"`
	K               float64   `yaml:"k"`
	Persistence     int       `yaml:"persistence"`
	Background      []float64 `yaml:"background_s"` // [t0, t1] camera time; default the first 10 %
	GapSeconds      float64   `yaml:"gap_s"`        // silence longer than this is a gap
}

// Model is a numerical model's field to hold against the measurement: a
// CSV of points (x, y and any of u, v, exx, eyy, exy) at the load level
// LoadMPa, compared at the frame whose nominal stress is nearest. Its
// origin is at reference pixel Origin, its lengths in Units (mm with the
// face's scale, or px), its y axis up the image when YUp. With several
// faces it belongs to the face named Face (default the first).
type Model struct {
	File                string    `yaml:"file"`
	LoadMPa             float64   `yaml:"load_mpa"`
	Frame               string    `yaml:"frame"` // instead of load_mpa
	Units               string    `yaml:"units"`
	Origin              []float64 `yaml:"origin_px"`
	YUp                 bool      `yaml:"y_up"`
	CompressionPositive bool      `yaml:"compression_positive"`
	Face                string    `yaml:"face"`
}

// Outputs says what to produce beyond fields, strain, zones and onsets.
// Unset switches take their defaults: overlays and the report on, video,
// VTK and NPY off.
type Outputs struct {
	Overlays *bool  `yaml:"overlays"`
	Video    *bool  `yaml:"video"`
	Report   *bool  `yaml:"report"`
	VTK      *bool  `yaml:"vtk"`
	NPY      *bool  `yaml:"npy"`
	Field    string `yaml:"field"` // overlay quantity, default e1
}

func on(b *bool, def bool) bool {
	if b == nil {
		return def
	}
	return *b
}

// WantOverlays reports whether overlays are wanted (default yes).
func (o Outputs) WantOverlays() bool { return on(o.Overlays, true) }

// WantVideo reports whether a video is wanted (default no).
func (o Outputs) WantVideo() bool { return on(o.Video, false) }

// WantReport reports whether the HTML report is wanted (default yes).
func (o Outputs) WantReport() bool { return on(o.Report, true) }

// WantVTK reports whether VTK files are wanted (default no).
func (o Outputs) WantVTK() bool { return on(o.VTK, false) }

// WantNPY reports whether NumPy arrays are wanted (default no).
func (o Outputs) WantNPY() bool { return on(o.NPY, false) }

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
	for _, set := range []bool{t.Times.FPS != 0, t.Times.CSV != "", t.Times.MTime} {
		if set {
			n++
		}
	}
	if n > 1 {
		errs = append(errs, "times: give one of fps, csv and mtime")
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

// validKeys lists the yaml keys of the struct reached from t by the chain.
func validKeys(t reflect.Type, chain []string) []string {
	for _, k := range chain {
		for t.Kind() == reflect.Slice || t.Kind() == reflect.Pointer {
			t = t.Elem()
		}
		if t.Kind() != reflect.Struct {
			break
		}
		for i := 0; i < t.NumField(); i++ {
			if tag, _, _ := strings.Cut(t.Field(i).Tag.Get("yaml"), ","); tag == k {
				t = t.Field(i).Type
				break
			}
		}
	}
	for t.Kind() == reflect.Slice || t.Kind() == reflect.Pointer {
		t = t.Elem()
	}
	var keys []string
	if t.Kind() == reflect.Struct {
		for i := 0; i < t.NumField(); i++ {
			if tag, _, _ := strings.Cut(t.Field(i).Tag.Get("yaml"), ","); tag != "" && tag != "-" {
				keys = append(keys, tag)
			}
		}
	}
	return keys
}
