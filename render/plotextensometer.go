package render

import (
	"fmt"
	"math"

	"spallscope/dic"
)

// Extensometer is a virtual extensometer: two points of the specimen face,
// in reference px, whose distance it follows as a clip-on extensometer
// would. Each end sits on the grid point nearest to it. The zero value
// means "not placed": the default of DefaultExtensometer is used.
type Extensometer struct {
	X1, Y1, X2, Y2 float64
}

// IsZero reports whether e was left unplaced.
func (e Extensometer) IsZero() bool { return e == Extensometer{} }

// String gives the ends, for legends and the report.
func (e Extensometer) String() string {
	return fmt.Sprintf("(%.0f, %.0f)–(%.0f, %.0f) px", e.X1, e.Y1, e.X2, e.Y2)
}

// Ends returns the grid points of g at the two ends. An end farther than
// half a step outside the grid, or two ends on one grid point, is an error.
func (e Extensometer) Ends(g dic.Grid) (i, j int, err error) {
	if i, err = nearestGridPoint(g, e.X1, e.Y1); err != nil {
		return 0, 0, fmt.Errorf("extensometer end 1: %w", err)
	}
	if j, err = nearestGridPoint(g, e.X2, e.Y2); err != nil {
		return 0, 0, fmt.Errorf("extensometer end 2: %w", err)
	}
	if i == j {
		return 0, 0, fmt.Errorf("extensometer %s: both ends fall on grid point %d; place them at least one step (%d px) apart", e, i, g.Step)
	}
	return i, j, nil
}

// Strain returns the engineering strain of the extensometer in field f,
// (ℓ − L)/L, with L the reference distance of its two grid points and ℓ
// their distance once displaced (tension positive). It is the mean
// stretch of the material line between the ends, whatever the field does
// between them, and it does not change with a rigid rotation. ok is false
// when either end has no measurement in f.
func (e Extensometer) Strain(f *dic.Field) (strain float64, ok bool, err error) {
	i, j, err := e.Ends(f.Grid)
	if err != nil {
		return 0, false, err
	}
	a, b := &f.Points[i], &f.Points[j]
	if !a.Valid() || !b.Valid() {
		return math.NaN(), false, nil
	}
	ua, va := a.U()
	ub, vb := b.U()
	dx, dy := float64(b.X-a.X), float64(b.Y-a.Y)
	l0 := math.Hypot(dx, dy)
	l := math.Hypot(dx+ub-ua, dy+vb-va)
	return (l - l0) / l0, true, nil
}

// DefaultExtensometer places a vertical extensometer (along the usual load
// axis) over the middle 80 % of the grid's height, a quarter of the way in
// from its left side: far enough from the loaded ends to avoid the platens'
// end effects, and beside a central opening rather than across it. An end
// without a measurement in the reference field moves to the nearest grid
// point that has one.
func DefaultExtensometer(ref *dic.Field) Extensometer {
	g := ref.Grid
	c := (g.Cols - 1) / 4
	r1 := int(math.Round(0.1 * float64(g.Rows-1)))
	r2 := int(math.Round(0.9 * float64(g.Rows-1)))
	if r2 == r1 && g.Rows > 1 {
		r1, r2 = 0, g.Rows-1
	}
	i := nearestValidPoint(ref, g.Index(c, r1))
	j := nearestValidPoint(ref, g.Index(c, r2))
	if i == j && g.Len() > 1 {
		j = g.Index(c, r2)
	}
	x1, y1 := g.Pos(i)
	x2, y2 := g.Pos(j)
	return Extensometer{X1: float64(x1), Y1: float64(y1), X2: float64(x2), Y2: float64(y2)}
}

// nearestGridPoint returns the grid point nearest to (x, y), which must lie
// within half a step of the grid.
func nearestGridPoint(g dic.Grid, x, y float64) (int, error) {
	if g.Len() == 0 || g.Step <= 0 {
		return 0, fmt.Errorf("empty grid")
	}
	c := math.Round((x - float64(g.X0)) / float64(g.Step))
	r := math.Round((y - float64(g.Y0)) / float64(g.Step))
	if math.IsNaN(c) || math.IsNaN(r) || c < 0 || r < 0 || c >= float64(g.Cols) || r >= float64(g.Rows) {
		x1, y1 := g.Pos(g.Len() - 1)
		return 0, fmt.Errorf("point (%g, %g) px lies outside the grid (x %d to %d px, y %d to %d px)", x, y, g.X0, x1, g.Y0, y1)
	}
	return g.Index(int(c), int(r)), nil
}

// nearestValidPoint returns the point of f nearest to point i that holds a
// measurement (i itself when it does, or when none does).
func nearestValidPoint(f *dic.Field, i int) int {
	if f.Points[i].Valid() {
		return i
	}
	best, bestD := i, math.Inf(1)
	x0, y0 := f.Grid.Pos(i)
	for k := range f.Points {
		if !f.Points[k].Valid() {
			continue
		}
		x, y := f.Grid.Pos(k)
		if d := math.Hypot(float64(x-x0), float64(y-y0)); d < bestD {
			best, bestD = k, d
		}
	}
	return best
}
