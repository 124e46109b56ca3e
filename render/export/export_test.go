package export

import (
	"encoding/json"
	"math"
	"os"
	"path/filepath"
	"slices"
	"strings"
	"testing"

	"codeberg.org/sbinet/npyio/npy"

	"spallscope/dic"
	"spallscope/dic/runfolder"
	"spallscope/strain/strainfile"
	"spallscope/subset"
)

// readNpyio reads a float64 NPY file with npyio, the second reader.
func readNpyio(t *testing.T, path string) ([]int, []float64) {
	t.Helper()
	fh, err := os.Open(path)
	if err != nil {
		t.Fatal(err)
	}
	defer fh.Close()
	r, err := npy.NewReader(fh)
	if err != nil {
		t.Fatalf("%s: %v", path, err)
	}
	var vs []float64
	if err := r.Read(&vs); err != nil {
		t.Fatalf("%s: %v", path, err)
	}
	return r.Header.Descr.Shape, vs
}

// A run folder with strain, camera times and a scale exports to both
// formats; every array is checked against the values the run folder was
// built from (the test's own formulas, through the field and strain CSV
// files), with NaN where a point has no measurement.
func TestExportRunFolder(t *testing.T) {
	const scale = 0.05
	times := []float64{0, 0.5, 1.25}
	dir, names := makeRun(t, runSpec{frames: 3, strain: 3, times: times, scale: scale})
	var progress []int
	res, err := Export(dir, Options{Progress: func(done, total int) { progress = append(progress, done) }})
	if err != nil {
		t.Fatal(err)
	}
	wantFields := append([]string{"u", "v", "zncc", "status"}, "exx", "eyy", "exy", "e1", "e2", "angle_deg", "gamma_max", "e_eq")
	if !slices.Equal(res.Fields, wantFields) || !res.Strain || res.LengthUnit != "mm" || res.TimeSource != "camera" || res.Frames != 3 {
		t.Errorf("result %+v", res)
	}
	if !slices.Equal(progress, []int{1, 2, 3}) {
		t.Errorf("progress %v", progress)
	}
	n := testGrid.Len()

	// NPY, by the spec parse and by npyio.
	npyDir := filepath.Join(dir, NPYDir)
	a := readNPYFile(t, filepath.Join(npyDir, "u.npy"))
	if !slices.Equal(a.shape, []int{3, 3, 4}) {
		t.Fatalf("u.npy shape %v, want (frames, rows, cols) = [3 3 4]", a.shape)
	}
	u := a.float64s(t)
	shape, v := readNpyio(t, filepath.Join(npyDir, "v.npy"))
	_, exx := readNpyio(t, filepath.Join(npyDir, "exx.npy"))
	if !slices.Equal(shape, []int{3, 3, 4}) || len(v) != 3*n || len(exx) != 3*n {
		t.Fatalf("v.npy shape %v with %d values, exx %d", shape, len(v), len(exx))
	}
	for k := 0; k < 3; k++ {
		for i := 0; i < n; i++ {
			wu, wv, we := scale*testU(k, i), scale*testV(k, i), testExx(k, i)
			if testStatus(k, i) != subset.Converged {
				wu, wv, we = math.NaN(), math.NaN(), math.NaN()
			}
			if i == 11 {
				we = math.NaN()
			}
			j := k*n + i
			if !near(u[j], wu, 1e-9) || !near(v[j], wv, 1e-9) || !near(exx[j], we, 1e-7) {
				t.Errorf("frame %d point %d: u %v v %v exx %v, want %v %v %v", k, i, u[j], v[j], exx[j], wu, wv, we)
			}
		}
	}
	st := readNPYFile(t, filepath.Join(npyDir, "status.npy"))
	if st.descr != "|u1" || st.data[0] != byte(subset.Unsolved) || st.data[n+5] != byte(subset.Lost) || st.data[n+4] != byte(subset.Converged) {
		t.Errorf("status.npy %s %v", st.descr, st.data)
	}
	_, cc := readNpyio(t, filepath.Join(npyDir, "zncc.npy"))
	if !math.IsNaN(cc[0]) || !near(cc[n+5], 0.3, 1e-9) || !near(cc[1], 0.99, 1e-9) {
		t.Errorf("zncc: unsolved %v (want NaN), lost %v (want its 0.3), converged %v", cc[0], cc[n+5], cc[1])
	}
	x := readNPYFile(t, filepath.Join(npyDir, "x.npy"))
	y := readNPYFile(t, filepath.Join(npyDir, "y.npy"))
	xs, ys := x.float64s(t), y.float64s(t)
	if !slices.Equal(x.shape, []int{3, 4}) || !near(xs[5], scale*15, 1e-12) || !near(ys[5], scale*25, 1e-12) {
		t.Errorf("x.npy %v %v, y.npy %v: point 5 is at (15, 25) px", x.shape, xs, ys)
	}
	tm := readNPYFile(t, filepath.Join(npyDir, "times.npy"))
	if got := tm.float64s(t); !slices.Equal(tm.shape, []int{3}) || !slices.Equal(got, times) {
		t.Errorf("times.npy %v %v, want %v", tm.shape, got, times)
	}

	var ix Index
	b, err := os.ReadFile(filepath.Join(npyDir, IndexFile))
	if err != nil {
		t.Fatal(err)
	}
	if err := json.Unmarshal(b, &ix); err != nil {
		t.Fatal(err)
	}
	if !slices.Equal(ix.Frames, names) || ix.LengthUnit != "mm" || ix.TimeSource != "camera" || ix.Grid != testGrid || ix.StatusCodes[6] != "lost" {
		t.Errorf("index %+v", ix)
	}
	units := map[string]string{}
	for _, a := range ix.Arrays {
		units[a.Name] = a.Unit
		if _, err := os.Stat(filepath.Join(npyDir, a.File)); err != nil {
			t.Errorf("index lists %s: %v", a.File, err)
		}
		if len(a.Shape) == 3 && !slices.Equal(a.Shape, []int{3, 3, 4}) {
			t.Errorf("index: %s shape %v", a.Name, a.Shape)
		}
	}
	if len(ix.Arrays) != 3+len(wantFields) || units["u"] != "mm" || units["x"] != "mm" || units["exx"] != "1" || units["angle_deg"] != "deg" || units["times"] != "s" {
		t.Errorf("index lists %d arrays, units %v", len(ix.Arrays), units)
	}

	// VTK: the series lists every frame with its time; each frame's grid
	// carries positions in mm and the same values.
	pvd := readPVD(t, filepath.Join(dir, VTKDir, SeriesFile))
	if len(pvd.DataSets) != 3 {
		t.Fatalf("series lists %d frames, want 3", len(pvd.DataSets))
	}
	for k, ds := range pvd.DataSets {
		if ds.File != names[k]+".vts" || ds.Timestep != []string{"0", "0.5", "1.25"}[k] {
			t.Errorf("series entry %d: %+v", k, ds)
		}
		doc := readVTS(t, filepath.Join(dir, VTKDir, ds.File))
		if doc.Grid.WholeExtent != "0 3 0 2 0 0" {
			t.Errorf("%s: whole extent %q, want 0 3 0 2 0 0", ds.File, doc.Grid.WholeExtent)
		}
		pts := doc.Grid.Piece.Points[0].values(t)
		if len(pts) != 3*n || !near(pts[3*5], scale*15, 1e-12) || !near(pts[3*5+1], scale*25, 1e-12) || pts[3*5+2] != 0 {
			t.Errorf("%s: point 5 at (%v, %v, %v), want (0.75, 1.25, 0) mm", ds.File, pts[15], pts[16], pts[17])
		}
		vu := doc.array(t, "u", "Float64", 1)
		ve := doc.array(t, "exx", "Float64", 1)
		valid := doc.array(t, "valid", "UInt8", 1)
		sv := doc.array(t, "strain_valid", "UInt8", 1)
		disp := doc.array(t, "displacement", "Float64", 3)
		for i := 0; i < n; i++ {
			j := k*n + i
			if !near(vu[i], u[j], 0) || !near(ve[i], exx[j], 0) || !near(disp[3*i], u[j], 0) || !near(disp[3*i+1], v[j], 0) {
				t.Errorf("%s point %d: u %v exx %v displacement %v, the NPY has %v %v", ds.File, i, vu[i], ve[i], disp[3*i:3*i+3], u[j], exx[j])
			}
			if (valid[i] == 1) != (testStatus(k, i) == subset.Converged) || (sv[i] == 1) != (valid[i] == 1 && i != 11) {
				t.Errorf("%s point %d: valid %v strain_valid %v", ds.File, i, valid[i], sv[i])
			}
		}
		if st := doc.array(t, "status", "UInt8", 1); st[0] != 0 || (k == 1) != (st[5] == float64(subset.Lost)) {
			t.Errorf("%s: status %v", ds.File, st)
		}
	}
	if l := leftovers(t, dir); len(l) > 0 {
		t.Errorf("temporary files left: %v", l)
	}
	if res.Files != 3+1+len(wantFields)+4 {
		t.Errorf("result counts %d files", res.Files)
	}
}

// Without strain files, times or scale: displacement only, frame indices
// as times, positions and displacements in px.
func TestExportDisplacementOnly(t *testing.T) {
	dir, _ := makeRun(t, runSpec{frames: 2})
	res, err := Export(dir, Options{NPY: true})
	if err != nil {
		t.Fatal(err)
	}
	if !slices.Equal(res.Fields, []string{"u", "v", "zncc", "status"}) || res.Strain || res.LengthUnit != "px" || res.TimeSource != "frame index" || res.VTK != "" || len(res.Notes) != 0 {
		t.Errorf("result %+v", res)
	}
	if _, err := os.Stat(filepath.Join(dir, VTKDir)); err == nil {
		t.Error("vtk folder written with only NPY chosen")
	}
	if _, err := os.Stat(filepath.Join(dir, NPYDir, "exx.npy")); err == nil {
		t.Error("exx.npy written without strain files")
	}
	_, u := readNpyio(t, filepath.Join(dir, NPYDir, "u.npy"))
	if !near(u[testGrid.Len()+3], testU(1, 3), 1e-9) {
		t.Errorf("u in px: %v, want %v", u[testGrid.Len()+3], testU(1, 3))
	}
	_, x := readNpyio(t, filepath.Join(dir, NPYDir, "x.npy"))
	_, tm := readNpyio(t, filepath.Join(dir, NPYDir, "times.npy"))
	if x[1] != 15 || !slices.Equal(tm, []float64{0, 1}) {
		t.Errorf("x %v (px), times %v (frame indices)", x, tm)
	}
	var ix Index
	b, _ := os.ReadFile(filepath.Join(dir, NPYDir, IndexFile))
	json.Unmarshal(b, &ix)
	for _, a := range ix.Arrays {
		if a.Name == "times" && a.Unit != "frame" {
			t.Errorf("times unit %q, want frame", a.Unit)
		}
	}

	// Gradients on request, VTK only.
	res, err = Export(dir, Options{VTK: true, Fields: []string{"dudx", "u"}})
	if err != nil {
		t.Fatal(err)
	}
	doc := readVTS(t, filepath.Join(dir, VTKDir, "f_0001.vts"))
	if g := doc.array(t, "dudx", "Float64", 1); !near(g[1], 2e-3, 1e-9) || !math.IsNaN(g[0]) {
		t.Errorf("dudx %v", g)
	}
	for _, a := range doc.Grid.Piece.PointData.Arrays {
		if a.Name == "displacement" || a.Name == "strain_valid" {
			t.Errorf("array %s written without v / strain", a.Name)
		}
	}
}

// Strain present for only some frames: the defaults leave it out and say
// why; naming a strain component is an error naming the missing file.
func TestExportPartialStrain(t *testing.T) {
	dir, names := makeRun(t, runSpec{frames: 3, strain: 2})
	missing := strainfile.StrainPath(dir, names[2])
	res, err := Export(dir, Options{NPY: true})
	if err != nil {
		t.Fatal(err)
	}
	if res.Strain || len(res.Notes) != 1 || !strings.Contains(res.Notes[0], missing) {
		t.Errorf("result %+v: want strain left out with a note naming %s", res, missing)
	}
	_, err = Export(dir, Options{Fields: []string{"u", "exx"}})
	if err == nil || !strings.Contains(err.Error(), missing) {
		t.Errorf("exx with a missing strain file: %v, want an error naming %s", err, missing)
	}
}

func TestExportBadFields(t *testing.T) {
	dir, _ := makeRun(t, runSpec{frames: 1})
	for _, c := range []struct {
		fields []string
		want   string
	}{
		{[]string{"u", "wobble"}, `unknown field "wobble", expected some of u,v,dudx`},
		{[]string{"u", "U"}, `field "u" named twice`},
		{[]string{" "}, "no fields named"},
	} {
		if _, err := Export(dir, Options{Fields: c.fields}); err == nil || !strings.Contains(err.Error(), c.want) {
			t.Errorf("fields %q: %v, want %q", c.fields, err, c.want)
		}
	}
}

// A frame that cannot be read stops the export with its file named, and
// leaves no NPY stack, no listing and no temporary file: what exists of
// an export is complete.
func TestExportBadFrameLeavesNoPartialFiles(t *testing.T) {
	dir, names := makeRun(t, runSpec{frames: 3, strain: 3})
	bad := runfolder.FieldPath(dir, names[2])
	if err := os.WriteFile(bad, []byte(runfolder.FieldHeader+"\n1,2,x\n"), 0o644); err != nil {
		t.Fatal(err)
	}
	_, err := Export(dir, Options{})
	if err == nil || !strings.Contains(err.Error(), bad) {
		t.Fatalf("corrupt frame: %v, want an error naming %s", err, bad)
	}
	ents, _ := os.ReadDir(filepath.Join(dir, NPYDir))
	if len(ents) != 0 {
		t.Errorf("npy folder after a failed export: %v", ents)
	}
	if _, err := os.Stat(filepath.Join(dir, VTKDir, SeriesFile)); err == nil {
		t.Error("series.pvd written by a failed export")
	}
	if l := leftovers(t, dir); len(l) > 0 {
		t.Errorf("temporary files left: %v", l)
	}
}

// Every frame must have the first frame's grid, and strain the grid of
// its displacement field; the error names the file.
func TestExportGridMismatch(t *testing.T) {
	dir, names := makeRun(t, runSpec{frames: 2, strain: 2})
	g := testGrid
	g.Cols = 3
	f := &dic.Field{Name: names[1], Grid: g}
	for i := 0; i < g.Len(); i++ {
		x, y := g.Pos(i)
		f.Points = append(f.Points, dic.Point{X: x, Y: y, Status: subset.Converged, ZNCC: 0.9})
	}
	p := runfolder.FieldPath(dir, names[1])
	if err := runfolder.WriteField(p, f, 0); err != nil {
		t.Fatal(err)
	}
	if _, err := Export(dir, Options{}); err == nil || !strings.Contains(err.Error(), p) || !strings.Contains(err.Error(), "grid") {
		t.Errorf("grid mismatch: %v, want an error naming %s", err, p)
	}
}

// Times that do not match the frames are an error naming run.json.
func TestExportTimesMismatch(t *testing.T) {
	dir, _ := makeRun(t, runSpec{frames: 3, times: []float64{0, 1}})
	if _, err := Export(dir, Options{}); err == nil || !strings.Contains(err.Error(), filepath.Join(dir, runfolder.ManifestFile)) {
		t.Errorf("2 times for 3 frames: %v", err)
	}
}
