package job

import (
	"bytes"
	"encoding/json"
	"os"
	"path/filepath"
	"sync"
	"testing"

	"spallscope/cmd/spallscope/internal/config"
	"spallscope/dic/runfolder"
	"spallscope/dic/synth"
	"spallscope/strain/strainfile"
)

// The tests of this package run the job on one tiny synthetic test: the
// repository's band fixture (240 px, 14 frames, a Kirsch field around one
// opening with a band growing late), rendered once per test binary.
var band struct {
	once sync.Once
	dir  string
	err  error
}

// bandPhotos renders the band fixture once and returns its folder.
func bandPhotos(t *testing.T) string {
	t.Helper()
	band.once.Do(func() {
		band.dir, band.err = os.MkdirTemp("", "job-band-")
		if band.err != nil {
			return
		}
		var sc synth.Scenario
		data, err := os.ReadFile(filepath.Join("..", "..", "..", "..", "testdata", "band_small.json"))
		if err != nil {
			band.err = err
			return
		}
		if band.err = json.Unmarshal(data, &sc); band.err != nil {
			return
		}
		_, band.err = synth.Write(&sc, filepath.Join(band.dir, "synth"), nil)
	})
	if band.err != nil {
		t.Fatal(band.err)
	}
	return band.dir
}

func TestMain(m *testing.M) {
	code := m.Run()
	if band.dir != "" {
		os.RemoveAll(band.dir)
	}
	if lensFixture.dir != "" {
		os.RemoveAll(lensFixture.dir)
	}
	os.Exit(code)
}

// bandConfig is the band test's config; extra YAML is appended.
const bandConfig = `name: band
images: synth/frames
times: {fps: 1}
scale: {mm_per_px: 0.1}
openings: [{name: A, shape: "circle:119.5,119.5,40"}]
correlation: {subset: 21, step: 5}
strain: {window: 5}
zones: {calibrate_below: 0.35}
load: {file: synth/loadlog.csv, area_mm2: 480, clock_offset_s: 2}
`

// bandTest writes the band test's config (with extra keys, or with the
// base config's lines replaced by edit) beside the photos and reads it.
func bandTest(t *testing.T, name, body string) *config.Test {
	t.Helper()
	return writeTest(t, bandPhotos(t), name, body)
}

// writeTest writes a test config named name with body into dir and reads
// it back as the job would.
func writeTest(t *testing.T, dir, name, body string) *config.Test {
	t.Helper()
	path := filepath.Join(dir, name+".yaml")
	if err := os.WriteFile(path, []byte(body), 0o644); err != nil {
		t.Fatal(err)
	}
	tc, err := config.Read(path)
	if err != nil {
		t.Fatal(err)
	}
	return tc
}

// results reads a run folder's fields, strains, zones and onsets, by name.
func results(t *testing.T, dir string) map[string][]byte {
	t.Helper()
	out := map[string][]byte{}
	for _, sub := range []string{runfolder.FieldsDir, strainfile.StrainDir} {
		files, _ := filepath.Glob(filepath.Join(dir, sub, "*.csv"))
		for _, f := range files {
			b, _ := os.ReadFile(f)
			out[filepath.Join(sub, filepath.Base(f))] = b
		}
	}
	for _, f := range []string{strainfile.ZonesCSV, strainfile.ZoneCellsCSV} {
		b, _ := os.ReadFile(filepath.Join(dir, f))
		out[f] = b
	}
	return out
}

// sameResults reports the files that differ between two run folders.
func sameResults(t *testing.T, a, b string) {
	t.Helper()
	ra, rb := results(t, a), results(t, b)
	if len(ra) != len(rb) || len(ra) < 2*14 {
		t.Fatalf("%d result files in %s, %d in %s", len(ra), a, len(rb), b)
	}
	for name, want := range ra {
		if !bytes.Equal(want, rb[name]) {
			t.Errorf("%s differs between %s and %s", name, a, b)
		}
	}
}
