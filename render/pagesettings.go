package render

import (
	"fmt"
	"path/filepath"
	"strings"

	"spallscope/strain/strainfile"
)

// pageRow is one row of a two-column table: a label, its value and an
// optional remark.
type pageRow struct {
	Label, Value, Note string
}

// pageNoise is one row of the resolution table.
type pageNoise struct {
	Quantity, Value, Unit, Other string
}

// summaryRows describe the job: what was measured, from what, when.
func summaryRows(r *runRecords) []pageRow {
	var rows []pageRow
	add := func(label, value, note string) {
		if value != "" {
			rows = append(rows, pageRow{label, value, note})
		}
	}
	abs, err := filepath.Abs(r.Dir)
	if err != nil {
		abs = r.Dir
	}
	add("Run folder", abs, "")
	if t := r.Track; t != nil {
		add("Images", t.Images, "")
		add("Reference frame", t.Reference, "displacements are measured from it (Lagrangian)")
		if len(t.Exclude) > 0 {
			add("Openings and exclusions", strings.Join(t.Exclude, "; "), "reference px")
		}
		add("Tracked by", t.Tool, "")
	}
	if n := len(r.Axis.Names); n > 0 {
		add("Frames", fmt.Sprintf("%d (%s … %s)", n, r.Axis.Names[0], r.Axis.Names[n-1]), "")
		if r.Axis.Timed {
			add("Time span", fmt.Sprintf("%.4g s to %.4g s", r.Axis.X[0], r.Axis.X[n-1]), "camera clock")
		}
	}
	if r.Scale.Known() {
		add("Image scale", fmt.Sprintf("%.4g mm/px", float64(r.Scale)), "")
	} else {
		add("Image scale", "unknown", "lengths and areas in px")
	}
	if l := r.Load; l != nil {
		add("Load log", l.Path, fmt.Sprintf("loaded area %.4g mm², log clock minus camera clock %.4g s", l.AreaMM2, l.Offset))
		for _, n := range l.Notes {
			add("Load log note", n, "")
		}
	}
	if pk, at, ok := r.peak(); ok {
		v := fmt.Sprintf("%.4g MPa at %.4g s", pk, at)
		if r.Onset != nil && r.Onset.Peak.Frame != "" {
			v += " (frame " + r.Onset.Peak.Frame + ")"
		}
		add("Peak nominal stress", v, "")
	}
	if o := r.Onset; o != nil {
		s := o.Settings
		var inds []string
		for _, ind := range s.Indicators {
			inds = append(inds, string(ind))
		}
		add("Zone indicators", strings.Join(inds, ", "), fmt.Sprintf("a zone must last %d frames to be an onset", s.Persistence))
		add("Elastic baseline", fmt.Sprintf("%d frames up to %.0f %% of the peak stress", s.CalibFrames, 100*s.CalibrateBelow), "")
		ucs := "not given"
		if s.UCS > 0 {
			ucs = fmt.Sprintf("%.4g MPa", s.UCS)
		}
		add("Stress ratio K, UCS", fmt.Sprintf("K = %s, UCS %s", formatFactor(s.K), ucs), "for the boundary-stress comparison only")
	}
	return rows
}

// settingsRows are the settings that produced the results, the reporting
// items of the iDICs Good Practices Guide (2018).
func settingsRows(r *runRecords) []pageRow {
	var rows []pageRow
	add := func(label, value, note string) {
		if value != "" {
			rows = append(rows, pageRow{label, value, note})
		}
	}
	mm := func(px float64) string {
		if r.Scale.Known() {
			return fmt.Sprintf(" (%.3g mm)", r.Scale.MM(px))
		}
		return ""
	}
	res := r.Resolution
	if t := r.Track; t != nil {
		s := t.Settings
		add("Subset", fmt.Sprintf("%d px%s", s.Subset, mm(float64(s.Subset))), "side of the square subset")
		add("Step", fmt.Sprintf("%d px%s", s.Step, mm(float64(s.Step))), "grid spacing")
		add("Shape function", s.Order.String(), "")
		add("Interpolation", s.Interpolation.String(), "B-spline of the gray levels")
		add("Reference strategy", string(s.Reference), "")
		add("Correlation criterion", fmt.Sprintf("ZNCC, points below %.3g count as lost", s.MinZNCC), "")
	} else if res != nil {
		add("Subset", fmt.Sprintf("%d px%s", res.Subset, mm(float64(res.Subset))), "")
		add("Step", fmt.Sprintf("%d px%s", res.Step, mm(float64(res.Step))), "")
		add("Shape function", res.ShapeFunction, "")
		add("Interpolation", res.Interpolation, "")
	}
	if s := r.Strain; s != nil {
		add("Strain window", fmt.Sprintf("%d × %d grid points, fit order %d", s.Window, s.Window, s.Order), "pointwise least squares")
		add("Strain measure", string(s.Measure), "tension positive")
		vsg := fmt.Sprintf("%d px", s.VSG)
		if s.VSGmm > 0 {
			vsg += fmt.Sprintf(" (%.3g mm)", s.VSGmm)
		}
		add("Virtual strain gauge", vsg, "(window − 1) · step + subset")
	} else if res != nil {
		add("Strain window", fmt.Sprintf("%d × %d grid points", res.Window, res.Window), "")
		add("Strain measure", res.Measure, "")
		add("Virtual strain gauge", fmt.Sprintf("%d px", res.VSG), "")
	}
	return rows
}

// noiseRows is the resolution table: the noise floor of each quantity.
func noiseRows(res *strainfile.ResolutionRecord) []pageNoise {
	if res == nil {
		return nil
	}
	um := func(mm float64) string {
		if mm <= 0 {
			return ""
		}
		return fmt.Sprintf("%.3g µm", 1000*mm)
	}
	vmm := 0.0
	if res.U > 0 && res.UMM > 0 {
		vmm = res.V * res.UMM / res.U
	}
	rows := []pageNoise{
		{"u", fmt.Sprintf("%.3g", res.U), "px", um(res.UMM)},
		{"v", fmt.Sprintf("%.3g", res.V), "px", um(vmm)},
	}
	for _, c := range []struct {
		name string
		v    float64
	}{{"exx", res.Exx}, {"eyy", res.Eyy}, {"exy", res.Exy}, {"e1", res.E1}, {"e2", res.E2}, {"γmax", res.GammaMax}, {"e_eq", res.Eeq}} {
		rows = append(rows, pageNoise{c.name, fmt.Sprintf("%.3g", 1e6*c.v), "µε", ""})
	}
	return rows
}

// staticFrames says which frames gave the noise floor.
func staticFrames(res *strainfile.ResolutionRecord) string {
	if res == nil {
		return ""
	}
	s := strings.Join(res.StaticFrames, ", ")
	if s == "" {
		s = "not recorded"
	}
	return fmt.Sprintf("%s (%d with scatter, pooled as the root mean square of the per-frame standard deviations)", s, res.Frames)
}
