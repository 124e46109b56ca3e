package config

import (
	"fmt"
	"strings"
	"testing"
	"time"

	"github.com/goccy/go-yaml"
)

// An unknown key is named with the section it stands in and the keys valid
// there, whatever the style it is written in (YAML 1.2.2 §7.4 flow
// mappings and §8.2 block mappings are one mapping to the decoder) and
// however it got there (an alias or a merge key). Before, the section was
// guessed from the line's indentation: a flow mapping on one line
// ("zones: {foo: 1}") was put at the top level, with the top level's keys.
func TestUnknownKeyNamesItsSection(t *testing.T) {
	for _, c := range []struct{ yaml, want string }{
		{"images: p\nzones: {foo: 1}\n", `line 2: unknown key "foo" in zones; valid keys there: indicators, threshold, min_cells`},
		{"images: p\nzones: {min_cells: 4, foo: 1}\n", `line 2: unknown key "foo" in zones`},
		{"images: p\nfaces: [{name: w, times: {fsp: 2}}]\n", `line 2: unknown key "fsp" in faces[0].times; valid keys there: fps, csv, mtime`},
		{"images: p\nload: {file: f.csv, area_mm2: 1, time_colum: t}\n", `unknown key "time_colum" in load; valid keys there: file, area_mm2, time_column, force_column`},
		{"images: p\nae:\n  file: a.csv\n  windows: 2\n", `line 4: unknown key "windows" in ae; valid keys there: file, time_column`},
		{"images: p\nstrain:\n  window: 9\nzones:\n    persistance: 3\n", `line 5: unknown key "persistance" in zones`},
		// The key is written on line 2 and reaches strain through the alias.
		{"images: p\ncorrelation: &c {subset: 21}\nstrain: *c\n", `line 2: unknown key "subset" in strain; valid keys there: window, order`},
		{"images: p\ncorrelation:\n  <<: {subset: 21, windw: 9}\n", `unknown key "windw" in correlation`},
		{"images: p\n? " + strings.Repeat("k", 5000) + "\n: 1\n", `unknown key "` + strings.Repeat("k", 60) + `"… (5000 bytes) at the top level`},
	} {
		_, err := Parse([]byte(c.yaml), "t.yaml")
		if err == nil || !strings.Contains(err.Error(), c.want) {
			t.Errorf("%q:\n got %v\nwant %q", c.yaml, err, c.want)
		}
	}
}

// A number with a fraction or exponent for an integer setting is refused,
// not truncated. The core schema (YAML 1.2.2 §10.3.2) resolves 2.5, 1e3
// and -0.5 as floats; goccy/go-yaml v1.19.2 decodes 2.5 into an int field
// as 2, -0.5 as 0 (the default) and the string '2.5' as 2 (measured; see
// TestDecoderTruncatesIntegers). Whole numbers in any integer form pass.
func TestIntegerSettingsAreWhole(t *testing.T) {
	for _, c := range []struct{ yaml, key, value string }{
		{"correlation: {subset: 25.5}", "correlation.subset", "25.5"},
		{"correlation: {subset: 25.0}", "correlation.subset", "25.0"},
		{"correlation: {step: 1e1}", "correlation.step", "1e1"},
		{"correlation: {search_radius: '2.5'}", "correlation.search_radius", "2.5"},
		{"correlation: {seeds: [[10, 20.5]]}", "correlation.seeds[0][1]", "20.5"},
		{"strain: {window: 9.99999999999999999999}", "strain.window", "9.99999999999999999999"},
		{"strain: {static_frames: -0.5}", "strain.static_frames", "-0.5"},
		{"zones: {persistence: 2.5}", "zones.persistence", "2.5"},
		{"zones: {min_cells: !!float 4}", "zones.min_cells", "4"},
		{"load: {file: f.csv, area_mm2: 1, skip_lines: 1.5}", "load.skip_lines", "1.5"},
		{"ae: {file: a.csv, persistence: .5}", "ae.persistence", ".5"},
		{"x: &n 3.5\ncorrelation: {workers: *n}", "correlation.workers", "3.5"},
	} {
		_, err := Parse([]byte("images: p\n"+c.yaml+"\n"), "t.yaml")
		want := c.key + ` "` + c.value + `": expected a whole number`
		if err == nil || !strings.Contains(err.Error(), want) {
			t.Errorf("%s:\n got %v\nwant %q", c.yaml, err, want)
		}
	}
	for _, y := range []string{"correlation: {subset: 25, step: 0x8, search_radius: '20', seeds: [[10, 20]]}", "strain: {window: +9}", "zones: {persistence: 1_0}"} {
		if _, err := Parse([]byte("images: p\n"+y+"\n"), "t.yaml"); err != nil {
			t.Errorf("%s: %v, want it accepted", y, err)
		}
	}
}

// What the decoder alone does with a fraction for an int field, so that a
// new goccy/go-yaml version that refuses it by itself is noticed (the
// check above would then be a second one).
func TestDecoderTruncatesIntegers(t *testing.T) {
	for _, c := range []struct {
		yaml string
		want int
	}{{"n: 2.5", 2}, {"n: -0.5", 0}, {"n: '2.5'", 2}, {"n: 1e3", 1000}} {
		var v struct {
			N int `yaml:"n"`
		}
		if err := yaml.Unmarshal([]byte(c.yaml), &v); err != nil || v.N != c.want {
			t.Errorf("goccy/go-yaml decodes %q as %d, %v; this test expected %d (the truncation the schema check guards against)", c.yaml, v.N, err, c.want)
		}
	}
}

// Aliases repeat what they name (YAML 1.2.2 §3.2.2.2), so a short file can
// stand for a huge document. Both kinds are refused quickly, with a short
// message: a thousand unknown keys repeated a thousand times (13 kB: the
// walk stops after maxSchemaProblems; before, listing all million took
// 12 s on this machine), and a thousand faces of a thousand openings (67
// kB: past maxSchemaValues; before, checking and decoding took 9 s).
// The time bound is loose for a shared machine: five times what the
// current code needs at the most.
func TestAliasesCannotBlowUp(t *testing.T) {
	var keys, faces strings.Builder
	keys.WriteString("images: p\nx: &m {")
	for i := range 1000 {
		fmt.Fprintf(&keys, "k%d: 1, ", i)
	}
	keys.WriteString("name: a}\nfaces: [" + strings.Repeat("*m, ", 1000) + "]\n")
	faces.WriteString("images: p\nfaces: [{name: f, openings: &e [")
	for i := range 1000 {
		fmt.Fprintf(&faces, "{name: o%d, shape: \"circle:%d,1,1\"}, ", i, i)
	}
	faces.WriteString("]}, ")
	for i := range 1000 {
		fmt.Fprintf(&faces, "{name: f%d, openings: *e}, ", i)
	}
	faces.WriteString("]\n")
	for _, c := range []struct{ name, yaml, want string }{
		{"unknown keys", keys.String(), "and 91 more"},
		{"openings", faces.String(), "the document holds more than 100000 values"},
	} {
		start := time.Now()
		_, err := Parse([]byte(c.yaml), "t.yaml")
		if took := time.Since(start); took > 5*time.Second {
			t.Errorf("%s: %v to refuse %d bytes", c.name, took, len(c.yaml))
		}
		if err == nil || !strings.Contains(err.Error(), c.want) || len(err.Error()) > maxErrorBytes {
			t.Errorf("%s: error %v (%d bytes), want %q", c.name, err, len(fmt.Sprint(err)), c.want)
		}
	}
}

// A plain number with a leading zero is refused with its line: YAML 1.1
// (yaml.org/type/int, 2005) reads 017 as octal 15 and YAML 1.2.2's core
// schema (§10.3.2) as decimal 17; the decoder used here follows 1.1
// (checked below), so a specimen called 017 would become the test "15".
// Quoted, and in the 0o/0x forms both versions agree on, it passes.
func TestLeadingZeroIsRefused(t *testing.T) {
	var v struct {
		N int `yaml:"n"`
	}
	if err := yaml.Unmarshal([]byte("n: 017\n"), &v); err != nil || v.N != 15 {
		t.Fatalf("the decoder read 017 as %d (%v); this test's premise is octal 15", v.N, err)
	}
	for _, c := range []struct{ yaml, want string }{
		{"images: p\nname: 017\n", "line 2: 017: a number with a leading zero"},
		{"images: p\ncorrelation: {subset: 021}\n", "line 2: 021: a number with a leading zero"},
		{"images: p\nstrain:\n  window: -07\n", "line 3: -07"},
	} {
		_, err := Parse([]byte(c.yaml), "t.yaml")
		if err == nil || !strings.Contains(err.Error(), c.want) {
			t.Errorf("%q:\n got %v\nwant %q", c.yaml, err, c.want)
		}
	}
	for _, ok := range []string{"images: p\nname: '017'\n", "images: p\ncorrelation: {subset: 21}\n", "images: p\nstrain: {window: 0o11}\n", "images: p\nzones: {threshold: 0.5}\n", "images: p\nstrain: {static_frames: 0}\n"} {
		if _, err := Parse([]byte(ok), "t.yaml"); err != nil && strings.Contains(err.Error(), "leading zero") {
			t.Errorf("%q refused: %v", ok, err)
		}
	}
}
