package strain

import (
	"math"

	"spallscope/dic"
)

// geometry holds what zones need to know about each grid point: its
// opening and sector, which opening walls it is close to, and whether it
// lies on the free edge of the measured face.
type geometry struct {
	sectors  Sectors
	opening  []int
	sector   []Sector
	nearWall [][]int // per point: openings whose wall is within reach
	freeEdge []bool
}

// newGeometry classifies the grid points. ref is the reference frame's
// displacement field (which points were measured at all) and may be nil.
// A point touches an opening's wall when some point within touch px of it
// lies inside the opening. It is on the free edge when it is measured and
// has an unmeasured 8-neighbour (or none, at the grid's rim) that is not
// in an opening's shadow — within shadow px of the opening, the reach of a
// subset that overlaps it.
func newGeometry(s Sectors, g dic.Grid, ref *dic.Field, touch, shadow float64) *geometry {
	n := g.Len()
	geo := &geometry{sectors: s, opening: make([]int, n), sector: make([]Sector, n), nearWall: make([][]int, n), freeEdge: make([]bool, n)}
	for i := 0; i < n; i++ {
		x, y := g.Pos(i)
		p := s.LocateCell(float64(x), float64(y), float64(g.Step))
		geo.opening[i], geo.sector[i] = p.Opening, p.Sector
		geo.nearWall[i] = s.within(float64(x), float64(y), touch)
	}
	if ref == nil {
		return geo
	}
	for i := 0; i < n; i++ {
		if !ref.Points[i].Valid() || len(geo.nearWall[i]) > 0 {
			continue
		}
		c, r := i%g.Cols, i/g.Cols
		for dr := -1; dr <= 1 && !geo.freeEdge[i]; dr++ {
			for dc := -1; dc <= 1; dc++ {
				j := g.Index(c+dc, r+dr)
				if j < 0 {
					geo.freeEdge[i] = true
					break
				}
				if jx, jy := g.Pos(j); !ref.Points[j].Valid() && len(s.within(float64(jx), float64(jy), shadow)) == 0 {
					geo.freeEdge[i] = true
					break
				}
			}
		}
	}
	return geo
}

// within returns the openings that contain a point within d px of (x, y)
// (the centre and 16 points on the circle of radius d, and of d/2).
func (s Sectors) within(x, y, d float64) []int {
	var out []int
	for k, o := range s.Openings {
		hit := o.Shape.Contains(x, y)
		for a := 0; a < 16 && !hit; a++ {
			sn, cs := math.Sincos(float64(a) * math.Pi / 8)
			hit = o.Shape.Contains(x+d*cs, y+d*sn) || o.Shape.Contains(x+d/2*cs, y+d/2*sn)
		}
		if hit {
			out = append(out, k)
		}
	}
	return out
}

// place sets a zone's opening and sector (the most common among its
// cells, ties to the earlier opening and the sector met first), the
// openings it touches and whether it reaches the free edge.
func (geo *geometry) place(z *Zone) {
	type key struct {
		op  int
		sec Sector
	}
	count := map[key]int{}
	var order []key
	touches := map[int]bool{}
	for _, c := range z.Cells {
		k := key{geo.opening[c], geo.sector[c]}
		if count[k] == 0 {
			order = append(order, k)
		}
		count[k]++
		for _, o := range geo.nearWall[c] {
			touches[o] = true
		}
		if geo.freeEdge[c] {
			z.FreeEdge = true
		}
	}
	best := order[0]
	for _, k := range order[1:] {
		if count[k] > count[best] || (count[k] == count[best] && k.op >= 0 && best.op < 0) {
			best = k
		}
	}
	z.Opening, z.Sector = best.op, best.sec
	for o := range geo.sectors.Openings {
		if touches[o] {
			z.Touches = append(z.Touches, o)
		}
	}
}
