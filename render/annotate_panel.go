package render

import (
	"fmt"
	"math"
	"strconv"
)

// drawPanel lays out the side panel, top to bottom: the quantity and its
// unit and sign convention; the colour bar; how the limits were chosen;
// the frame, its time, nominal stress and share of the peak; which photo
// is underneath; the scale bar; the legend of outlines, arrows and onsets;
// the notes. Every line states a measurement or how it is drawn, nothing
// more.
func drawPanel(p *sidePanel, opt OverlayOptions, gain float64, over, under bool) {
	q, lim := opt.Quantity, opt.Limits
	u := q.Unit(lim, opt.Scale)
	p.text(p.bold, panelInk, q.Symbol+"  "+q.Label)
	head := q.Convention
	if u.Symbol != "" {
		head = u.Symbol + " · " + head
	}
	p.text(p.normal, panelMuted, head)
	p.colourBar(opt.Map, lim, u, over, under)
	p.text(p.fine, panelInk, "limits "+limitRange(lim, u))
	p.text(p.fine, panelMuted, limitOrigin(lim))
	p.gap(0.5)

	st := opt.Stamp
	p.text(p.bold, panelInk, st.Frame)
	if st.HasTime {
		p.text(p.normal, panelInk, "t = "+panelSeconds(st.Time))
	}
	if st.HasStress {
		p.text(p.normal, panelInk, fmt.Sprintf("σ = %.1f MPa nominal", st.Stress))
		if st.Peak > 0 {
			p.text(p.fine, panelMuted, fmt.Sprintf("%.0f %% of the test's peak, %.1f MPa", 100*st.Stress/st.Peak, st.Peak))
		}
	}
	if opt.Deform.moves() {
		p.text(p.fine, panelMuted, "on this frame's photo, moved with the material")
	} else {
		p.text(p.fine, panelMuted, "on the reference photo, where it was measured")
	}
	p.gap(0.5)
	p.scaleBar(float64(opt.Scale))
	p.gap(0.3)

	if len(opt.Zones) > 0 || opt.ReserveZones {
		p.zoneSample("localization", "zone: localized strain")
		p.zoneSample("decorrelation", "zone: points lost (decorrelation)")
	}
	if opt.Vectors != nil {
		if gain > 0 {
			p.text(p.fine, panelInk, "arrows: displacement × "+strconv.FormatFloat(gain, 'g', 3, 64))
		} else {
			p.text(p.fine, panelInk, "arrows: no displacement")
		}
	}
	if len(opt.Onsets) > 0 || opt.ReserveOnsets > 0 {
		p.gap(0.2)
		p.text(p.normal, panelInk, "onsets measured so far")
		if len(opt.Onsets) == 0 {
			p.text(p.fine, panelMuted, "none yet")
		}
		for _, o := range opt.Onsets {
			p.onsetLine(o)
		}
		for k := max(len(opt.Onsets), 1); k < opt.ReserveOnsets; k++ {
			p.y += p.l.line
		}
	}
	if len(opt.Notes) > 0 {
		p.gap(0.3)
		for _, n := range opt.Notes {
			p.text(p.fine, panelMuted, n)
		}
	}
}

// onsetLine writes one legend line: the badge and the onset's text.
func (p *sidePanel) onsetLine(o OnsetMark) {
	r := p.l.badgeR
	if p.img != nil {
		onsetBadge(p.img, p.fine, p.x0+p.l.margin+r, p.y-int(0.33*p.l.font), r, o.Number)
	}
	p.textAt(p.l.margin+2*r+int(0.5*p.l.font), p.fine, panelInk, o.Legend)
	p.y += p.l.line
}

// limitRange writes the limits in the display unit.
func limitRange(lim Limits, u Unit) string {
	lo, hi := lim.Lo*u.Factor, lim.Hi*u.Factor
	if lim.Centred && lo == -hi {
		return "±" + panelValue(hi) + " " + u.Symbol
	}
	return panelValue(lo) + " to " + panelValue(hi) + " " + u.Symbol
}

// limitOrigin says how the limits were chosen.
func limitOrigin(lim Limits) string {
	pct := fmt.Sprintf("%g–%g %%", lim.LowPct, lim.HighPct)
	switch lim.Mode {
	case LimitsSequence:
		return "from the " + pct + " range of all frames"
	case LimitsFrame:
		return "from the " + pct + " range of this frame"
	}
	return "fixed"
}

// panelValue writes a value with three significant digits and a true
// minus sign.
func panelValue(v float64) string {
	s := strconv.FormatFloat(v, 'g', 3, 64)
	if math.Abs(v) >= 1000 {
		s = strconv.FormatFloat(v, 'f', 0, 64)
	}
	if v < 0 {
		s = "−" + s[1:]
	}
	return s
}

// panelSeconds writes a time in s with a precision that suits it.
func panelSeconds(t float64) string {
	switch a := math.Abs(t); {
	case a >= 100:
		return strconv.FormatFloat(t, 'f', 0, 64) + " s"
	case a >= 1:
		return strconv.FormatFloat(t, 'f', 1, 64) + " s"
	}
	return strconv.FormatFloat(t, 'f', 3, 64) + " s"
}
