package export

import (
	"encoding/json"
	"os/exec"
	"slices"
	"strings"
	"testing"
)

// pythonWith returns a Python interpreter that imports every module, or
// skips the test: these cross-checks run where the machine has the
// readers (Debian's python3-numpy, and python3-vtk9 or python3-paraview,
// which bundles VTK) and are
// not needed elsewhere, the Go tests above checking the same files by the
// specifications.
func pythonWith(t *testing.T, modules ...string) string {
	t.Helper()
	for _, py := range []string{"python3", "/usr/bin/python3"} {
		path, err := exec.LookPath(py)
		if err != nil {
			continue
		}
		if exec.Command(path, "-c", "import "+strings.Join(modules, ", ")).Run() == nil {
			return path
		}
	}
	t.Skipf("no Python with %s: cross-check skipped", strings.Join(modules, ", "))
	return ""
}

// runPython runs script with args and decodes its JSON output into v.
func runPython(t *testing.T, py, script string, v any, args ...string) {
	t.Helper()
	cmd := exec.Command(py, append([]string{"-c", script}, args...)...)
	out, err := cmd.Output()
	if err != nil {
		msg := ""
		if ee, ok := err.(*exec.ExitError); ok {
			msg = string(ee.Stderr)
		}
		t.Fatalf("python: %v\n%s", err, msg)
	}
	if err := json.Unmarshal(out, v); err != nil {
		t.Fatalf("python output %q: %v", out, err)
	}
}

const numpyVTKScript = `
import json, math, os, sys
import xml.etree.ElementTree as ET
import numpy as np
from vtkmodules.vtkCommonCore import vtkOutputWindow, vtkStringOutputWindow
from vtkmodules.vtkIOXML import vtkXMLStructuredGridReader

d = sys.argv[1]
ow = vtkStringOutputWindow()
vtkOutputWindow.SetInstance(ow)
clean = lambda v: None if isinstance(v, float) and math.isnan(v) else v
out = {"npy": {}, "vts": []}
ix = json.load(open(os.path.join(d, "npy", "index.json")))
for a in ix["arrays"]:
    x = np.load(os.path.join(d, "npy", a["file"]))
    out["npy"][a["name"]] = {"shape": list(x.shape), "dtype": x.dtype.str,
        "nan": int(np.isnan(x).sum()) if x.dtype.kind == "f" else -1}
u = np.load(os.path.join(d, "npy", "u.npy"))
out["u_f2_r1_c2"] = float(u[2, 1, 2])
for ds in ET.parse(os.path.join(d, "vtk", "series.pvd")).getroot().iter("DataSet"):
    r = vtkXMLStructuredGridReader()
    r.SetFileName(os.path.join(d, "vtk", ds.get("file")))
    r.Update()
    g = r.GetOutput()
    pd = g.GetPointData()
    n = g.GetNumberOfPoints()
    out["vts"].append({
        "dims": list(g.GetDimensions()), "points": n, "p6": list(g.GetPoint(6)),
        "arrays": sorted(pd.GetArrayName(i) for i in range(pd.GetNumberOfArrays())),
        "u": [clean(pd.GetArray("u").GetValue(i)) for i in range(n)],
        "exx11": clean(pd.GetArray("exx").GetValue(11)),
        "status": [int(pd.GetArray("status").GetValue(i)) for i in range(n)],
        "vectors": pd.GetVectors().GetName() if pd.GetVectors() else "",
        "time": g.GetFieldData().GetArray("TimeValue").GetValue(0),
    })
out["messages"] = ow.GetOutput()
print(json.dumps(out))
`

// NumPy loads every array with the shape and dtype of index.json and the
// NaN count of the invalid points; VTK's own StructuredGrid reader loads
// every frame with its dimensions, positions, arrays, NaN and time, and
// reports no error.
func TestReadByNumPyAndVTK(t *testing.T) {
	py := pythonWith(t, "numpy", "vtkmodules.vtkIOXML")
	dir, _ := makeRun(t, runSpec{frames: 3, strain: 3, times: []float64{0, 0.5, 1.25}, scale: 0.05})
	res, err := Export(dir, Options{})
	if err != nil {
		t.Fatal(err)
	}
	var got struct {
		NPY map[string]struct {
			Shape []int
			DType string
			NaN   int
		}
		U   float64 `json:"u_f2_r1_c2"`
		VTS []struct {
			Dims, Status []int
			Points       int
			P6           []float64
			Arrays       []string
			U            []*float64
			Exx11        *float64
			Vectors      string
			Time         float64
		}
		Messages string
	}
	runPython(t, py, numpyVTKScript, &got, dir)

	// NaN per frame: u has points 0 (all frames) and 5 (frame 1); exx
	// also point 11.
	for name, want := range map[string]int{"u": 4, "v": 4, "exx": 7, "zncc": 3, "x": 0, "times": 0, "status": -1} {
		a, ok := got.NPY[name]
		if !ok || a.NaN != want {
			t.Errorf("numpy %s.npy: %+v, want %d NaN", name, a, want)
		}
	}
	if a := got.NPY["u"]; !slices.Equal(a.Shape, []int{3, 3, 4}) || a.DType != "<f8" {
		t.Errorf("numpy u.npy %+v", a)
	}
	if a := got.NPY["status"]; a.DType != "|u1" {
		t.Errorf("numpy status.npy %+v", a)
	}
	if !near(got.U, 0.05*testU(2, 6), 1e-9) {
		t.Errorf("numpy u[2, 1, 2] = %v, want %v (point 6 of frame 2)", got.U, 0.05*testU(2, 6))
	}
	if got.Messages != "" {
		t.Errorf("VTK reported:\n%s", got.Messages)
	}
	if len(got.VTS) != 3 {
		t.Fatalf("VTK read %d frames", len(got.VTS))
	}
	wantArrays := slices.Sorted(slices.Values(append(res.Fields, "displacement", "valid", "strain_valid")))
	for k, f := range got.VTS {
		if !slices.Equal(f.Dims, []int{4, 3, 1}) || f.Points != 12 || !near(f.P6[0], 0.05*20, 1e-12) || !near(f.P6[1], 0.05*25, 1e-12) {
			t.Errorf("frame %d: dims %v, %d points, point 6 at %v", k, f.Dims, f.Points, f.P6)
		}
		if !slices.Equal(f.Arrays, wantArrays) || f.Vectors != "displacement" || f.Time != []float64{0, 0.5, 1.25}[k] {
			t.Errorf("frame %d: arrays %v (want %v), vectors %q, time %v", k, f.Arrays, wantArrays, f.Vectors, f.Time)
		}
		if f.U[0] != nil || (k == 1) != (f.U[5] == nil) || f.U[3] == nil || !near(*f.U[3], 0.05*testU(k, 3), 1e-9) || f.Exx11 != nil {
			t.Errorf("frame %d: u %v, exx[11] %v: want NaN at point 0, at 5 in frame 1 only, and exx NaN at 11", k, f.U, f.Exx11)
		}
		if f.Status[0] != 0 || f.Status[1] != 1 || (k == 1) != (f.Status[5] == 6) {
			t.Errorf("frame %d: status %v", k, f.Status)
		}
	}
}

const paraviewScript = `
import json, sys
from paraview import servermanager as sm
from paraview.simple import PVDReader
r = PVDReader(FileName=sys.argv[1])
r.UpdatePipeline(float(sys.argv[2]))
info = r.GetDataInformation()
print(json.dumps({"times": list(r.TimestepValues), "points": info.GetNumberOfPoints(),
    "arrays": sorted(r.PointData.keys())}))
`

// ParaView's PVD reader finds every frame's time in series.pvd and loads
// the frame at a time step.
func TestReadByParaView(t *testing.T) {
	py := pythonWith(t, "paraview.simple")
	times := []float64{0, 0.5, 1.25}
	dir, _ := makeRun(t, runSpec{frames: 3, times: times})
	if _, err := Export(dir, Options{VTK: true}); err != nil {
		t.Fatal(err)
	}
	var got struct {
		Times  []float64
		Points int
		Arrays []string
	}
	runPython(t, py, paraviewScript, &got, dir+"/"+VTKDir+"/"+SeriesFile, "0.5")
	if !slices.Equal(got.Times, times) || got.Points != 12 || !slices.Contains(got.Arrays, "u") || !slices.Contains(got.Arrays, "valid") {
		t.Errorf("ParaView read %+v, want times %v, 12 points, u and valid", got, times)
	}
}
