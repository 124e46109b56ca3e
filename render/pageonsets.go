package render

import (
	"fmt"
	"math"
	"slices"
	"strings"

	"spallscope/strain"
	"spallscope/strain/strainfile"
)

// pageOnset is one onset of the table and of the details below it, every
// value already formatted.
type pageOnset struct {
	// Number is the onset's place in onset.json, the number of its badge
	// on the overlays and of its history panel.
	Number                  int
	Class, Place, Indicator string
	Frame, Time, Stress     string
	Percent, Area           string
	// Interval is the 95 % interval in the table: frames and stress;
	// IntervalTitle adds the times and the frames' names (the cell's
	// tooltip); IntervalLong is the details line.
	Interval, IntervalTitle string
	IntervalLong            string
	// Trigger is the frame whose threshold confirmed the zone; Back says
	// how far the onset was back-dated from it.
	Trigger, Back string
	// Flag warns about the row, e.g. a stress from outside the load log.
	Flag string
	// Reached names the other places the event's zones grew into ("" for
	// none), and Also the other indicators' first frames of the event.
	Reached, Also string
	// Short is the boundary-stress comparison in a few words for the
	// table; Context the whole of it.
	Short   string
	Context *pageContext
	// NoContext says why there is no comparison.
	NoContext string
}

// pageContext is the Kirsch boundary-stress comparison of an onset.
type pageContext struct {
	// Boundary is the elastic boundary stress with its formula.
	Boundary string
	// Ratio is the boundary stress over the UCS, or why there is none.
	Ratio string
	// Range is the published spalling-initiation range with its source.
	Range string
}

// onsetRows formats the onsets of the run, numbered in onset.json's order.
func onsetRows(r *runRecords) []pageOnset {
	if r.Onset == nil {
		return nil
	}
	k := r.Onset.Settings.K
	var rows []pageOnset
	for n, o := range r.Onset.Onsets {
		row := pageOnset{
			Number: n + 1, Class: o.Class, Place: string(o.Sector), Indicator: indicatorLabel(o.Indicator),
			Frame:   fmt.Sprintf("%s (#%d)", o.Name, o.Frame),
			Time:    fmt.Sprintf("%.2f", o.Time),
			Stress:  fmt.Sprintf("%.2f", o.Stress),
			Percent: "—", Interval: "—", Trigger: "—",
		}
		if o.OpeningName != "" {
			row.Place = o.OpeningName + " " + row.Place
		}
		if o.Percent > 0 {
			row.Percent = fmt.Sprintf("%.0f", o.Percent)
		}
		switch {
		case o.AreaMM2 > 0:
			row.Area = fmt.Sprintf("%.3g mm²", o.AreaMM2)
		case o.AreaPx2 > 0:
			row.Area = fmt.Sprintf("%.0f px²", o.AreaPx2)
		default:
			row.Area = "—"
		}
		if iv := o.Interval; iv != nil {
			row.Interval, row.IntervalTitle, row.IntervalLong = intervalText(o, iv)
		}
		if o.TriggerName != "" || o.Interval != nil {
			name := o.TriggerName
			if name == "" {
				name = "frame"
			}
			row.Trigger = fmt.Sprintf("%s (#%d)", name, o.TriggerFrame)
			switch d := o.TriggerFrame - o.Frame; {
			case d > 0:
				row.Back = fmt.Sprintf("back-dated %d frame(s) from the trigger %s", d, row.Trigger)
			case d == 0:
				row.Back = "at the trigger frame " + row.Trigger
			}
		}
		if !o.InSpan {
			row.Flag = "not in the load log: stress not measured"
		}
		if len(o.Touches) > 1 {
			row.Flag = joinNonEmpty("; ", row.Flag, fmt.Sprintf("links openings %s", openingNames(r.Onset.Openings, o.Touches)))
		}
		row.Reached = reachedText(r.Onset.Openings, o.Reached)
		row.Also = alsoText(o)
		if o.Context != nil {
			row.Context = newPageContext(o, k)
			row.Short = shortContext(o.Context)
		} else {
			row.NoContext = "no elastic comparison for this sector"
			if o.Sector == strain.Pillar || o.Class == strain.ThroughGoing {
				row.NoContext = "no single-opening comparison: the stress here depends on the neighbouring openings"
			}
			row.Short = "—"
		}
		rows = append(rows, row)
	}
	return rows
}

// reachedText names the places an event grew into besides its own:
// "A crown, B pillar" ("" for none).
func reachedText(ops []strainfile.OpeningRecord, reached []strain.Reach) string {
	var parts []string
	for _, rc := range reached {
		if rc.Opening < 0 {
			parts = append(parts, "rock beyond the openings' reach")
			continue
		}
		parts = append(parts, openingNames(ops, []int{rc.Opening})+" "+string(rc.Sector))
	}
	return strings.Join(parts, ", ")
}

// alsoText lists the event's other indicators with the first frame of
// each one's confirmed zone, earliest first: "e1 from #25" ("" when only
// the onset's own indicator fired).
func alsoText(o strainfile.OnsetRecord) string {
	type seen struct {
		ind   strain.Indicator
		frame int
	}
	var s []seen
	for ind, f := range o.ByIndicator {
		if ind != o.Indicator {
			s = append(s, seen{ind, f})
		}
	}
	slices.SortFunc(s, func(a, b seen) int {
		if a.frame != b.frame {
			return a.frame - b.frame
		}
		return strings.Compare(string(a.ind), string(b.ind))
	})
	var parts []string
	for _, x := range s {
		parts = append(parts, fmt.Sprintf("%s from #%d", indicatorLabel(x.ind), x.frame))
	}
	return strings.Join(parts, ", ")
}

// intervalMethods names the methods the onsets' intervals were estimated
// by, each once, for the note under the table.
func intervalMethods(r *runRecords) string {
	if r.Onset == nil {
		return ""
	}
	var methods []string
	for _, o := range r.Onset.Onsets {
		if o.Interval != nil && o.Interval.Method != "" && !slices.Contains(methods, o.Interval.Method) {
			methods = append(methods, o.Interval.Method)
		}
	}
	return strings.Join(methods, "; ")
}

// intervalText formats an onset's 95 % interval: for the table (frames and
// stress), for the cell's tooltip (with times and names) and for the
// details (everything, with the change model).
func intervalText(o strainfile.OnsetRecord, iv *strain.OnsetInterval) (cell, title, long string) {
	frames := fmt.Sprintf("#%d–#%d", iv.FirstFrame, iv.LastFrame)
	names := fmt.Sprintf("%s … %s", iv.First, iv.Last)
	if iv.FirstFrame == iv.LastFrame {
		frames, names = fmt.Sprintf("#%d", iv.FirstFrame), iv.First
	}
	stress := ""
	if o.InSpan && plotFinite(iv.StressLo) && plotFinite(iv.StressHi) {
		stress = formatRange(iv.StressLo, iv.StressHi, "%.2f", "MPa")
	}
	times := formatRange(iv.TimeLo, iv.TimeHi, "%.2f", "s")
	conf := fmt.Sprintf("%s %%", formatFactor(100*iv.Confidence))
	cell = joinNonEmpty(", ", frames, stress)
	title = joinNonEmpty(", ", names, times, stress)
	long = fmt.Sprintf("%s interval %s (%s), %s", conf, names, frames, times)
	if stress != "" {
		long += ", " + stress
	}
	if iv.Model != "" {
		long += fmt.Sprintf("; change model %s", iv.Model)
	}
	if plotFinite(iv.LogLik) && iv.LogLik > 0 {
		long += fmt.Sprintf(", log-likelihood ratio %s against no change", formatFactor(iv.LogLik))
	}
	return cell, title, long
}

// shortContext is the boundary-stress comparison in a few words, for the
// table.
func shortContext(c *strain.Context) string {
	switch {
	case math.IsNaN(c.BoundaryStress):
		return "stress unknown"
	case c.BoundaryStress < 0:
		return "tensile"
	case c.UCS > 0:
		return fmt.Sprintf("%.3g MPa · %.2f UCS", c.BoundaryStress, c.RatioToUCS)
	}
	return fmt.Sprintf("%.3g MPa", c.BoundaryStress)
}

// newPageContext formats the boundary-stress comparison of an onset.
func newPageContext(o strainfile.OnsetRecord, k float64) *pageContext {
	c := o.Context
	formula := "(3 − K)"
	if o.Sector == strain.Crown || o.Sector == strain.Invert {
		formula = "(3K − 1)"
	}
	pc := &pageContext{
		Boundary: fmt.Sprintf("σθ ≈ %s·σ = %s × %.3g MPa = %.3g MPa (K = %s)", formula, formatFactor(c.BoundaryFactor), o.Stress, c.BoundaryStress, formatFactor(k)),
		Range:    c.PublishedRange,
	}
	switch {
	case c.BoundaryStress < 0:
		pc.Ratio = "tensile at the boundary: the compressive spalling range does not apply"
	case c.UCS > 0:
		pc.Ratio = fmt.Sprintf("%.2f UCS (UCS %.4g MPa)", c.RatioToUCS, c.UCS)
	default:
		pc.Ratio = "UCS not given: no ratio"
	}
	if pc.Range == "" {
		pc.Range = "spalling initiation at a boundary stress of about 0.4 ± 0.1 UCS (Martin, Kaiser & McCreath 1999)"
	}
	if math.IsNaN(c.BoundaryStress) {
		pc.Boundary = "boundary stress unknown (no stress at this frame)"
	}
	return pc
}

// openingNames names the openings of indices.
func openingNames(ops []strainfile.OpeningRecord, indices []int) string {
	s := ""
	for k, i := range indices {
		name := fmt.Sprint(i)
		for _, op := range ops {
			if op.Index == i {
				name = op.Name
			}
		}
		if k > 0 {
			s += " and "
		}
		s += name
	}
	return s
}

// joinNonEmpty joins the non-empty parts with sep.
func joinNonEmpty(sep string, parts ...string) string {
	out := ""
	for _, p := range parts {
		if p == "" {
			continue
		}
		if out != "" {
			out += sep
		}
		out += p
	}
	return out
}
