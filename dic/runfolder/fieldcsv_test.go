package runfolder

import (
	"math"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"spallscope/dic"
	"spallscope/subset"
)

// A field survives the trip through its CSV file (the output contract's
// columns); rows without a measurement keep their status and read NaN.
func TestFieldRoundTrip(t *testing.T) {
	g := dic.Grid{X0: 5, Y0: 7, Step: 4, Cols: 3, Rows: 2}
	f := &dic.Field{Name: "f_0003", Grid: g}
	for i := 0; i < g.Len(); i++ {
		x, y := g.Pos(i)
		p := dic.Point{X: x, Y: y, ZNCC: 0.99 - 0.01*float64(i), Iterations: i, Status: subset.Converged}
		p.P[subset.PU], p.P[subset.PV] = 0.1*float64(i), -1.0/3
		p.P[subset.PUx], p.P[subset.PVy] = 1e-3, -2.5e-4
		f.Points = append(f.Points, p)
	}
	f.Points[4].Status = subset.Lost
	path := FieldPath(t.TempDir(), f.Name)
	if err := WriteField(path, f, 0); err != nil {
		t.Fatal(err)
	}
	back, err := ReadField(path)
	if err != nil {
		t.Fatal(err)
	}
	if back.Grid != g || back.Name != "f_0003" {
		t.Fatalf("grid %+v name %q, want %+v f_0003", back.Grid, back.Name, g)
	}
	for i := range f.Points {
		a, b := f.Points[i], back.Points[i]
		if a.Status != b.Status || a.X != b.X || a.Y != b.Y || math.Abs(a.ZNCC-b.ZNCC) > 1e-6 {
			t.Errorf("point %d: %+v read back as %+v", i, a, b)
		}
		if a.Valid() && (math.Abs(a.P[subset.PV]-b.P[subset.PV]) > 1e-9 || a.P[subset.PUx] != b.P[subset.PUx]) {
			t.Errorf("point %d: values %v read back as %v", i, a.P[:6], b.P[:6])
		}
	}
	if u, _ := back.Points[4].U(); !math.IsNaN(u) {
		t.Errorf("lost point reads u = %v, want NaN", u)
	}
}

func TestReadFieldErrorsNameTheLine(t *testing.T) {
	dir := t.TempDir()
	p := filepath.Join(dir, "bad.csv")
	os.WriteFile(p, []byte(FieldHeader+"\n0,0,1,2,0,0,0,0,0.9,3,converged\n5,0,x,2,0,0,0,0,0.9,3,converged\n"), 0o644)
	if _, err := ReadField(p); err == nil || !strings.Contains(err.Error(), "line 3") || !strings.Contains(err.Error(), "column u") {
		t.Errorf("error %v should name line 3, column u", err)
	}
	os.WriteFile(p, []byte(FieldHeader+"\n0,0,1,2,0,0,0,0,0.9,3,fine\n"), 0o644)
	if _, err := ReadField(p); err == nil || !strings.Contains(err.Error(), "line 2") {
		t.Errorf("bad status: %v should name line 2", err)
	}
}
