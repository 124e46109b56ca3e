package config

import (
	"os"
	"path/filepath"
	"strings"
	"testing"
)

// CheckPathName refuses every name that is not one plain path component.
// The rules: "." and ".." name folders and "/" separates components
// (POSIX.1-2017, Base Definitions §4.13 Pathname Resolution); "\" is the
// separator on Windows, where configs are often written (common practice,
// no source); control characters are Unicode general category Cc, the
// invisible formatting ones Cf (Unicode Standard §4.5, as Go's unicode
// tables give them). NameMaxBytes is ours: 100 bytes, well inside POSIX's
// 255-byte NAME_MAX with room for "_runs".
func TestCheckPathName(t *testing.T) {
	for _, ok := range []string{"B-07", "block 7", "Bloc é", "a.b", "x..y", "B_07 (repeat)", "T" + strings.Repeat("x", NameMaxBytes-1)} {
		if err := CheckPathName("test name", ok); err != nil {
			t.Errorf("CheckPathName(%q): %v, want it accepted", ok, err)
		}
	}
	for _, c := range []struct{ name, why string }{
		{"", "is empty"},
		{".", "is a reference to a folder"},
		{"..", "is a reference to a folder"},
		{"../../home", `contains the path separator '/'`},
		{"a/b", `contains the path separator '/'`},
		{`..\..\x`, `contains the path separator '\\'`},
		{".hidden", "starts with a dot"},
		{"a\nb", "control or formatting character U+000A at byte 1"},
		{"a\x00b", "U+0000 at byte 1"},
		{"a\tb", "U+0009"},
		{"\x1b[31mred", "U+001B at byte 0"},
		{"a\u202eb", "U+202E"}, // right-to-left override: shows another name
		{"a\u2028b", "U+2028"}, // line separator
		{"a\u0085b", "U+0085"}, // next line (C1 control)
		{" a", "starts or ends with a blank"},
		{"a ", "starts or ends with a blank"},
		{"\xffname", "is not valid UTF-8"},
		{strings.Repeat("x", NameMaxBytes+1), "is 101 bytes long, more than 100"},
	} {
		err := CheckPathName("faces[2].name", c.name)
		if err == nil || !strings.HasPrefix(err.Error(), "faces[2].name ") || !strings.Contains(err.Error(), c.why) ||
			!strings.Contains(err.Error(), "it becomes a folder name") {
			t.Errorf("CheckPathName(%q): %v, want it refused naming faces[2].name: %s", c.name, err, c.why)
		}
	}
}

// A test or face name that would put a run folder outside the campaign's
// folder, hide it, or break the files it is written into is refused when
// the config is read, naming the config file and the name. Before, Parse
// accepted all of them, and a run into "<out>/../../x" cleared fields/ and
// strain/ there.
func TestParseRefusesPathNames(t *testing.T) {
	for _, c := range []struct{ yaml, want string }{
		{"name: ../../x\nimages: p\n", `test name "../../x" contains the path separator '/'`},
		{"name: ..\nimages: p\n", `test name ".." is a reference to a folder`},
		{"name: \"B-07\\r\\n\"\nimages: p\n", `test name "B-07\r\n" starts or ends with a blank`},
		{"name: \"B\\u001b]0;owned\\u0007\"\nimages: p\n", `U+001B at byte 1`},
		{"images: p\nfaces:\n  - {name: west}\n  - {name: ../east}\n", `faces[1].name "../east" contains the path separator '/'`},
		{"images: p\nfaces:\n  - {name: \"\"}\n", `faces[0].name "" is empty`},
		{"images: p\nfaces:\n  - {name: .cache}\n", `faces[0].name ".cache" starts with a dot`},
		{"images: p\nfaces:\n  - {name: w}\n  - {name: w}\n", `faces[1].name "w": used by faces[0] too`},
	} {
		_, err := Parse([]byte(c.yaml), "/lab/b07.yaml")
		if err == nil || !strings.HasPrefix(err.Error(), "test config /lab/b07.yaml: ") || !strings.Contains(err.Error(), c.want) {
			t.Errorf("%q: error %v, want it to name the file and contain %q", c.yaml, err, c.want)
		}
	}
	// The default name, the file's stem, is checked too, and the error
	// says where it came from and how to give another.
	_, err := Parse([]byte("images: p\n"), "/lab/.b07.yaml")
	if want := `test name (from the file name; set name: to choose another) ".b07" starts with a dot`; err == nil || !strings.Contains(err.Error(), want) {
		t.Errorf("hidden file's stem: %v, want %q", err, want)
	}
	// Plain names pass, the stem included.
	for _, y := range []string{"name: B-07 repeat\nimages: p\n", "images: p\n", "images: p\nfaces: [{name: west}, {name: east}]\n"} {
		if _, err := Parse([]byte(y), "/lab/b07.yaml"); err != nil {
			t.Errorf("%q: %v", y, err)
		}
	}
}

// Opening names never become paths (they label zones.csv rows, onset.json,
// the report and the terminal's onset table), so "/" is fine in them; but
// a control character would break a CSV row or drive the terminal, and
// two openings of one name make onsets ambiguous. Before, all passed.
func TestOpeningNames(t *testing.T) {
	ok := "images: p\nopenings:\n  - {name: W/1, shape: \"circle:10,10,5\"}\n  - {shape: \"circle:40,10,5\"}\n"
	if _, err := Parse([]byte(ok), "t.yaml"); err != nil {
		t.Errorf("opening W/1 and an unnamed one: %v", err)
	}
	for _, c := range []struct{ yaml, want string }{
		{"images: p\nopenings:\n  - {name: \"W\\e[2J\", shape: \"circle:10,10,5\"}\n", `openings[0].name "W\x1b[2J" holds the control or formatting character U+001B`},
		{"images: p\nopenings:\n  - {name: \"A\\nB\", shape: \"circle:10,10,5\"}\n", `openings[0].name "A\nB" holds`},
		{"images: p\nopenings:\n  - {name: A, shape: \"circle:10,10,5\"}\n  - {name: A, shape: \"circle:40,10,5\"}\n", `openings[1].name "A": used by openings[0] too`},
		{"images: p\nopenings:\n  - {name: A, shape: \"circle:10,10,NaN\"}\n", `openings[0]: shape "circle:10,10,NaN": circle radius NaN`},
		{"images: p\nopenings:\n  - {name: A}\n", `openings[0]: shape is required`},
		{"images: p\nexclude: [\"rect:5,5,1,1\"]\n", `exclude[0]: shape "rect:5,5,1,1"`},
		{"images: p\nroi: \"1,2,x\"\n", `roi: roi "1,2,x": expected x0,y0,x1,y1`},
		{"images: p\nfaces:\n  - {name: w, roi: \"polygon:0,0,1,1\"}\n", `faces[0].roi: roi "polygon:0,0,1,1"`},
	} {
		_, err := Parse([]byte(c.yaml), "t.yaml")
		if err == nil || !strings.Contains(err.Error(), c.want) {
			t.Errorf("%q: error %v, want %q", c.yaml, err, c.want)
		}
	}
}

// writeFiles writes name → content into dir.
func writeFiles(t *testing.T, dir string, files map[string]string) {
	t.Helper()
	for name, content := range files {
		if err := os.WriteFile(filepath.Join(dir, name), []byte(content), 0o644); err != nil {
			t.Fatal(err)
		}
	}
}
