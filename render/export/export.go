package export

import (
	"bufio"
	"errors"
	"fmt"
	"io/fs"
	"math"
	"os"
	"path/filepath"

	"spallscope/dic"
	"spallscope/dic/runfolder"
	"spallscope/strain"
	"spallscope/strain/strainfile"
)

// Folders of the run folder that an export writes.
const (
	VTKDir = "vtk"
	NPYDir = "npy"
	// SeriesFile is the PVD collection of the frames, in VTKDir.
	SeriesFile = "series.pvd"
)

// Options choose what an export writes.
type Options struct {
	// VTK and NPY select the formats; with neither set, both are written.
	VTK, NPY bool
	// Fields names the quantities (see FieldNames); nil exports u, v,
	// zncc and status, and every strain component when each frame has its
	// strain file.
	Fields []string
	// Scale overrides the image scale of run.json (0: use the recorded one).
	Scale dic.Scale
	// Progress, when set, is called after each frame.
	Progress func(done, total int)
}

// Result tells what an export wrote.
type Result struct {
	Frames int
	// Fields are the quantities exported, in order.
	Fields []string
	// Strain reports whether strain components are among them.
	Strain bool
	// LengthUnit is the unit of positions and displacements: mm or px.
	LengthUnit string
	// TimeSource is "camera" or "frame index" (no times recorded).
	TimeSource string
	// VTK and NPY are the folders written ("" for a format not chosen).
	VTK, NPY string
	// Files counts the files written.
	Files int
	// Notes tell the user of choices made for them, such as strain left
	// out because a frame has no strain file.
	Notes []string
}

// Export writes the fields of run folder dir to dir/vtk and dir/npy (see
// the package documentation for the layout). Frames are read one at a
// time; every frame must have the grid of the first. Errors name the file.
func Export(dir string, opt Options) (Result, error) {
	if !opt.VTK && !opt.NPY {
		opt.VTK, opt.NPY = true, true
	}
	names, err := runfolder.Frames(dir)
	if err != nil {
		return Result{}, err
	}
	var tr runfolder.TrackRecord
	if err := runfolder.Section(dir, "track", &tr); err != nil && !errors.Is(err, fs.ErrNotExist) {
		return Result{}, err
	}
	res := Result{Frames: len(names)}
	scale := runScale(dir, tr, opt.Scale)
	res.LengthUnit = "px"
	if scale.Known() {
		res.LengthUnit = "mm"
	}
	times, source, err := frameTimes(dir, tr, len(names))
	if err != nil {
		return res, err
	}
	res.TimeSource = source

	missing := firstMissingStrain(dir, names)
	qs, note, err := choose(opt.Fields, missing)
	if err != nil {
		return res, err
	}
	if note != "" {
		res.Notes = append(res.Notes, note)
	}
	for _, q := range qs {
		res.Fields = append(res.Fields, q.name)
		res.Strain = res.Strain || q.fromStrain()
	}

	first, err := runfolder.ReadField(runfolder.FieldPath(dir, names[0]))
	if err != nil {
		return res, err
	}
	g := first.Grid
	x, y := positions(g, scale)

	w := &writer{dir: dir, opt: opt, qs: qs, grid: g, scale: scale, x: x, y: y, names: names, times: times, timeSource: source}
	if err := w.open(); err != nil {
		return res, err
	}
	for i, name := range names {
		f := first
		if i > 0 {
			if f, err = runfolder.ReadField(runfolder.FieldPath(dir, name)); err != nil {
				w.abort()
				return res, err
			}
		}
		if err := w.frame(i, f); err != nil {
			w.abort()
			return res, err
		}
		if opt.Progress != nil {
			opt.Progress(i+1, len(names))
		}
	}
	if err := w.finish(&res); err != nil {
		return res, err
	}
	return res, nil
}

// runScale returns the scale to use: the override, else the track
// record's, else the one the strain stage recorded.
func runScale(dir string, tr runfolder.TrackRecord, override dic.Scale) dic.Scale {
	if override.Known() {
		return override
	}
	if tr.MMPerPx.Known() {
		return tr.MMPerPx
	}
	var sr strainfile.StrainRecord
	if runfolder.Section(dir, "strain", &sr) == nil && sr.MMPerPx.Known() {
		return sr.MMPerPx
	}
	return 0
}

// frameTimes returns the frames' camera times, or their indices when the
// track record has none.
func frameTimes(dir string, tr runfolder.TrackRecord, n int) ([]float64, string, error) {
	manifest := filepath.Join(dir, runfolder.ManifestFile)
	switch {
	case len(tr.Times) == 0:
		t := make([]float64, n)
		for i := range t {
			t[i] = float64(i)
		}
		return t, "frame index", nil
	case len(tr.Times) != n:
		return nil, "", fmt.Errorf("%s: track section has %d times for %d frames", manifest, len(tr.Times), n)
	}
	for i, t := range tr.Times {
		if math.IsNaN(t) || math.IsInf(t, 0) {
			return nil, "", fmt.Errorf("%s: track section: time %d is %g, expected a finite number of seconds", manifest, i, t)
		}
	}
	return tr.Times, "camera", nil
}

// firstMissingStrain returns the path of the first frame's strain file
// that does not exist, "" when every frame has one.
func firstMissingStrain(dir string, names []string) string {
	for _, n := range names {
		p := strainfile.StrainPath(dir, n)
		if _, err := os.Stat(p); err != nil {
			return p
		}
	}
	return ""
}

// choose resolves the fields to export. Without names it takes the
// defaults, adding strain when no strain file is missing, and says so when
// some but not all frames have strain. Named strain components with a
// missing strain file are an error naming it.
func choose(names []string, missingStrain string) ([]*quantity, string, error) {
	note := ""
	if names == nil {
		names = append([]string(nil), defaultFields...)
		switch {
		case missingStrain == "":
			names = append(names, strain.Components...)
		case !errors.Is(statErr(missingStrain), fs.ErrNotExist):
			note = fmt.Sprintf("strain not exported: %s cannot be read", missingStrain)
		case dirHasFiles(filepath.Dir(missingStrain)):
			note = fmt.Sprintf("strain not exported: %s is missing (strain stage not finished?)", missingStrain)
		}
	}
	qs, err := lookup(names)
	if err != nil {
		return nil, "", err
	}
	for _, q := range qs {
		if q.fromStrain() && missingStrain != "" {
			return nil, "", fmt.Errorf("export: field %s needs strain, but %s is missing (run strain first, or name displacement fields only)", q.name, missingStrain)
		}
	}
	return qs, note, nil
}

func statErr(path string) error {
	_, err := os.Stat(path)
	return err
}

// dirHasFiles reports whether folder exists and holds any entry.
func dirHasFiles(folder string) bool {
	ents, err := os.ReadDir(folder)
	return err == nil && len(ents) > 0
}

// positions returns the reference positions of g's points, row-major, in
// mm with a known scale, else in px.
func positions(g dic.Grid, scale dic.Scale) (x, y []float64) {
	x, y = make([]float64, g.Len()), make([]float64, g.Len())
	for i := range x {
		px, py := g.Pos(i)
		x[i], y[i] = lengthIn(float64(px), scale), lengthIn(float64(py), scale)
	}
	return x, y
}

// lengthIn converts a length in px to the export's unit.
func lengthIn(px float64, scale dic.Scale) float64 {
	if scale.Known() {
		return scale.MM(px)
	}
	return px
}

// writer carries an export through its frames: the open NPY stacks and
// the VTK files written so far.
type writer struct {
	dir   string
	opt   Options
	qs    []*quantity
	grid  dic.Grid
	scale dic.Scale
	x, y  []float64
	names []string
	times []float64
	// timeSource is "camera" or "frame index", as in Result.
	timeSource string
	stacks     []*stack
	vts        []string // VTS file names, relative to the vtk folder
	strain     bool     // some quantity needs the strain file
}

func (w *writer) vtkDir() string { return filepath.Join(w.dir, VTKDir) }
func (w *writer) npyDir() string { return filepath.Join(w.dir, NPYDir) }

// open makes the output folders and starts one NPY stack per quantity.
func (w *writer) open() error {
	for _, q := range w.qs {
		w.strain = w.strain || q.fromStrain()
	}
	if w.opt.VTK {
		if err := os.MkdirAll(w.vtkDir(), 0o755); err != nil {
			return err
		}
	}
	if w.opt.NPY {
		if err := os.MkdirAll(w.npyDir(), 0o755); err != nil {
			return err
		}
		for _, q := range w.qs {
			w.stacks = append(w.stacks, newStack(filepath.Join(w.npyDir(), q.name+".npy"), dtypeOf(q), len(w.names), w.grid.Rows, w.grid.Cols))
		}
	}
	return nil
}

func dtypeOf(q *quantity) string {
	if q.code {
		return dtypeUint8
	}
	return dtypeFloat64
}

// frame exports frame i, whose displacement field is f.
func (w *writer) frame(i int, f *dic.Field) error {
	name := w.names[i]
	fieldPath := runfolder.FieldPath(w.dir, name)
	if f.Grid != w.grid {
		return fmt.Errorf("%s: grid %+v differs from the first frame's %+v", fieldPath, f.Grid, w.grid)
	}
	var sf *strain.Field
	if w.strain {
		p := strainfile.StrainPath(w.dir, name)
		var err error
		if sf, err = strainfile.ReadStrain(p); err != nil {
			return err
		}
		if sf.Grid != w.grid {
			return fmt.Errorf("%s: grid %+v differs from the displacement grid %+v", p, sf.Grid, w.grid)
		}
	}
	n := w.grid.Len()
	planes := make([][]float64, len(w.qs))
	for k, q := range w.qs {
		plane := make([]float64, n)
		for j := range plane {
			if q.fromStrain() {
				plane[j] = q.strain(&sf.Points[j])
			} else {
				plane[j] = q.field(&f.Points[j])
			}
			if q.length {
				plane[j] = lengthIn(plane[j], w.scale)
			}
		}
		planes[k] = plane
	}
	if w.opt.VTK {
		if err := w.writeFrameVTS(i, f, sf, planes); err != nil {
			return err
		}
	}
	for k, s := range w.stacks {
		if err := s.add(planes[k]); err != nil {
			return err
		}
	}
	return nil
}

// writeFrameVTS writes frame i's StructuredGrid: the displacement vector
// when u and v are exported, each quantity, and the valid flags.
func (w *writer) writeFrameVTS(i int, f *dic.Field, sf *strain.Field, planes [][]float64) error {
	n := w.grid.Len()
	g := &vtsGrid{cols: w.grid.Cols, rows: w.grid.Rows, time: w.times[i], points: make([]float64, 3*n)}
	for j := 0; j < n; j++ {
		g.points[3*j], g.points[3*j+1] = w.x[j], w.y[j]
	}
	var u, v []float64
	for k, q := range w.qs {
		switch q.name {
		case "u":
			u = planes[k]
		case "v":
			v = planes[k]
		}
	}
	if u != nil && v != nil {
		d := make([]float64, 3*n)
		for j := 0; j < n; j++ {
			d[3*j], d[3*j+1] = u[j], v[j]
		}
		g.arrays = append(g.arrays, vtsArray{name: "displacement", comps: 3, vals: d})
		g.vectors = "displacement"
	}
	for k, q := range w.qs {
		g.arrays = append(g.arrays, vtsArray{name: q.name, comps: 1, uint8: q.code, vals: planes[k]})
		if g.scalars == "" && !q.code {
			g.scalars = q.name
		}
	}
	valid := make([]float64, n)
	for j := range valid {
		if f.Points[j].Valid() {
			valid[j] = 1
		}
	}
	g.arrays = append(g.arrays, vtsArray{name: "valid", comps: 1, uint8: true, vals: valid})
	if sf != nil {
		sv := make([]float64, n)
		for j := range sv {
			if sf.Points[j].Valid {
				sv[j] = 1
			}
		}
		g.arrays = append(g.arrays, vtsArray{name: "strain_valid", comps: 1, uint8: true, vals: sv})
	}
	file := w.names[i] + ".vts"
	if err := runfolder.WriteAtomic(filepath.Join(w.vtkDir(), file), func(bw *bufio.Writer) error { return writeVTS(bw, g) }); err != nil {
		return err
	}
	w.vts = append(w.vts, file)
	return nil
}

// abort ends the NPY stacks early, which removes their partial files.
func (w *writer) abort() {
	for _, s := range w.stacks {
		s.close()
	}
}

// finish completes the NPY stacks, then writes the small arrays and the
// listings (series.pvd, index.json) last.
func (w *writer) finish(res *Result) error {
	var first error
	for _, s := range w.stacks {
		if err := s.close(); err != nil && first == nil {
			first = err
		}
	}
	if first != nil {
		return first
	}
	if w.opt.NPY {
		if err := w.writeNPYExtras(); err != nil {
			return err
		}
		res.NPY = w.npyDir()
		res.Files += len(w.stacks) + 4 // stacks, x, y, times, index
	}
	if w.opt.VTK {
		p := filepath.Join(w.vtkDir(), SeriesFile)
		if err := runfolder.WriteAtomic(p, func(bw *bufio.Writer) error { return writePVD(bw, w.vts, w.times) }); err != nil {
			return err
		}
		res.VTK = w.vtkDir()
		res.Files += len(w.vts) + 1
	}
	return nil
}

// writeNPYExtras writes x.npy, y.npy, times.npy and index.json.
func (w *writer) writeNPYExtras() error {
	rows, cols, frames := w.grid.Rows, w.grid.Cols, len(w.names)
	unit := "px"
	if w.scale.Known() {
		unit = "mm"
	}
	timeUnit := "s"
	if w.timeSource != "camera" {
		timeUnit = "frame"
	}
	small := []struct {
		name string
		vals []float64
		ia   IndexArray
	}{
		{"x", w.x, IndexArray{Shape: []int{rows, cols}, Axes: []string{"row", "col"}, Unit: unit}},
		{"y", w.y, IndexArray{Shape: []int{rows, cols}, Axes: []string{"row", "col"}, Unit: unit}},
		{"times", w.times, IndexArray{Shape: []int{frames}, Axes: []string{"frame"}, Unit: timeUnit}},
	}
	ix := &Index{
		Format:     "NPY format 1.0, C order, little-endian; one file per array",
		Frames:     w.names,
		TimeSource: w.timeSource,
		LengthUnit: unit,
		MMPerPx:    w.scale,
		Grid:       w.grid,
		Missing:    "NaN in float64 arrays where a point has no measurement (status other than 1, or strain not valid)",
	}
	for _, s := range small {
		a := s.ia
		a.File, a.Name, a.DType = s.name+".npy", s.name, dtypeFloat64
		p := filepath.Join(w.npyDir(), a.File)
		if err := runfolder.WriteAtomic(p, func(bw *bufio.Writer) error { return writeNPY(bw, dtypeFloat64, a.Shape, s.vals) }); err != nil {
			return err
		}
		ix.Arrays = append(ix.Arrays, a)
	}
	for _, q := range w.qs {
		ix.Arrays = append(ix.Arrays, IndexArray{File: q.name + ".npy", Name: q.name, Shape: []int{frames, rows, cols},
			Axes: []string{"frame", "row", "col"}, DType: dtypeOf(q), Unit: q.unitFor(unit)})
		if q.code {
			ix.StatusCodes = StatusCodes()
		}
	}
	return runfolder.WriteAtomic(filepath.Join(w.npyDir(), IndexFile), func(bw *bufio.Writer) error { return writeIndex(bw, ix) })
}
