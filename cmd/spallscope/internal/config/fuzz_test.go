package config

import (
	"os"
	"path/filepath"
	"testing"
)

// maxErrorBytes bounds a config error's message: excerpts of long values,
// ProblemsShown problems, never the input echoed whole.
const maxErrorBytes = 10_000

// FuzzReadTest checks that no YAML makes Parse panic, that an error's
// message stays short, and that a config Parse accepts passes its own
// checks again and converts into every stage's settings (track, strain,
// zones, scale, load and AE clocks, each face's) without an error: what
// the edge lets through, no stage refuses later. `go test` runs the
// seeds; `go test -fuzz FuzzReadTest` explores further.
func FuzzReadTest(f *testing.F) {
	example, err := os.ReadFile(filepath.Join("..", "..", "..", "..", "testdata", "example_test.yaml"))
	if err != nil {
		f.Fatal(err)
	}
	f.Add(example)
	for _, s := range []string{
		"images: p\n",
		"images: p\nzones: {foo: 1}\n",
		"images: p\nfaces: [{name: w, images: a, times: {fps: 2}}, {name: e, scale: {line: [0, 0, 3, 4, 5]}}]\nload: {file: f, area_mm2: 1}\nmodel: {file: m, load_mpa: 3, face: e}\n",
		"images: p\nopenings: [{name: A, shape: \"circle:10,10,5\"}, {shape: \"ellipse:40,10,5,3,30\"}]\nroi: 0,0,100,100\nexclude: [\"polygon:0,0,5,0,0,5\"]\n",
		"a: &a [1, 2]\nb: &b [*a, *a]\nc: [*b, *b]\n",
		"images: p\ncorrelation:\n  <<: {subset: 21}\n  seeds: [[1, 2]]\n",
		"name: \"\\u202e\"\nimages: p\n",
		"images: p\nstrain: {window: 1e400}\n",
		"--- \nimages: p\n...\n---\nimages: q\n",
		"images: !!binary aGVsbG8=\n",
		"? [a, b]\n: c\n",
		"images: p\nzones: {threshold: \"6mad,500ue\", indicators: [e1, decorrelation]}\nae: {file: a, background_s: [0, 5], k: 2}\n",
	} {
		f.Add([]byte(s))
	}
	for _, c := range settingCases {
		f.Add([]byte("images: p\n" + c.yaml + "\n"))
	}
	f.Fuzz(func(t *testing.T, data []byte) {
		c, err := Parse(data, "fuzz.yaml")
		if err != nil {
			if n := len(err.Error()); n > maxErrorBytes {
				t.Fatalf("error of %d bytes: %.300s…", n, err)
			}
			return
		}
		if err := c.check(c.Name != ""); err != nil {
			t.Fatalf("accepted, then its own check says: %v", err)
		}
		tests := []*Test{c}
		for i := range c.Faces {
			tests = append(tests, c.FaceTest(i))
		}
		for _, ft := range tests {
			if err := CheckPathName("name", ft.Name); err != nil {
				t.Fatalf("accepted a name that is no folder name: %v", err)
			}
			if _, err := ft.Correlation.Settings(); err != nil {
				t.Fatalf("accepted; correlation: %v", err)
			}
			if _, err := ft.Strain.StrainWindow(); err != nil {
				t.Fatalf("accepted; strain: %v", err)
			}
			if _, err := ft.Zones.Stage(ft.Openings); err != nil {
				t.Fatalf("accepted; zones: %v", err)
			}
			if _, err := ft.Scale.Value(); err != nil {
				t.Fatalf("accepted; scale: %v", err)
			}
			if err := ft.Load.check(); err != nil {
				t.Fatalf("accepted; load: %v", err)
			}
			if _, err := ft.AE.Clock(); err != nil {
				t.Fatalf("accepted; AE clock: %v", err)
			}
			if err := ft.Times.check("times"); err != nil {
				t.Fatalf("accepted; times: %v", err)
			}
			if ft.ROI != "" {
				if _, err := ParseROI(ft.ROI); err != nil {
					t.Fatalf("accepted; roi: %v", err)
				}
			}
		}
	})
}
