package model

import (
	"errors"
	"fmt"
	"math"

	"spallscope/dic"
	"spallscope/dic/region"
	"spallscope/strain"
)

// Options tunes a comparison.
type Options struct {
	// Radius is the reach in px of the moving-least-squares interpolation
	// of scattered model points (and of regular-grid models where a cell
	// is incomplete): only model points closer than Radius to a measured
	// point inform its model value, and a point where they do not fix a
	// plane (fewer than three, or on a line) is not compared. Zero takes
	// twice the model's median nearest-neighbour spacing, which on a
	// regular grid reaches the eight nearest nodes and more.
	Radius float64
	// Mask is the run's measured region (region of interest less its
	// exclusions), used to tell which model points lie outside it. Nil:
	// the part of the image within one grid step of a validly measured
	// grid point.
	Mask *region.Mask
	// Exclude are regions (reference px) left out of the comparison, such
	// as a band along an opening's wall where the strain window straddles
	// the steepest gradients and the measured strain is an average the
	// model's point value cannot match.
	Exclude []region.Shape
	// Resolution, when given, is the measurement's resolution (see
	// strain.NoiseFloor); each quantity's statistics then carry it.
	Resolution *strain.Resolution
}

// Diff is the difference (measured − model) at one grid point, by
// Quantity; NaN where the quantity was not compared (not measured, no
// model value, excluded, or not a compared quantity).
type Diff struct {
	X, Y   int
	Values [numQuantities]float64
}

// Comparison is a measured field held against a model.
type Comparison struct {
	// Model is the model file, Format how it was mapped.
	Model  string
	Format Format
	// Frame and FrameName identify the measured frame.
	Frame     int
	FrameName string
	Grid      dic.Grid
	// Radius is the interpolation reach used (px); Regular says the model
	// is a regular grid, interpolated bilinearly where its cells are
	// complete.
	Radius  float64
	Regular bool
	// Quantities are the quantities compared: those the model has, strains
	// only when a strain field was given.
	Quantities []Quantity
	// Points is the difference field, one per grid point in grid order.
	Points []Diff
	// Stats holds one summary per compared quantity, in the order of
	// Quantities.
	Stats []Stats
	// Outside names the model points outside the measured region.
	Outside Outside
}

// Stat returns the summary of q and whether q was compared.
func (c *Comparison) Stat(q Quantity) (Stats, bool) {
	for _, s := range c.Stats {
		if s.Quantity == q {
			return s, true
		}
	}
	return Stats{}, false
}

// Warnings returns what the caller should tell the user: model points
// outside the measured region, and quantities with measured points the
// model does not reach.
func (c *Comparison) Warnings() []string {
	var w []string
	if s := c.Outside.String(); s != "" {
		w = append(w, s)
	}
	for _, s := range c.Stats {
		if s.Uncovered > 0 {
			w = append(w, fmt.Sprintf("%s: %d measured points have no model value (no model point within %.1f px, or too few to fix a plane) and were not compared", s.Quantity, s.Uncovered, c.Radius))
		}
	}
	return w
}

// Compare holds the measured field — displacements, and strains when
// strains is not nil (on the same grid) — against model m: it interpolates
// the model at every grid point (see Options.Radius and the package's
// interpolation), takes the difference measured − model for each quantity
// the model has, at validly measured points only, and summarises each
// quantity. Model points outside the measured region are counted in the
// result's Outside. It fails when the fields do not fit together or when
// no point at all could be compared (typically a wrong Format).
func Compare(measured *dic.Field, strains *strain.Field, m *Field, opt Options) (*Comparison, error) {
	switch {
	case measured == nil:
		return nil, errors.New("model comparison: no measured field")
	case len(measured.Points) != measured.Grid.Len():
		return nil, fmt.Errorf("model comparison: frame %s has %d points on a %dx%d grid", measured.Name, len(measured.Points), measured.Grid.Cols, measured.Grid.Rows)
	case m == nil || len(m.Points) == 0:
		return nil, errors.New("model comparison: no model points")
	case strains != nil && (strains.Grid != measured.Grid || len(strains.Points) != len(measured.Points)):
		return nil, fmt.Errorf("model comparison: the strain field of frame %s is not on the displacement grid", measured.Name)
	case opt.Mask != nil && (len(opt.Mask.Pix) != opt.Mask.Width*opt.Mask.Height):
		return nil, errors.New("model comparison: malformed mask")
	}
	ip, err := newInterpolator(m, opt.Radius)
	if err != nil {
		return nil, fmt.Errorf("model comparison: %w", err)
	}
	c := &Comparison{
		Model: m.Path, Format: m.Format, Frame: measured.Index, FrameName: measured.Name,
		Grid: measured.Grid, Radius: ip.radius, Regular: ip.lat != nil,
		Points:  make([]Diff, len(measured.Points)),
		Outside: outside(m, measuredRegion(measured, opt.Mask)),
	}
	for _, q := range m.Quantities {
		if !q.IsStrain() || strains != nil {
			c.Quantities = append(c.Quantities, q)
		}
	}
	if len(c.Quantities) == 0 {
		return nil, fmt.Errorf("model comparison: model %s has only strain columns and no measured strain field was given", m.Path)
	}
	for i := range c.Points {
		x, y := measured.Grid.Pos(i)
		c.Points[i].X, c.Points[i].Y = x, y
		for q := range c.Points[i].Values {
			c.Points[i].Values[q] = math.NaN()
		}
	}
	compared := 0
	for _, q := range c.Quantities {
		s := Stats{Quantity: q, Unit: q.Unit(), Resolution: resolutionOf(opt.Resolution, q)}
		var meas, mod []float64
		for i := range c.Points {
			d := &c.Points[i]
			val, ok := measuredValue(measured, strains, i, q)
			if !ok || excluded(opt.Exclude, float64(d.X), float64(d.Y)) {
				continue
			}
			mv, how := ip.at(q, float64(d.X), float64(d.Y))
			switch how {
			case noValue:
				s.Uncovered++
				continue
			case bilinear:
				s.Bilinear++
			}
			d.Values[q] = val - mv
			meas, mod = append(meas, val), append(mod, mv)
		}
		s.summarise(meas, mod)
		compared += s.Count
		c.Stats = append(c.Stats, s)
	}
	if compared == 0 {
		return nil, fmt.Errorf("model comparison: no measured point of frame %s has a model value within %.1f px of it; check the model format (units %s, origin (%g, %g) px, y up %v)%s",
			measured.Name, ip.radius, m.Format.Units, m.Format.OriginX, m.Format.OriginY, m.Format.YUp, warnSuffix(c.Outside))
	}
	return c, nil
}

// warnSuffix appends the outside count to an error.
func warnSuffix(o Outside) string {
	if o.Count == 0 {
		return ""
	}
	return fmt.Sprintf(": %d of %d model points lie outside the measured region", o.Count, o.Total)
}

// measuredValue returns the measured value of q at grid point i and
// whether it is valid.
func measuredValue(f *dic.Field, s *strain.Field, i int, q Quantity) (float64, bool) {
	if q.IsStrain() {
		if s == nil || !s.Points[i].Valid || !f.Points[i].Valid() {
			return 0, false
		}
		p := &s.Points[i]
		return [...]float64{Exx: p.Exx, Eyy: p.Eyy, Exy: p.Exy}[q], true
	}
	if !f.Points[i].Valid() {
		return 0, false
	}
	u, v := f.Points[i].U()
	if q == U {
		return u, true
	}
	return v, true
}

// excluded reports whether (x, y) lies in one of the excluded regions.
func excluded(shapes []region.Shape, x, y float64) bool {
	for _, s := range shapes {
		if s != nil && s.Contains(x, y) {
			return true
		}
	}
	return false
}

// resolutionOf picks the resolution of q (0 when not given).
func resolutionOf(r *strain.Resolution, q Quantity) float64 {
	if r == nil {
		return 0
	}
	return [...]float64{U: r.U, V: r.V, Exx: r.Exx, Eyy: r.Eyy, Exy: r.Exy}[q]
}
