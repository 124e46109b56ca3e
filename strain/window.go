package strain

import (
	"fmt"
	"math"

	"gonum.org/v1/gonum/mat"

	"spallscope/dic"
	"spallscope/subset"
)

// Window differentiates displacement fields by pointwise least squares
// over a square strain window of Size×Size grid points (Pan et al. 2009,
// "Full-field strain measurement using a two-dimensional Savitzky–Golay
// digital differentiator in digital image correlation", Opt. Eng.
// 48(3)): u and v are each fitted with a plane (Order 1) or a quadratic
// surface (Order 2) in the window, and the fitted gradient at the centre
// is the displacement gradient. On a full window this is exactly a
// two-dimensional Savitzky–Golay differentiating filter.
//
// Only valid points that are connected to the centre through valid points
// inside the window enter the fit, so a window never reaches across an
// opening, or across a crack whose straddling points were flagged: it
// keeps to the centre's side. A point needs at least MinPoints of them
// (default: half the window, and never fewer than the fit's unknowns
// plus two) and a valid displacement of its own, else its strain is invalid.
type Window struct {
	Size      int
	Order     int
	MinPoints int
	Measure   Measure

	general bool // always the general fit (tests of the full-window shortcut)
}

// Validate reports a window that cannot be used on grid g.
func (w Window) Validate(g dic.Grid) error {
	switch {
	case w.Size < 3 || w.Size%2 == 0:
		return fmt.Errorf("strain window %d, expected an odd number of grid points, at least 3", w.Size)
	case w.Size > g.Cols || w.Size > g.Rows:
		return fmt.Errorf("strain window %d is larger than the %dx%d grid", w.Size, g.Cols, g.Rows)
	case w.Order != 0 && w.Order != 1 && w.Order != 2:
		return fmt.Errorf("strain fit order %d, expected 1 (plane) or 2 (quadratic)", w.Order)
	}
	if _, err := ParseMeasure(string(w.measure())); err != nil {
		return err
	}
	return nil
}

// Effective returns the window with defaults in its zero fields (a plane
// fit, engineering strain), as it is applied; Size has no default.
func (w Window) Effective() Window {
	w.Order, w.Measure = max(w.Order, 1), w.measure()
	return w
}

func (w Window) measure() Measure {
	if w.Measure == "" {
		return Engineering
	}
	return w.Measure
}

func (w Window) unknowns() int {
	if w.Order == 2 {
		return 6
	}
	return 3
}

func (w Window) minPoints() int {
	if w.MinPoints > 0 {
		return max(w.MinPoints, w.unknowns()+2)
	}
	return max((w.Size*w.Size+1)/2, w.unknowns()+2)
}

// VSG returns the virtual strain gauge size in px: the extent of image
// over which one strain value averages, (window − 1)·step + subset
// (iDICs, A Good Practices Guide for Digital Image Correlation, 2018).
func (w Window) VSG(step, subsetSize int) int { return (w.Size-1)*step + subsetSize }

// Strain computes the strain field of displacement field f.
func (w Window) Strain(f *dic.Field) (*Field, error) {
	if err := w.Validate(f.Grid); err != nil {
		return nil, err
	}
	g := f.Grid
	out := &Field{Index: f.Index, Name: f.Name, Grid: g, Points: make([]Point, g.Len()), Window: w.Size, Measure: w.measure()}
	half := w.Size / 2
	nu := w.unknowns()
	side := w.Size
	inWin := make([]bool, side*side)
	stack := make([]int, 0, side*side)
	a := mat.NewDense(side*side, nu, nil)
	var ata mat.SymDense
	atb := mat.NewVecDense(nu, nil)
	coef := mat.NewVecDense(nu, nil)
	var chol mat.Cholesky
	step := float64(g.Step)
	for i := range out.Points {
		x, y := g.Pos(i)
		out.Points[i] = Point{X: x, Y: y}
		if !f.Points[i].Valid() {
			continue
		}
		// Valid window points connected to the centre (4-connectivity).
		for k := range inWin {
			inWin[k] = false
		}
		c0, r0 := i%g.Cols, i/g.Cols
		valid := func(dc, dr int) bool {
			j := g.Index(c0+dc, r0+dr)
			return j >= 0 && f.Points[j].Valid()
		}
		inWin[half*side+half] = true
		stack = append(stack[:0], half*side+half)
		n := 0
		for len(stack) > 0 {
			k := stack[len(stack)-1]
			stack = stack[:len(stack)-1]
			n++
			kc, kr := k%side, k/side
			for _, d := range [4][2]int{{1, 0}, {-1, 0}, {0, 1}, {0, -1}} {
				nc, nr := kc+d[0], kr+d[1]
				if nc < 0 || nr < 0 || nc >= side || nr >= side || inWin[nr*side+nc] || !valid(nc-half, nr-half) {
					continue
				}
				inWin[nr*side+nc] = true
				stack = append(stack, nr*side+nc)
			}
		}
		if n < w.minPoints() {
			continue
		}
		p := &out.Points[i]
		if n == side*side && !w.general {
			// A full window is symmetric, so its design is orthogonal and
			// the fitted slope (for the plane and the quadratic alike) is
			// Σ dx·u / Σ dx²: the Savitzky–Golay first-derivative filter.
			var sux, suy, svx, svy float64
			for k := 0; k < side*side; k++ {
				dx, dy := float64(k%side-half), float64(k/side-half)
				q := &f.Points[g.Index(c0+k%side-half, r0+k/side-half)]
				u, v := q.P[subset.PU], q.P[subset.PV]
				sux, suy, svx, svy = sux+dx*u, suy+dy*u, svx+dx*v, svy+dy*v
			}
			den := float64(side) * float64(side*(side*side-1)) / 12 * step // Σdx² over the window, times the step
			w.finish(p, out.Measure, sux/den, suy/den, svx/den, svy/den)
			continue
		}
		// Least squares in local coordinates scaled by the step (keeps the
		// normal equations well conditioned); gradients are rescaled after.
		rows := 0
		ub := make([]float64, 0, n)
		vb := make([]float64, 0, n)
		for k, ok := range inWin {
			if !ok {
				continue
			}
			dx, dy := float64(k%side-half), float64(k/side-half)
			row := []float64{1, dx, dy, dx * dx, dx * dy, dy * dy}[:nu]
			a.SetRow(rows, row)
			p := &f.Points[g.Index(c0+k%side-half, r0+k/side-half)]
			ub = append(ub, p.P[subset.PU])
			vb = append(vb, p.P[subset.PV])
			rows++
		}
		av := a.Slice(0, rows, 0, nu).(*mat.Dense)
		ata.SymOuterK(1, av.T())
		if ok := chol.Factorize(&ata); !ok {
			continue
		}
		grad := func(b []float64) (gx, gy float64, ok bool) {
			atb.MulVec(av.T(), mat.NewVecDense(rows, b))
			if err := chol.SolveVecTo(coef, atb); err != nil {
				return 0, 0, false
			}
			return coef.AtVec(1) / step, coef.AtVec(2) / step, true
		}
		ux, uy, ok1 := grad(ub)
		vx, vy, ok2 := grad(vb)
		if !ok1 || !ok2 {
			continue
		}
		w.finish(p, out.Measure, ux, uy, vx, vy)
	}
	return out, nil
}

// finish fills a strain point from its displacement gradient.
func (w Window) finish(p *Point, m Measure, ux, uy, vx, vy float64) {
	p.Exx, p.Eyy, p.Exy = m.Tensor(ux, uy, vx, vy)
	p.E1, p.E2, p.AngleDeg = Principal(p.Exx, p.Eyy, p.Exy)
	p.GammaMax = p.E1 - p.E2
	p.Eeq = Equivalent(p.Exx, p.Eyy, p.Exy)
	p.Valid = !math.IsNaN(p.Exx + p.Eyy + p.Exy)
}
