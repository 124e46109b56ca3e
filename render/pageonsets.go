package render

import (
	"fmt"
	"math"

	"spallscope/strain"
	"spallscope/strain/strainfile"
)

// pageOnset is one row of the onset table, every value already formatted.
type pageOnset struct {
	Class, Opening, Sector, Indicator string
	Frame, Time, Stress, Percent      string
	Area                              string
	// Flag warns about the row, e.g. a stress from outside the load log.
	Flag    string
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

// onsetRows formats the onsets of the run.
func onsetRows(r *runRecords) []pageOnset {
	if r.Onset == nil {
		return nil
	}
	k := r.Onset.Settings.K
	var rows []pageOnset
	for _, o := range r.Onset.Onsets {
		row := pageOnset{
			Class: o.Class, Opening: o.OpeningName, Sector: string(o.Sector), Indicator: string(o.Indicator),
			Frame:   fmt.Sprintf("%s (#%d)", o.Name, o.Frame),
			Time:    fmt.Sprintf("%.2f", o.Time),
			Stress:  fmt.Sprintf("%.2f", o.Stress),
			Percent: "—",
		}
		if row.Opening == "" {
			row.Opening = "—"
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
		if !o.InSpan {
			row.Flag = "not in the load log: stress not measured"
		}
		if len(o.Touches) > 1 {
			row.Flag = joinNonEmpty("; ", row.Flag, fmt.Sprintf("links openings %s", openingNames(r.Onset.Openings, o.Touches)))
		}
		if o.Context != nil {
			row.Context = newPageContext(o, k)
		} else {
			row.NoContext = "no elastic comparison for this sector"
			if o.Sector == strain.Pillar || o.Class == strain.ThroughGoing {
				row.NoContext = "no single-opening comparison: the stress here depends on the neighbouring openings"
			}
		}
		rows = append(rows, row)
	}
	return rows
}

// newPageContext formats the boundary-stress comparison of an onset.
func newPageContext(o strainfile.OnsetRecord, k float64) *pageContext {
	c := o.Context
	formula := "(3 − K)"
	if o.Sector == strain.Crown || o.Sector == strain.Invert {
		formula = "(3K − 1)"
	}
	pc := &pageContext{
		Boundary: fmt.Sprintf("σθ ≈ %s·σ = %.3g × %.3g MPa = %.3g MPa (K = %g)", formula, c.BoundaryFactor, o.Stress, c.BoundaryStress, k),
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
