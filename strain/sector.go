package strain

import (
	"fmt"
	"math"

	"spallscope/dic/region"
)

// Sector names the part of the rock around an opening, by where it lies
// relative to the loading direction: the crown (the roof, at the end of
// the opening the load comes from), the invert (the floor), the two
// sidewalls (the springlines, across the load, where the compressive
// tangential stress peaks), and the pillar (the ligament between two
// neighbouring openings).
type Sector string

const (
	Crown         Sector = "crown"
	Invert        Sector = "invert"
	LeftSidewall  Sector = "left-sidewall"
	RightSidewall Sector = "right-sidewall"
	Pillar        Sector = "pillar"
	// Other is rock beyond the reach of every opening.
	Other Sector = "other"
)

// Opening is an excavation in the specimen face, in reference px.
type Opening struct {
	Name  string
	Shape region.Shape
}

// centre returns the opening's centre (the centroid of its bounding box,
// exact for circles and ellipses) and its equivalent radius, that of the
// circle with the same bounding box area.
func (o Opening) centre() (cx, cy, r float64) {
	x0, y0, x1, y1 := o.Shape.Bounds()
	if e, ok := o.Shape.(region.Ellipse); ok {
		return e.Cx, e.Cy, math.Sqrt(e.Rx * e.Ry)
	}
	return (x0 + x1) / 2, (y0 + y1) / 2, math.Sqrt((x1 - x0) * (y1 - y0) / math.Pi)
}

// Sectors assigns grid points to openings and sectors.
type Sectors struct {
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
	// PillarHalfWidth is the half-width of a pillar across the line joining
	// two openings' centres, as a fraction of the smaller equivalent radius
	// (default 0.75).
	PillarHalfWidth float64
}

// Effective returns the sectors with defaults in their zero fields (load
// axis 90°, crown half-angle 45°, reach 1, pillar half-width 0.75), as
// they are applied.
func (s Sectors) Effective() Sectors { return s.withDefaults() }

func (s Sectors) withDefaults() Sectors {
	if s.LoadAngleDeg == 0 {
		s.LoadAngleDeg = 90
	}
	if s.CrownHalfAngle == 0 {
		s.CrownHalfAngle = 45
	}
	if s.Reach == 0 {
		s.Reach = 1
	}
	if s.PillarHalfWidth == 0 {
		s.PillarHalfWidth = 0.75
	}
	return s
}

// Validate reports settings that cannot be used.
func (s Sectors) Validate() error {
	s = s.withDefaults()
	if !(s.CrownHalfAngle > 0 && s.CrownHalfAngle < 90) {
		return fmt.Errorf("crown half-angle %g°, expected between 0 and 90", s.CrownHalfAngle)
	}
	if !(s.Reach > 0) || !(s.PillarHalfWidth > 0) {
		return fmt.Errorf("reach %g and pillar half-width %g must be positive", s.Reach, s.PillarHalfWidth)
	}
	for i, o := range s.Openings {
		if o.Shape == nil {
			return fmt.Errorf("opening %d has no shape", i)
		}
	}
	return nil
}

// Classify returns the opening (index into Openings, −1 if none) and the
// sector of reference point (x, y). A point in the ligament between two
// openings (its projection on the line of their centres between their
// walls, close to that line) is pillar, of the nearer opening; otherwise
// the opening is the one whose wall is nearest, within its reach.
func (s Sectors) Classify(x, y float64) (int, Sector) {
	s = s.withDefaults()
	best, bd := -1, math.Inf(1)
	dist := make([]float64, len(s.Openings))
	for i, o := range s.Openings {
		cx, cy, r := o.centre()
		dist[i] = math.Hypot(x-cx, y-cy) - r // distance beyond the equivalent circle
		if dist[i] <= s.Reach*r && dist[i] < bd {
			best, bd = i, dist[i]
		}
	}
	for a := range s.Openings {
		for b := a + 1; b < len(s.Openings); b++ {
			if s.between(a, b, x, y) {
				if dist[b] < dist[a] {
					return b, Pillar
				}
				return a, Pillar
			}
		}
	}
	if best < 0 {
		return -1, Other
	}
	cx, cy, _ := s.Openings[best].centre()
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
		return best, Crown
	case ang >= 180-s.CrownHalfAngle:
		return best, Invert
	case across > 0:
		return best, RightSidewall
	}
	return best, LeftSidewall
}

// between reports whether (x, y) lies in the ligament between openings a
// and b: its projection on the line of centres falls between their walls
// and it is within the pillar half-width of that line.
func (s Sectors) between(a, b int, x, y float64) bool {
	ax, ay, ar := s.Openings[a].centre()
	bx, by, br := s.Openings[b].centre()
	l := math.Hypot(bx-ax, by-ay)
	if l <= ar+br {
		return false
	}
	ux, uy := (bx-ax)/l, (by-ay)/l
	t := (x-ax)*ux + (y-ay)*uy
	n := math.Abs(-(x-ax)*uy + (y-ay)*ux)
	return t > ar && t < l-br && n <= s.PillarHalfWidth*math.Min(ar, br)
}
