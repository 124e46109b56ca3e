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
//     of a zone of x of the same frame or the previous one, both placed at
//     the same opening (or either beyond every opening's reach), and y
//     was first marked within p frames of the first frame of x's event.
//
// The first rule is connectivity, the rule that makes a zone; the second
// is the measurement's own resolution, in space and in time: the strain at
// a point is an average over one VSG, so two marked patches closer than
// that cannot be told apart as two fractures (common practice, no source),
// and a damage feature's strain spreads over about that distance on
// either side, so its lobes are that close; and the trigger orders zones
// no finer than its persistence, so lobes first marked within p frames of
// each other began together. A zone first marked nearby but later — a
// crack from the crown a VSG from a sidewall notch marked ten frames
// before, as on the demo's twin face — is an event of its own, unless its
// points were marked by the earlier event's zones: a fracture that starts
// inside an earlier one's marked points is not told apart from it.
// Events at different openings are never joined by distance: the two
// walls of a pillar belong to different openings (sector.Layout.Locate
// names the nearer wall's), and their fractures are two events even when
// closer than a VSG. Runs that connect only after
// both were confirmed on their own stay two events (two fractures that
// coalesce), and a run that meets two events joins one of them only,
// unless all three were first marked within p frames.
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
	// Each run joins the earlier event it met. A run that meets several
	// joins them into one only while all of them are young (first marked
	// within p frames before it: lobes that began together, bridged by
	// the zone between them); a later zone that meets two events (a crack
	// from the crown reaching both sidewalls' zones) does not make them
	// one, and joins the one whose zone it met closest, centroid to
	// centroid.
	for y := range runs {
		var met []int
		closest, best := -1, math.Inf(1)
		for x := range y {
			r := root(x)
			d, ok := f.linked(runs[y], runs[x], runs[r].first, p)
			if !ok {
				continue
			}
			if !slices.Contains(met, r) {
				met = append(met, r)
			}
			if d < best {
				closest, best = r, d
			}
		}
		if len(met) == 0 {
			continue
		}
		young := true
		for _, r := range met {
			young = young && runs[y].first-runs[r].first <= p
		}
		if !young {
			parent[y] = closest
			continue
		}
		first := slices.Min(met) // the earliest run roots the event
		parent[y] = first
		for _, r := range met {
			parent[r] = first
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

// linked reports whether run y, in its first p frames, met run x, of an
// event first marked at frame position start, by either of the rules of
// events, and the least distance between the centroids of the zones that
// met.
func (f *Finder) linked(y, x zoneRun, start, p int) (float64, bool) {
	together := y.first-start <= p
	best, ok := math.Inf(1), false
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
			a := &f.zones[zy]
			if shareCells(a.Cells, zx.Cells) || (together && f.near(a, zx)) {
				best, ok = math.Min(best, math.Hypot(a.Cx-zx.Cx, a.Cy-zx.Cy)), true
			}
		}
	}
	return best, ok
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
// its zones' points in that frame (sector.Layout.LocateCell, the rule of
// the grid points). The lobes of one fracture lie on either side of it —
// a shear band from a wall marks two patches, one either side of its
// root, about half a VSG away, before its core passes the threshold — so
// their common centroid, not whichever lobe happened to be marked first,
// says where it is.
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
	pl := f.cfg.Sectors.LocateCell(sx/n, sy/n, float64(f.grid.Step))
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

// VSG returns the virtual strain gauge of the strain fields in px, (window
// − 1) × step + subset (0 before the first frame, or for fields without a
// strain window).
func (f *Finder) VSG() int { return f.vsg }

// JoinEvents joins back-dated onsets that are one physical event seen
// twice: at one opening (or either beyond every opening's reach), at the
// same place or within vsg px of each other centroid to centroid, with
// intervals that share a frame (an onset without an interval spans its own
// frame). Time and space then cannot tell them apart: a crack's strain
// passes the threshold about when its opening decorrelates the subsets
// across it (a localization and a decorrelation onset at one place), and a
// band's lobe in the next sector confirmed a few frames after the band
// (the trigger orders zones no finer than its noise, which at high noise
// is coarser than Finder.Onsets' persistence window). The earlier onset
// (ties: the indicator listed first in Indicators) is kept, with the
// other's indicators added to its ByIndicator and its place and reached
// places to Reached. Onsets whose intervals are apart stay two events: a
// sidewall that localizes early and spalls (decorrelates) much later; so
// do onsets at two openings (the two walls of a pillar) and through-going
// onsets. The order of the onsets is kept.
func JoinEvents(onsets []Onset, vsg int) []Onset {
	span := func(o *Onset) (int, int) {
		if o.Interval == nil {
			return o.Frame, o.Frame
		}
		return min(o.Interval.FirstFrame, o.Frame), max(o.Interval.LastFrame, o.Frame)
	}
	rank := func(ind Indicator) int { return slices.Index(Indicators, ind) }
	out := slices.Clone(onsets)
	gone := make([]bool, len(out))
	for changed := true; changed; {
		changed = false
		for i := range out {
			for j := i + 1; j < len(out); j++ {
				a, b := &out[i], &out[j]
				if gone[i] || gone[j] || a.Class == ThroughGoing || b.Class == ThroughGoing {
					continue
				}
				if a.Opening != b.Opening && a.Opening >= 0 && b.Opening >= 0 {
					continue
				}
				samePlace := a.Opening == b.Opening && a.Sector == b.Sector
				if !samePlace && !(vsg > 0 && math.Hypot(a.Cx-b.Cx, a.Cy-b.Cy) <= float64(vsg)) {
					continue
				}
				alo, ahi := span(a)
				blo, bhi := span(b)
				if alo > bhi || blo > ahi {
					continue
				}
				keep, drop := i, j
				if b.Frame < a.Frame || (b.Frame == a.Frame && rank(b.Indicator) < rank(a.Indicator)) {
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
				reached := slices.Clone(k.Reached)
				for _, r := range append([]Reach{{d.Opening, d.Sector}}, d.Reached...) {
					if !(r.Opening == k.Opening && r.Sector == k.Sector) && !slices.Contains(reached, r) {
						reached = append(reached, r)
					}
				}
				k.Reached = reached
				gone[drop], changed = true, true
			}
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
