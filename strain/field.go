package strain

import "spallscope/dic"

// Point is the strain at one grid point. Values are meaningful only when
// Valid.
type Point struct {
	X, Y     int
	Exx      float64
	Eyy      float64
	Exy      float64 // tensor shear, γxy/2
	E1, E2   float64 // principal strains, e1 ≥ e2
	AngleDeg float64 // direction of e1 from +x towards +y
	GammaMax float64 // engineering maximum shear e1 − e2
	Eeq      float64 // von Mises equivalent strain
	Valid    bool
}

// Field is the strain field of one frame on the displacement grid.
type Field struct {
	Index   int
	Name    string
	Grid    dic.Grid
	Points  []Point
	Window  int
	Measure Measure
}

// Valid returns the number of valid points.
func (f *Field) Valid() int {
	n := 0
	for i := range f.Points {
		if f.Points[i].Valid {
			n++
		}
	}
	return n
}

// Component names the per-point strain values for selection by name, in
// the order of the strain file's columns.
var Components = []string{"exx", "eyy", "exy", "e1", "e2", "angle_deg", "gamma_max", "e_eq"}

// Value returns the named component of p (see Components) and whether the
// name is known.
func (p *Point) Value(name string) (float64, bool) {
	switch name {
	case "exx":
		return p.Exx, true
	case "eyy":
		return p.Eyy, true
	case "exy":
		return p.Exy, true
	case "e1":
		return p.E1, true
	case "e2":
		return p.E2, true
	case "angle_deg":
		return p.AngleDeg, true
	case "gamma_max":
		return p.GammaMax, true
	case "e_eq":
		return p.Eeq, true
	}
	return 0, false
}
