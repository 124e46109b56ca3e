package sector

import (
	"fmt"
	"math"
)

// Layout assigns points of a face to openings and sectors.
//
// Each point belongs to the opening whose wall (its equivalent circle, see
// Opening.Centre) is nearest, within Reach equivalent radii of the wall,
// and takes the sector of its direction from that opening's centre: crown
// within CrownHalfAngle of the load axis on the side the load comes from
// (image up for a vertical load), invert on the other side, the sidewalls
// between, left and right as seen in the image.
//
// Two openings that do not overlap bound a pillar: the rock inside the
// convex hull of their two equivalent circles and outside both — the
// region between the openings and between their two outer common
// tangents (for two equal circles, the band of one radius either side of
// the line of centres, between the walls). A pillar point belongs to the
// opening whose wall is nearer (ties to the earlier one) and its Place
// keeps that opening's own sector as Wall: the pillar side of the left of
// two openings side by side is its right sidewall.
type Layout struct {
	Openings []Opening
	// LoadAngleDeg is the direction of the load axis from +x towards +y
	// (default 90: vertical, the usual frame). The crown lies towards −y
	// for a vertical load (the top of the image).
	LoadAngleDeg float64
	// CrownHalfAngle is the half-width in degrees of the crown and invert
	// sectors about the load axis (default 45); the sidewalls take the
	// rest.
	CrownHalfAngle float64
	// Reach is how far from an opening's wall its sectors extend, in
	// equivalent radii (default 1).
	Reach float64
}

// Place is where a point lies: its opening (index into Openings, −1 for
// none), its sector, and Wall, the sector of that opening the point lies
// in when the pillar is left out. Wall equals Sector except in a pillar,
// where it names the pillar's wall of the point's opening (for the left
// of two openings side by side under a vertical load, RightSidewall).
type Place struct {
	Opening int
	Sector  Sector
	Wall    Sector
}

// Effective returns the layout with defaults in its zero fields (load axis
// 90°, crown half-angle 45°, reach 1), as it is applied.
func (s Layout) Effective() Layout {
	if s.LoadAngleDeg == 0 {
		s.LoadAngleDeg = 90
	}
	if s.CrownHalfAngle == 0 {
		s.CrownHalfAngle = 45
	}
	if s.Reach == 0 {
		s.Reach = 1
	}
	return s
}

// Validate reports settings that cannot be used.
func (s Layout) Validate() error {
	s = s.Effective()
	if !(s.CrownHalfAngle > 0 && s.CrownHalfAngle < 90) {
		return fmt.Errorf("crown half-angle %g°, expected between 0 and 90", s.CrownHalfAngle)
	}
	if !(s.Reach > 0) {
		return fmt.Errorf("reach %g, expected a positive number of equivalent radii", s.Reach)
	}
	for i, o := range s.Openings {
		if o.Shape == nil {
			return fmt.Errorf("opening %d has no shape", i)
		}
	}
	return nil
}

// Classify returns the opening (index into Openings, −1 if none) and the
// sector of reference point (x, y).
func (s Layout) Classify(x, y float64) (int, Sector) {
	p := s.Locate(x, y)
	return p.Opening, p.Sector
}

// Locate returns the place of reference point (x, y).
func (s Layout) Locate(x, y float64) Place { return s.locate(x, y, 0) }

// LocateCell returns the place of the point (x, y) of a measurement grid
// with spacing step px: Locate's, except that the pillar reaches half a
// step beyond the outer common tangents. A grid point stands for the
// rock within half a step of it — a zone of marked points is known to
// that resolution, and no finer — so a point whose own cell holds pillar
// rock is not told apart from the pillar (common practice, no source).
// Without it the pillar's edge, a line at an arbitrary offset from the
// grid's rows, splits a zone that runs along it by a fraction of a pixel:
// on the twin openings of the strain seed tests (radius 28 px, centres
// on y = 127.5, rows at 4 + 8k) the row 27.5 px above the line of centres
// lay inside the pillar and the row 28.5 px below it outside, so that a
// band's lobe along the lower edge was named the invert.
func (s Layout) LocateCell(x, y, step float64) Place { return s.locate(x, y, math.Max(step, 0)/2) }

// locate is Locate with the pillar reaching margin px beyond the outer
// common tangents.
func (s Layout) locate(x, y, margin float64) Place {
	s = s.Effective()
	best, bd := -1, math.Inf(1)
	dist := make([]float64, len(s.Openings))
	for i, o := range s.Openings {
		cx, cy, r := o.Centre()
		dist[i] = math.Hypot(x-cx, y-cy) - r // distance beyond the equivalent circle
		if dist[i] <= s.Reach*r && dist[i] < bd {
			best, bd = i, dist[i]
		}
	}
	for a := range s.Openings {
		for b := a + 1; b < len(s.Openings); b++ {
			if dist[a] >= 0 && dist[b] >= 0 && s.inPillar(a, b, x, y, margin) {
				op := a
				if dist[b] < dist[a] {
					op = b
				}
				return Place{Opening: op, Sector: Pillar, Wall: s.around(op, x, y)}
			}
		}
	}
	if best < 0 {
		return Place{Opening: -1, Sector: Other, Wall: Other}
	}
	sec := s.around(best, x, y)
	return Place{Opening: best, Sector: sec, Wall: sec}
}

// around returns the sector of (x, y) by its direction from opening i's
// centre.
func (s Layout) around(i int, x, y float64) Sector {
	cx, cy, _ := s.Openings[i].Centre()
	// Angle from the crown direction: the load axis points towards −y for
	// the default vertical load (image up), so crown = −(cos α, sin α).
	la := s.LoadAngleDeg * math.Pi / 180
	ax, ay := -math.Cos(la), -math.Sin(la)
	dx, dy := x-cx, y-cy
	along := dx*ax + dy*ay
	across := dx*(-ay) + dy*ax // positive to the right of the crown direction
	ang := math.Atan2(math.Abs(across), along) * 180 / math.Pi
	switch {
	case ang <= s.CrownHalfAngle:
		return Crown
	case ang >= 180-s.CrownHalfAngle:
		return Invert
	case across > 0:
		return RightSidewall
	}
	return LeftSidewall
}

// inPillar reports whether (x, y) lies in the convex hull of openings a
// and b's equivalent circles (which must not overlap). In coordinates t
// along the line of centres from a's centre (length l) and n across it,
// an outer common tangent has the unit normal m = (m_t, ±m_n) with
// m_t = (r_a − r_b)/l, m_n = √(1 − m_t²), touching a at r_a·m and b at
// (l, 0) + r_b·m; the hull between the tangent points is
// t·m_t + |n|·m_n ≤ r_a with r_a·m_t ≤ t ≤ l + r_b·m_t (the chords
// through the tangent points). margin moves the tangents out by that
// many px (see LocateCell). The discs themselves are left to the caller.
func (s Layout) inPillar(a, b int, x, y, margin float64) bool {
	ax, ay, ar := s.Openings[a].Centre()
	bx, by, br := s.Openings[b].Centre()
	l := math.Hypot(bx-ax, by-ay)
	if l <= ar+br {
		return false
	}
	ux, uy := (bx-ax)/l, (by-ay)/l
	t := (x-ax)*ux + (y-ay)*uy
	n := math.Abs(-(x-ax)*uy + (y-ay)*ux)
	mt := (ar - br) / l
	mn := math.Sqrt(1 - mt*mt)
	return t >= ar*mt && t <= l+br*mt && t*mt+n*mn <= ar+margin
}
