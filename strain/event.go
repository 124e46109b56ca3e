package strain

import (
	"maps"
	"math"
	"slices"
)

// Reach is a place a physical event's zones reached besides the place
// where it began: an opening (−1: beyond every opening's reach) and a
// sector of it.
type Reach struct {
	Opening int    `json:"opening_index"`
	Sector  Sector `json:"sector"`
}

// zoneRun is one zone ID of one indicator over consecutive frames: the
// frame positions it spans and its zone in each (indices into
// Finder.zones), and whether it counts the frames in which the zone is
// through-going.
type zoneRun struct {
	first, last int
	zones       []int
	through     bool
}

// events groups the confirmed runs of one class into physical events: the
// lobes of one fracture are one event, reported once, where it began.
// runs must be in the order of their first frame (ties: indicator rank,
// then zone ID); each event lists its runs in that order, so its first run
// is where it began. Run y joins the event of an earlier run x when,
// before y had lasted the persistence on its own (in its first p frames),
// one of its zones
//
//   - shares a grid point with a zone of x in the same or the previous
//     frame: they were connected through marked points (a zone split off
//     from x, another indicator marking the same points, a zone that joined
//     x's), or
//   - lies, centroid to centroid, within one virtual strain gauge (vsg px)
//     of a zone of x of the same frame or the previous one — x still
//     growing —, and both are placed at the same opening (or either beyond
//     every opening's reach).
//
// The first rule is connectivity, the rule that makes a zone; the second
// is the measurement's own resolution: the strain at a point is an average
// over one VSG, so two marked patches closer than that cannot be told
// apart as two fractures (common practice, no source), and a damage
// feature's strain spreads over about that distance on either side, so
// its lobes are that close. Events at different openings are never joined
// by distance: the two walls of a pillar belong to different openings
// (sector.Layout.Locate names the nearer wall's), and their fractures are
// two events even when closer than a VSG. Runs that connect only after
// both were confirmed on their own stay two events (two fractures that
// coalesce).
func (f *Finder) events(runs []zoneRun) [][]int {
	p := f.cfg.Persistence
	parent := make([]int, len(runs))
	for i := range parent {
		parent[i] = i
	}
	var root func(int) int
	root = func(i int) int {
		for parent[i] != i {
			parent[i] = parent[parent[i]]
			i = parent[i]
		}
		return i
	}
	for y := range runs {
		for x := range y {
			if root(x) != root(y) && f.linked(runs[y], runs[x], p) {
				rx, ry := root(x), root(y)
				parent[max(rx, ry)] = min(rx, ry) // the earlier run roots the event
			}
		}
	}
	byRoot := map[int][]int{}
	var roots []int
	for i := range runs {
		r := root(i)
		if byRoot[r] == nil {
			roots = append(roots, r)
		}
		byRoot[r] = append(byRoot[r], i)
	}
	out := make([][]int, 0, len(roots))
	for _, r := range roots {
		out = append(out, byRoot[r])
	}
	return out
}

// linked reports whether run y, in its first p frames, met run x by either
// of the rules of events.
func (f *Finder) linked(y, x zoneRun, p int) bool {
	for k, zy := range y.zones {
		if k >= p {
			break
		}
		at := y.first + k
		for _, xi := range x.zones {
			zx := &f.zones[xi]
			xat := f.framePos[zx.Frame]
			if xat != at && xat != at-1 {
				continue
			}
			if shareCells(f.zones[zy].Cells, zx.Cells) || f.near(&f.zones[zy], zx) {
				return true
			}
		}
	}
	return false
}

// near reports whether two zones lie within one VSG of each other, centroid
// to centroid, at the same opening (or either beyond every opening's
// reach). Without a known VSG (fields without a strain window) nothing is
// near.
func (f *Finder) near(a, b *Zone) bool {
	if f.vsg <= 0 || (a.Opening != b.Opening && a.Opening >= 0 && b.Opening >= 0) {
		return false
	}
	return math.Hypot(a.Cx-b.Cx, a.Cy-b.Cy) <= float64(f.vsg)
}

// shareCells reports whether two sorted lists of grid points share one.
func shareCells(a, b []int) bool {
	i, j := 0, 0
	for i < len(a) && j < len(b) {
		switch {
		case a[i] == b[j]:
			return true
		case a[i] < b[j]:
			i++
		default:
			j++
		}
	}
	return false
}

// eventPlace is where an event began: the place of its first run's zone
// when that zone is the event's only one in the frame the event was
// confirmed (its first run's p-th), else the place of the centroid of all
// its zones' points in that frame (sector.Layout.Locate). The lobes of one
// fracture lie on either side of it — a shear band from a wall marks two
// patches, one either side of its root, about half a VSG away, before its
// core passes the threshold — so their common centroid, not whichever
// lobe happened to be marked first, says where it is.
func (f *Finder) eventPlace(runs []zoneRun, event []int) (int, Sector) {
	first := runs[event[0]]
	at := min(first.first+f.cfg.Persistence-1, first.last)
	var cells []int
	zones := 0
	for _, ri := range event {
		r := runs[ri]
		if at < r.first || at > r.last {
			continue
		}
		cells = append(cells, f.zones[r.zones[at-r.first]].Cells...)
		zones++
	}
	z := &f.zones[first.zones[0]]
	if zones <= 1 {
		return z.Opening, z.Sector
	}
	var sx, sy float64
	for _, c := range cells {
		x, y := f.grid.Pos(c)
		sx, sy = sx+float64(x), sy+float64(y)
	}
	n := float64(len(cells))
	pl := f.cfg.Sectors.Locate(sx/n, sy/n)
	return pl.Opening, pl.Sector
}

// reached lists the places of the event's zones, in every frame of its
// runs, other than where it began (op, sec), in the order first met.
func (f *Finder) reached(runs []zoneRun, event []int, op int, sec Sector) []Reach {
	var out []Reach
	for _, ri := range event {
		for _, zi := range runs[ri].zones {
			z := &f.zones[zi]
			r := Reach{z.Opening, z.Sector}
			if (r.Opening == op && r.Sector == sec) || slices.Contains(out, r) {
				continue
			}
			out = append(out, r)
		}
	}
	return out
}

// JoinClasses joins, at each place (opening and sector), a localization
// onset and a decorrelation onset whose intervals share a frame (an onset
// without an interval spans its own frame): one fracture seen by both
// kinds of indicator — a crack's strain passes the threshold about when
// its opening decorrelates the subsets across it — is one event, not two.
// The earlier onset (ties: localization) is kept, with the other's
// indicators added to its ByIndicator and its reached places to Reached.
// Onsets at one place whose intervals are apart stay two events: a
// sidewall that localizes early and spalls (decorrelates) much later.
// Through-going onsets are left as they are. The order of the onsets is
// kept.
func JoinClasses(onsets []Onset) []Onset {
	span := func(o *Onset) (int, int) {
		if o.Interval == nil {
			return o.Frame, o.Frame
		}
		return min(o.Interval.FirstFrame, o.Frame), max(o.Interval.LastFrame, o.Frame)
	}
	gone := make([]bool, len(onsets))
	out := slices.Clone(onsets)
	for i := range out {
		for j := range out {
			a, b := &out[i], &out[j]
			if gone[i] || gone[j] || a.Class != Localization || b.Class != Decorrelated || a.Opening != b.Opening || a.Sector != b.Sector {
				continue
			}
			alo, ahi := span(a)
			blo, bhi := span(b)
			if alo > bhi || blo > ahi {
				continue
			}
			keep, drop := i, j
			if b.Frame < a.Frame {
				keep, drop = j, i
			}
			k, d := &out[keep], &out[drop]
			by := maps.Clone(k.ByIndicator)
			if by == nil {
				by = map[Indicator]int{}
			}
			for ind, at := range d.ByIndicator {
				if old, ok := by[ind]; !ok || at < old {
					by[ind] = at
				}
			}
			k.ByIndicator = by
			for _, r := range d.Reached {
				if !slices.Contains(k.Reached, r) {
					k.Reached = append(k.Reached, r)
				}
			}
			gone[drop] = true
		}
	}
	kept := out[:0]
	for i := range out {
		if !gone[i] {
			kept = append(kept, out[i])
		}
	}
	return kept
}
