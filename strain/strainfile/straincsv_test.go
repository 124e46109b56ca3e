package strainfile

import (
	"os"
	"strings"
	"testing"

	"spallscope/dic"
	"spallscope/strain"
)

// A strain field survives its CSV file; with a scale the mm columns are
// appended (the output contract).
func TestStrainRoundTrip(t *testing.T) {
	g := dic.Grid{X0: 2, Y0: 3, Step: 6, Cols: 2, Rows: 2}
	f := &strain.Field{Name: "s", Grid: g}
	for i := 0; i < g.Len(); i++ {
		x, y := g.Pos(i)
		f.Points = append(f.Points, strain.Point{X: x, Y: y, Exx: 1e-3 * float64(i), Eyy: -2e-4, Exy: 5e-5, E1: 1e-3, E2: -2e-4, AngleDeg: 12.5, GammaMax: 1.2e-3, Eeq: 8e-4, Valid: i != 2})
	}
	path := StrainPath(t.TempDir(), "s")
	if err := WriteStrain(path, f, dic.Scale(0.05)); err != nil {
		t.Fatal(err)
	}
	data, _ := os.ReadFile(path)
	if !strings.HasPrefix(string(data), StrainHeader+",x_mm,y_mm\n2,3,0,") {
		t.Errorf("file starts %q", string(data)[:60])
	}
	back, err := ReadStrain(path)
	if err != nil {
		t.Fatal(err)
	}
	if back.Grid != g || back.Points[1].Exx != 1e-3 || back.Points[2].Valid || !back.Points[3].Valid {
		t.Errorf("read back %+v", back)
	}
}
