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
	"strings"
	"unicode/utf8"

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
	// Camera holds the camera's keys (lens, compensation plate, stand-off),
	// at the top level.
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
	// Camera holds the face camera's keys (lens, compensation plate,
	// stand-off).
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
	set(&c.CompensationPlate, f.CompensationPlate)
	if f.StandoffMM != 0 {
		c.StandoffMM = f.StandoffMM
	}
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

// Parse reads a config from data as if read from path, and checks it
// whole (check): an error names the file, and the line, key or name at
// fault, and says what was expected.
func Parse(data []byte, path string) (*Test, error) {
	t := &Test{}
	if err := decode(data, path, t); err != nil {
		return nil, fmt.Errorf("test config %w", err)
	}
	abs, _ := filepath.Abs(path)
	t.Path, t.Dir = abs, filepath.Dir(abs)
	named := t.Name != ""
	if !named {
		t.Name = strings.TrimSuffix(filepath.Base(path), filepath.Ext(path))
	}
	if err := t.check(named); err != nil {
		return nil, fmt.Errorf("test config %s: %w", path, err)
	}
	return t, nil
}

// decode decodes YAML data into v (a pointer to a config struct), after
// checkSchema; errors start with the file's path.
func decode(data []byte, path string, v any) error {
	var doc any
	if err := yaml.Unmarshal(data, &doc); err != nil {
		return explain(path, err)
	}
	if err := checkSchema(data, doc, reflect.TypeOf(v).Elem()); err != nil {
		return fmt.Errorf("%s: %w", path, err)
	}
	if err := yaml.UnmarshalWithOptions(data, v, yaml.DisallowUnknownField()); err != nil {
		return explain(path, err)
	}
	return nil
}

// Resolve returns p relative to the config's folder (absolute paths and
// globs stay as they are, made relative to the folder when relative).
func (t *Test) Resolve(p string) string {
	if p == "" || filepath.IsAbs(p) {
		return p
	}
	return filepath.Join(t.Dir, p)
}

// check checks a whole test config: what it must give (photos), its names
// (the test's, named says whether by the name key or by the file name, and
// its faces'), how its sections fit together, and every setting
// (CheckSettings).
func (t *Test) check(named bool) error {
	var p Problems
	kind := "test name"
	if !named {
		kind = "test name (from the file name; set name: to choose another)"
	}
	p.add(CheckPathName(kind, t.Name))
	if t.Images == "" && len(t.Faces) == 0 {
		p.add(fmt.Errorf("images: required (a folder, a glob, a list file or a video), or faces"))
	}
	faces := map[string]int{}
	for i, f := range t.Faces {
		if err := CheckPathName(fmt.Sprintf("faces[%d].name", i), f.Name); err != nil {
			p.add(err)
		} else if j, ok := faces[f.Name]; ok {
			p.add(fmt.Errorf("faces[%d].name %q: used by faces[%d] too; each face needs its own name (its run folder)", i, f.Name, j))
		} else {
			faces[f.Name] = i
		}
		if f.Images == "" && t.Images == "" {
			p.add(fmt.Errorf("faces[%d]: images is required", i))
		}
		if (f.ClockOffset != nil || len(f.Sync) != 0) && t.Load.File == "" {
			p.add(&FieldError{Key: "load.file", With: fmt.Sprintf("faces[%d]'s clock", i), Expected: "the load log the face's clock applies to"})
		}
	}
	p.add(t.checkModel(faces))
	p.add(t.CheckSettings())
	return p.err()
}

// checkModel checks that the model's face exists and that a model in mm
// has the image scale of its face to put it in px.
func (t *Test) checkModel(faces map[string]int) error {
	m := t.Model
	if m.File == "" {
		return nil
	}
	face := t
	if len(t.Faces) > 0 {
		i, ok := faces[m.Face]
		if m.Face == "" {
			i, ok = 0, true
		}
		if !ok {
			return fmt.Errorf("model.face %q: no face has that name (faces: %s)", m.Face, strings.Join(faceNames(t.Faces), ", "))
		}
		face = t.FaceTest(i)
	} else if m.Face != "" {
		return fmt.Errorf("model.face %q: the test has no faces", m.Face)
	}
	if m.Units != "px" && !face.Scale.given() {
		return fmt.Errorf("model: units mm (the default) need the image scale: give scale.mm_per_px or scale.line, or model.units: px")
	}
	return nil
}

func faceNames(fs []Face) []string {
	names := make([]string, len(fs))
	for i, f := range fs {
		names[i] = f.Name
	}
	return names
}

// CheckSettings checks every setting the test gives, of every section and
// face: numbers finite and in range (zero meaning the default where it
// does), integers whole, words known, shapes valid, the clocks of the
// load and AE logs, names of openings. It does not ask for what a whole
// run needs (photos, a name): the stage commands fill only their sections
// from their options and check them with it before any work; Parse runs
// it as part of checking a whole config. Each value is checked by its
// section, once; the sections' conversions (Settings, StrainWindow,
// Stage, Value, Clock, Stress) run the same checks.
func (t *Test) CheckSettings() error {
	var p Problems
	p.add(t.Times.check("times"))
	p.add(t.Scale.check("scale"))
	p.add(checkShapes("", t.ROI, t.Exclude, t.Openings))
	p.add(t.Camera.check(""))
	p.add(t.Correlation.check())
	p.add(t.Strain.check())
	p.add(t.Zones.check())
	p.add(t.Load.check())
	p.add(t.AE.check())
	p.add(t.Model.check())
	for i, f := range t.Faces {
		prefix := fmt.Sprintf("faces[%d]", i)
		p.add(f.Times.check(prefix + ".times"))
		p.add(f.Scale.check(prefix + ".scale"))
		p.add(checkShapes(prefix+".", f.ROI, f.Exclude, f.Openings))
		p.add(f.Camera.check(prefix + "."))
		offset := 0.0
		if f.ClockOffset != nil {
			offset = *f.ClockOffset
			if len(f.Sync) != 0 {
				p.add(fmt.Errorf("%s: give clock_offset_s or sync, not both", prefix))
			}
		}
		_, err := clockOf(prefix, "log_s", offset, f.Sync)
		p.add(err)
	}
	return p.err()
}

// explain turns a YAML error into one that names the file and line. The
// decoder's message may quote a value (a number of a million digits), so
// it is cut to explainRunes characters.
func explain(path string, err error) error {
	msg := yaml.FormatError(err, false, false)
	if m := position.FindStringSubmatch(msg); m != nil {
		return fmt.Errorf("%s line %s column %s: %s", path, m[1], m[2], cut(strings.TrimSpace(m[3])))
	}
	first, _, _ := strings.Cut(strings.TrimSpace(msg), "\n")
	return fmt.Errorf("%s: %s", path, cut(first))
}

// explainRunes is the longest decoder message explain shows.
const explainRunes = 300

// cut shortens s to explainRunes characters, saying so.
func cut(s string) string {
	if utf8.RuneCountInString(s) <= explainRunes {
		return s
	}
	n := 0
	for i := range s {
		if n == explainRunes {
			return fmt.Sprintf("%s… (%d bytes)", s[:i], len(s))
		}
		n++
	}
	return s
}

var position = regexp.MustCompile(`^\[(\d+):(\d+)\] ([^\n]*)`)
