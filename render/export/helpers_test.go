package export

import (
	"bytes"
	"encoding/binary"
	"fmt"
	"math"
	"os"
	"path/filepath"
	"regexp"
	"strconv"
	"strings"
	"testing"

	"spallscope/dic"
	"spallscope/dic/runfolder"
	"spallscope/strain"
	"spallscope/strain/strainfile"
	"spallscope/subset"
)

// testGrid is the grid of the test run folders: 4 columns, 3 rows.
var testGrid = dic.Grid{X0: 10, Y0: 20, Step: 5, Cols: 4, Rows: 3}

// The test run's values, chosen so that every point and frame differs.
func testU(frame, i int) float64   { return 0.1*float64(frame) + 0.01*float64(i) }
func testV(frame, i int) float64   { return -0.2*float64(frame) + 0.001*float64(i) }
func testExx(frame, i int) float64 { return 1e-3*float64(frame) + 1e-5*float64(i) }

// testStatus: point 0 is never solved, point 5 is lost in frame 1; the
// strain of point 11 is never valid (too few neighbours, say).
func testStatus(frame, i int) subset.Status {
	switch {
	case i == 0:
		return subset.Unsolved
	case i == 5 && frame == 1:
		return subset.Lost
	}
	return subset.Converged
}

type runSpec struct {
	frames int
	strain int // frames with a strain file (the first ones)
	times  []float64
	scale  dic.Scale
}

// makeRun writes a run folder of spec through the run folder's own
// writers and returns it with the frame names.
func makeRun(t *testing.T, spec runSpec) (string, []string) {
	t.Helper()
	dir := t.TempDir()
	var names []string
	for k := 0; k < spec.frames; k++ {
		name := fmt.Sprintf("f_%04d", k)
		names = append(names, name)
		f := &dic.Field{Index: k, Name: name, Grid: testGrid}
		sf := &strain.Field{Index: k, Name: name, Grid: testGrid}
		for i := 0; i < testGrid.Len(); i++ {
			x, y := testGrid.Pos(i)
			p := dic.Point{X: x, Y: y, Status: testStatus(k, i), ZNCC: 0.99, Iterations: 3}
			if p.Status == subset.Lost {
				p.ZNCC = 0.3
			}
			if p.Status == subset.Unsolved {
				p.ZNCC = 0
			}
			p.P[subset.PU], p.P[subset.PV] = testU(k, i), testV(k, i)
			p.P[subset.PUx] = 2e-3
			f.Points = append(f.Points, p)
			sp := strain.Point{X: x, Y: y, Exx: testExx(k, i), Eyy: -testExx(k, i), Exy: 1e-4, E1: testExx(k, i), E2: -testExx(k, i), AngleDeg: 30, GammaMax: 2 * testExx(k, i), Eeq: testExx(k, i), Valid: p.Valid() && i != 11}
			sf.Points = append(sf.Points, sp)
		}
		if err := runfolder.WriteField(runfolder.FieldPath(dir, name), f, 0); err != nil {
			t.Fatal(err)
		}
		if k < spec.strain {
			if err := strainfile.WriteStrain(strainfile.StrainPath(dir, name), sf, 0); err != nil {
				t.Fatal(err)
			}
		}
	}
	if err := runfolder.SetSection(dir, "track", runfolder.TrackRecord{Frames: names, Times: spec.times, MMPerPx: spec.scale, Grid: testGrid}); err != nil {
		t.Fatal(err)
	}
	return dir, names
}

// npyArray is an NPY file parsed by the test's own reader.
type npyArray struct {
	descr string
	shape []int
	data  []byte
}

var npyDict = regexp.MustCompile(`^\{'descr': '([<>|][a-z][0-9]+)', 'fortran_order': False, 'shape': \(([0-9, ]*)\), \} *\n$`)

// readNPYSpec parses an NPY file by the format proposal (NEP 1, format
// 1.0), independently of the writer: magic, version 1.0, little-endian
// uint16 header length, a dict literal padded with spaces to a 16-byte
// boundary (64 here) and ended by a newline, then the data.
func readNPYSpec(t *testing.T, b []byte) npyArray {
	t.Helper()
	if len(b) < 10 || string(b[:6]) != "\x93NUMPY" {
		t.Fatalf("npy: no magic string: % x", b[:min(10, len(b))])
	}
	if b[6] != 1 || b[7] != 0 {
		t.Fatalf("npy: version %d.%d, want 1.0", b[6], b[7])
	}
	hlen := int(binary.LittleEndian.Uint16(b[8:10]))
	if 10+hlen > len(b) {
		t.Fatalf("npy: header length %d beyond the file's %d bytes", hlen, len(b))
	}
	if (10+hlen)%16 != 0 {
		t.Errorf("npy: data start at byte %d, not on a 16-byte boundary", 10+hlen)
	}
	m := npyDict.FindStringSubmatch(string(b[10 : 10+hlen]))
	if m == nil {
		t.Fatalf("npy: header dict %q not of the expected form", b[10:10+hlen])
	}
	a := npyArray{descr: m[1], data: b[10+hlen:]}
	for _, d := range strings.Split(m[2], ",") {
		if d = strings.TrimSpace(d); d != "" {
			n, _ := strconv.Atoi(d)
			a.shape = append(a.shape, n)
		}
	}
	return a
}

// float64s decodes a '<f8' array's data.
func (a npyArray) float64s(t *testing.T) []float64 {
	t.Helper()
	if a.descr != "<f8" {
		t.Fatalf("npy: descr %s, want <f8", a.descr)
	}
	vs := make([]float64, len(a.data)/8)
	if err := binary.Read(bytes.NewReader(a.data), binary.LittleEndian, vs); err != nil {
		t.Fatal(err)
	}
	return vs
}

// readNPYFile reads and parses path by the format proposal.
func readNPYFile(t *testing.T, path string) npyArray {
	t.Helper()
	b, err := os.ReadFile(path)
	if err != nil {
		t.Fatal(err)
	}
	return readNPYSpec(t, b)
}

// near compares with a relative tolerance for values read back from the
// run folder's CSV files (10 significant digits for displacement, 8 for
// strain); NaN matches only NaN.
func near(got, want, rel float64) bool {
	if math.IsNaN(want) || math.IsNaN(got) {
		return math.IsNaN(want) && math.IsNaN(got)
	}
	return math.Abs(got-want) <= rel*math.Max(math.Abs(want), 1e-12)
}

// leftovers lists the temporary files of atomic writes left in folder.
func leftovers(t *testing.T, folder string) []string {
	t.Helper()
	var out []string
	filepath.WalkDir(folder, func(p string, d os.DirEntry, err error) error {
		if err == nil && strings.Contains(d.Name(), ".partial-") {
			out = append(out, p)
		}
		return nil
	})
	return out
}
