package strain

import (
	"maps"
	"slices"
)

// Onset classes.
const (
	Localization = "localization"
	Decorrelated = "decorrelation"
	ThroughGoing = "through-going"
)

// Onset is when and where one kind of fracturing began. Finder.Onsets
// gives the trigger: the first frame of a zone that then lasted
// Persistence frames in a row. Dating back-dates it: Frame (and its name,
// time and stress) become the estimated first frame of the damage, with
// the trigger kept in TriggerFrame and the estimate's Interval.
type Onset struct {
	Opening   int       `json:"opening_index"` // −1: away from every opening
	Sector    Sector    `json:"sector"`
	Class     string    `json:"class"`
	Indicator Indicator `json:"indicator"`
	Frame     int       `json:"frame_index"`
	Name      string    `json:"frame"`
	Time      float64   `json:"time_s"`
	Stress    float64   `json:"stress_MPa"`
	Percent   float64   `json:"percent_of_peak"`
	InSpan    bool      `json:"in_load_log"`
	Zone      int       `json:"zone"`
	AreaMM2   float64   `json:"area_mm2,omitempty"`
	AreaPx2   float64   `json:"area_px2"`
	Peak      float64   `json:"peak"`
	Cx        float64   `json:"cx_px"`
	Cy        float64   `json:"cy_px"`
	// ByIndicator gives, for each indicator that fired for this event
	// (and for later events of its place and class), the first frame of
	// its confirmed zone (the earliest is the onset before back-dating; a
	// decorrelation joined to a localization by JoinEvents adds its own).
	ByIndicator map[Indicator]int `json:"frame_by_indicator"`
	// Touches names the openings a through-going zone links.
	Touches []int `json:"touches,omitempty"`
	// Reached lists the other places (opening and sector) the event's
	// zones reached after it began here: one fracture, one onset, however
	// many sectors it grows into (see Finder.Onsets).
	Reached []Reach `json:"reached,omitempty"`
	// TriggerFrame is the frame whose threshold confirmed the zone (the
	// onset before back-dating); the onset is never later.
	TriggerFrame int    `json:"trigger_frame_index"`
	TriggerName  string `json:"trigger_frame,omitempty"`
	// TriggerTime and TriggerStress are the trigger frame's time (s) and
	// nominal stress (MPa), beside the onset's own Time and Stress.
	TriggerTime   float64 `json:"trigger_time_s"`
	TriggerStress float64 `json:"trigger_stress_MPa"`
	// Interval holds the onset with the stated confidence (nil before
	// back-dating).
	Interval *OnsetInterval `json:"interval,omitempty"`
	// History is the zone's indicator frame by frame (nil before
	// back-dating).
	History *OnsetHistory `json:"history,omitempty"`
}

// Onsets times the onsets from the zones found so far: one per physical
// event (see events: the zones connected through marked points, or within
// one VSG at one opening, before they were confirmed apart) — for each
// opening, sector and class (localization, decorrelation) the first frame
// of an event whose zone (one ID) was present in Persistence consecutive
// frames, placed where it was first seen, with the other places its zones
// reached — and for through-going zones. peak is the peak stress for the
// percent-of-peak figure (0 = none). Zones seen in the last
// Persistence−1 frames cannot be confirmed and give no onset.
func (f *Finder) Onsets(peak float64) []Onset {
	p := f.cfg.Persistence
	// Runs of consecutive frames per zone ID (and per "through" state).
	runs := map[string]map[int]*zoneRun{}
	var done []zoneRun
	key := func(z Zone, through bool) string {
		if through {
			return string(z.Indicator) + "/through"
		}
		return string(z.Indicator)
	}
	for zi, z := range f.zones {
		for _, through := range []bool{false, true} {
			if through && !z.Through() {
				continue
			}
			k := key(z, through)
			if runs[k] == nil {
				runs[k] = map[int]*zoneRun{}
			}
			at := f.framePos[z.Frame]
			r := runs[k][z.ID]
			if r != nil && r.last == at-1 {
				r.last = at
				r.zones = append(r.zones, zi)
				continue
			}
			if r != nil {
				done = append(done, *r)
			}
			runs[k][z.ID] = &zoneRun{first: at, last: at, zones: []int{zi}, through: through}
		}
	}
	// The open runs in a fixed order (indicator, then zone ID), so that
	// ties between zones at one place go the same way in every run.
	for _, k := range slices.Sorted(maps.Keys(runs)) {
		for _, id := range slices.Sorted(maps.Keys(runs[k])) {
			done = append(done, *runs[k][id])
		}
	}
	rank := func(ind Indicator) int { return slices.Index(Indicators, ind) }
	zoneOf := func(r zoneRun) *Zone { return &f.zones[r.zones[0]] }
	// The confirmed runs, earliest first (ties: indicator rank, zone ID),
	// through-going ones apart; the others grouped into events per class.
	var through []zoneRun
	classes := map[string][]zoneRun{}
	for _, r := range done {
		if r.last-r.first+1 < p {
			continue
		}
		if r.through {
			through = append(through, r)
			continue
		}
		c := zoneOf(r).Indicator.Class()
		classes[c] = append(classes[c], r)
	}
	order := func(a, b zoneRun) int {
		za, zb := zoneOf(a), zoneOf(b)
		if a.first != b.first {
			return a.first - b.first
		}
		if d := rank(za.Indicator) - rank(zb.Indicator); d != 0 {
			return d
		}
		return za.ID - zb.ID
	}
	type place struct {
		op    int
		sec   Sector
		class string
	}
	best := map[place]*Onset{}
	var places []place
	// add makes the onset of an event (its runs, the first where it began)
	// at place pl, or folds it into the earlier one there.
	add := func(pl place, rs []zoneRun, event []int) {
		r := rs[event[0]]
		z, fr := zoneOf(r), f.frames[r.first]
		o := best[pl]
		if o == nil {
			places = append(places, pl)
		}
		if o == nil || fr.Index < o.Frame || (fr.Index == o.Frame && rank(z.Indicator) < rank(o.Indicator)) {
			by, reached := map[Indicator]int{}, []Reach(nil)
			if o != nil {
				by, reached = o.ByIndicator, o.Reached
			}
			o = &Onset{Opening: pl.op, Sector: pl.sec, Class: pl.class, Indicator: z.Indicator, Frame: fr.Index, Name: fr.Name,
				Time: fr.Time, Stress: fr.Stress, InSpan: fr.InSpan, Zone: z.ID, AreaMM2: z.AreaMM2, AreaPx2: z.AreaPx2,
				Peak: z.Peak, Cx: z.Cx, Cy: z.Cy, ByIndicator: by, Touches: z.Touches, Reached: reached}
			if peak > 0 {
				o.Percent = 100 * fr.Stress / peak
			}
			best[pl] = o
		}
		for _, ri := range event {
			zr := zoneOf(rs[ri])
			at := f.frames[rs[ri].first].Index
			if old, ok := o.ByIndicator[zr.Indicator]; !ok || at < old {
				o.ByIndicator[zr.Indicator] = at
			}
		}
		if pl.class != ThroughGoing {
			for _, rc := range f.reached(rs, event, pl.op, pl.sec) {
				if !(rc.Opening == o.Opening && rc.Sector == o.Sector) && !slices.Contains(o.Reached, rc) {
					o.Reached = append(o.Reached, rc)
				}
			}
		}
	}
	for _, c := range slices.Sorted(maps.Keys(classes)) {
		rs := classes[c]
		slices.SortStableFunc(rs, order)
		for _, event := range f.events(rs) {
			r := rs[event[0]]
			z := zoneOf(r)
			op, sec := f.eventPlace(rs, event)
			pl := place{op, sec, c}
			if op < 0 {
				// A zone beyond every opening's reach that adjoins a zone
				// of an opening's sector (a crack from the crown running
				// past the reach) is that sector's event.
				if op, sec, ok := f.adjoining(*z, f.frames[r.last].Index); ok {
					pl = place{op, sec, c}
				}
			}
			add(pl, rs, event)
		}
	}
	slices.SortStableFunc(through, order)
	for k, r := range through {
		z := zoneOf(r)
		add(place{firstOf(z.Touches), "through", ThroughGoing}, through, []int{k})
	}
	out := make([]Onset, 0, len(places))
	for _, pl := range places {
		out = append(out, *best[pl])
	}
	slices.SortStableFunc(out, func(a, b Onset) int {
		if a.Frame != b.Frame {
			return a.Frame - b.Frame
		}
		return rank(a.Indicator) - rank(b.Indicator)
	})
	return out
}

// adjoining returns the opening and sector of a zone placed at an opening
// that shares or neighbours (within two grid steps) a cell of z, in any
// frame up to last; the one with the most such cells.
func (f *Finder) adjoining(z Zone, last int) (int, Sector, bool) {
	near := map[int]bool{}
	g := f.grid
	for _, c := range z.Cells {
		cc, cr := c%g.Cols, c/g.Cols
		for dr := -2; dr <= 2; dr++ {
			for dc := -2; dc <= 2; dc++ {
				if j := g.Index(cc+dc, cr+dr); j >= 0 {
					near[j] = true
				}
			}
		}
	}
	type key struct {
		op  int
		sec Sector
	}
	count := map[key]int{}
	var best key
	for _, o := range f.zones {
		if o.Frame > last || o.Opening < 0 {
			continue
		}
		for _, c := range o.Cells {
			if near[c] {
				k := key{o.Opening, o.Sector}
				count[k]++
				if count[k] > count[best] {
					best = k
				}
			}
		}
	}
	if count[best] == 0 {
		return -1, Other, false
	}
	return best.op, best.sec, true
}

func firstOf(xs []int) int {
	if len(xs) == 0 {
		return -1
	}
	return xs[0]
}
