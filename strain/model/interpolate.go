package model

import "fmt"

// scheme names how a model value was found at a measured point.
type scheme int

const (
	noValue   scheme = iota // no model value within reach
	bilinear                // in a complete cell of a model on a regular grid
	scattered               // moving least squares within the radius
)

// interpolator evaluates a model field anywhere in the reference image:
// bilinearly where the model is a regular grid and the cell around the
// point is complete, else by moving least squares over the points within
// the radius. The fallback serves grids cut by an opening, near the cut,
// and meshes of any shape.
type interpolator struct {
	m      *Field
	lat    *lattice // nil unless the model is a regular grid
	sc     *scatter
	radius float64
}

// newInterpolator prepares interpolation of m with the given radius in px;
// radius 0 takes twice the model's typical point spacing.
func newInterpolator(m *Field, radius float64) (*interpolator, error) {
	if radius < 0 {
		return nil, fmt.Errorf("model interpolation radius %g px, expected a positive radius (or 0 for the default)", radius)
	}
	if radius == 0 {
		h := spacing(m.Points)
		if !(h > 0) {
			return nil, fmt.Errorf("model %s: cannot set an interpolation radius: the %d points coincide, or lie so far apart that their distances overflow (beyond 1e154 px)", m.Path, len(m.Points))
		}
		radius = 2 * h
	}
	return &interpolator{m: m, lat: findLattice(m.Points), sc: newScatter(m.Points, radius), radius: radius}, nil
}

// at returns the model's value of q at (x, y) px and how it was found.
func (p *interpolator) at(q Quantity, x, y float64) (float64, scheme) {
	if p.lat != nil {
		if v, ok := p.lat.at(p.m.Points, q, x, y); ok {
			return v, bilinear
		}
	}
	if v, ok := p.sc.at(q, x, y, p.radius); ok {
		return v, scattered
	}
	return 0, noValue
}
