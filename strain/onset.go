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
	// ByIndicator gives the onset frame of each indicator that fired for
	// this place and class (the earliest is the onset).
	ByIndicator map[Indicator]int `json:"frame_by_indicator"`
	// Touches names the openings a through-going zone links.
	Touches []int `json:"touches,omitempty"`
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

// Onsets times the onsets from the zones found so far: for each opening,
// sector and class (localization, decorrelation), and for through-going
// zones, the first frame of a zone (one ID) present in Persistence
// consecutive frames, placed where it was first seen. peak is the peak
// stress for the percent-of-peak figure (0 = none). Zones seen in the last
// Persistence−1 frames cannot be confirmed and give no onset.
func (f *Finder) Onsets(peak float64) []Onset {
	p := f.cfg.Persistence
	type run struct {
		first, last int // frame positions
		zone        Zone
		through     bool
	}
	pos := map[int]int{} // frame index → position
	for k, fr := range f.frames {
		pos[fr.Index] = k
	}
	// Runs of consecutive frames per zone ID (and per "through" state).
	runs := map[string]map[int]*run{}
	var done []run
	key := func(z Zone, through bool) string {
		if through {
			return string(z.Indicator) + "/through"
		}
		return string(z.Indicator)
	}
	for _, z := range f.zones {
		for _, through := range []bool{false, true} {
			if through && !z.Through() {
				continue
			}
			k := key(z, through)
			if runs[k] == nil {
				runs[k] = map[int]*run{}
			}
			at := pos[z.Frame]
			r := runs[k][z.ID]
			if r != nil && r.last == at-1 {
				r.last = at
				continue
			}
			if r != nil {
				done = append(done, *r)
			}
			runs[k][z.ID] = &run{first: at, last: at, zone: z, through: through}
		}
	}
	// The open runs in a fixed order (indicator, then zone ID), so that
	// ties between zones at one place go the same way in every run.
	for _, k := range slices.Sorted(maps.Keys(runs)) {
		for _, id := range slices.Sorted(maps.Keys(runs[k])) {
			done = append(done, *runs[k][id])
		}
	}
	type place struct {
		op    int
		sec   Sector
		class string
	}
	best := map[place]*Onset{}
	var order []place
	rank := func(ind Indicator) int { return slices.Index(Indicators, ind) }
	for _, r := range done {
		if r.last-r.first+1 < p {
			continue
		}
		z := r.zone
		pl := place{z.Opening, z.Sector, z.Indicator.Class()}
		if z.Opening < 0 {
			// One event, one onset: a zone beyond every opening's reach
			// that adjoins a zone of an opening's sector (a crack from the
			// crown running past the reach) is that sector's event.
			if op, sec, ok := f.adjoining(z, f.frames[r.last].Index); ok {
				pl = place{op, sec, z.Indicator.Class()}
			}
		}
		if r.through {
			pl = place{firstOf(z.Touches), "through", ThroughGoing}
		}
		fr := f.frames[r.first]
		o := best[pl]
		if o == nil {
			order = append(order, pl)
		}
		if o == nil || fr.Index < o.Frame || (fr.Index == o.Frame && rank(z.Indicator) < rank(o.Indicator)) {
			by := map[Indicator]int{}
			if o != nil {
				by = o.ByIndicator
			}
			o = &Onset{Opening: pl.op, Sector: pl.sec, Class: pl.class, Indicator: z.Indicator, Frame: fr.Index, Name: fr.Name,
				Time: fr.Time, Stress: fr.Stress, InSpan: fr.InSpan, Zone: z.ID, AreaMM2: z.AreaMM2, AreaPx2: z.AreaPx2,
				Peak: z.Peak, Cx: z.Cx, Cy: z.Cy, ByIndicator: by, Touches: z.Touches}
			if peak > 0 {
				o.Percent = 100 * fr.Stress / peak
			}
			best[pl] = o
		}
		if at, ok := o.ByIndicator[z.Indicator]; !ok || fr.Index < at {
			o.ByIndicator[z.Indicator] = fr.Index
		}
	}
	out := make([]Onset, 0, len(order))
	for _, pl := range order {
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
