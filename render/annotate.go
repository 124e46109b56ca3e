package render

import (
	"fmt"
	"image"
	"image/color"
	"math"
	"strconv"

	"golang.org/x/image/font"
)

// Panel colours: dark text on white, secondary text in gray.
var (
	panelInk   = color.RGBA{0x1f, 0x23, 0x28, 0xff}
	panelMuted = color.RGBA{0x5f, 0x66, 0x6d, 0xff}
	panelPaper = color.RGBA{0xff, 0xff, 0xff, 0xff}
	markLight  = color.RGBA{0xff, 0xff, 0xff, 0xff}
	markDark   = color.RGBA{0x10, 0x10, 0x10, 0xff}
)

// panelLayout holds the side panel's sizes, which follow the image height
// so the lettering keeps its proportion to the photo.
type panelLayout struct {
	font, small   float64 // em sizes, px
	line, margin  int     // line pitch and margin, px
	width         int     // panel width, px
	barW, barH    int     // colour bar, px
	thick, badgeR int     // mark line thickness and onset badge radius, px
}

func newPanelLayout(imageHeight int) panelLayout {
	f := math.Min(40, math.Max(12, math.Round(float64(imageHeight)/38)))
	l := panelLayout{font: f, small: math.Round(0.85 * f), line: int(math.Round(1.4 * f)), margin: int(f)}
	l.width = int(20 * f)
	l.barW, l.barH = int(1.3*f), 9*l.line
	l.thick = max(1, int(math.Round(f/7)))
	l.badgeR = int(math.Round(0.62 * f))
	return l
}

// sidePanel draws the side panel: what is shown, the colour bar, when, the
// scale and the legend. With img nil it only advances, which measures the
// height the content needs.
type sidePanel struct {
	img                *image.RGBA
	x0                 int // left edge of the panel on the canvas
	l                  panelLayout
	y                  int // baseline of the next line
	bold, normal, fine font.Face
}

// newPanel returns a panel at x0 of img (nil to measure).
func newSidePanel(img *image.RGBA, x0 int, l panelLayout) (*sidePanel, error) {
	p := &sidePanel{img: img, x0: x0, l: l, y: l.margin + int(0.8*l.font)}
	var err error
	if p.bold, err = annotateFace(l.font, true); err != nil {
		return nil, err
	}
	if p.normal, err = annotateFace(l.font, false); err != nil {
		return nil, err
	}
	if p.fine, err = annotateFace(l.small, false); err != nil {
		return nil, err
	}
	return p, nil
}

// text writes one line and moves down a line.
func (p *sidePanel) text(face font.Face, c color.RGBA, s string) {
	p.textAt(p.l.margin, face, c, s)
	p.y += p.l.line
}

// textAt writes one line indented by dx px, without moving down.
func (p *sidePanel) textAt(dx int, face font.Face, c color.RGBA, s string) {
	if p.img == nil || s == "" {
		return
	}
	s = annotateFit(face, s, p.l.width-dx-p.l.margin)
	annotateText(p.img, face, p.x0+dx, p.y, c, s)
}

// gap moves down a fraction of a line.
func (p *sidePanel) gap(lines float64) { p.y += int(math.Round(lines * float64(p.l.line))) }

// fill paints a rectangle of the panel (panel coordinates).
func (p *sidePanel) fill(r image.Rectangle, c color.RGBA) {
	if p.img == nil {
		return
	}
	r = r.Add(image.Pt(p.x0, 0)).Intersect(p.img.Rect)
	for y := r.Min.Y; y < r.Max.Y; y++ {
		for x := r.Min.X; x < r.Max.X; x++ {
			p.img.SetRGBA(x, y, c)
		}
	}
}

// frame outlines a rectangle one px wide.
func (p *sidePanel) frame(r image.Rectangle, c color.RGBA) {
	p.fill(image.Rect(r.Min.X, r.Min.Y, r.Max.X, r.Min.Y+1), c)
	p.fill(image.Rect(r.Min.X, r.Max.Y-1, r.Max.X, r.Max.Y), c)
	p.fill(image.Rect(r.Min.X, r.Min.Y, r.Min.X+1, r.Max.Y), c)
	p.fill(image.Rect(r.Max.X-1, r.Min.Y, r.Max.X, r.Max.Y), c)
}

// colourBar draws the vertical colour bar (high values at the top) with
// ticks at round values in the display unit, and a small triangle at an
// end when the frame has values beyond that limit (drawn in the end
// colour).
func (p *sidePanel) colourBar(m Colormap, lim Limits, u Unit, over, under bool) {
	l := p.l
	tri := int(0.7 * l.font)
	top := p.y - int(0.8*l.font) + tri + l.line/3
	bar := image.Rect(l.margin, top, l.margin+l.barW, top+l.barH)
	if p.img != nil {
		for y := bar.Min.Y; y < bar.Max.Y; y++ {
			v := lim.Hi - (lim.Hi-lim.Lo)*float64(y-bar.Min.Y)/float64(bar.Dy()-1)
			r, g, b := m.At(lim.Position(v))
			p.fill(image.Rect(bar.Min.X, y, bar.Max.X, y+1), color.RGBA{r, g, b, 0xff})
		}
		p.frame(bar, panelInk)
		if over {
			r, g, b := m.At(1)
			p.triangle(bar.Min.X, bar.Max.X, bar.Min.Y-1, -tri, color.RGBA{r, g, b, 0xff})
		}
		if under {
			r, g, b := m.At(0)
			p.triangle(bar.Min.X, bar.Max.X, bar.Max.Y, tri, color.RGBA{r, g, b, 0xff})
		}
		for _, tk := range barTicks(lim.Lo*u.Factor, lim.Hi*u.Factor, 6) {
			y := bar.Min.Y + int(math.Round((lim.Hi-tk.value/u.Factor)/(lim.Hi-lim.Lo)*float64(bar.Dy()-1)))
			p.fill(image.Rect(bar.Max.X, y, bar.Max.X+int(0.45*l.font), y+1), panelInk)
			if p.img != nil {
				annotateText(p.img, p.fine, p.x0+bar.Max.X+int(0.7*l.font), y+int(0.35*l.small), panelInk, tk.label)
			}
		}
	}
	p.y = bar.Max.Y + tri + l.line
}

// triangle fills an isosceles triangle on the base from x0 to x1 at row y,
// with its apex h px away (negative: up), outlined in ink.
func (p *sidePanel) triangle(x0, x1, y, h int, c color.RGBA) {
	n := annotateAbs(h)
	for k := 0; k < n; k++ {
		inset := (x1 - x0) * k / (2 * n)
		row := y + annotateSign(h)*k
		if k == n-1 {
			p.fill(image.Rect(x0+inset, row, x1-inset, row+1), panelInk)
			continue
		}
		p.fill(image.Rect(x0+inset, row, x1-inset, row+1), c)
		p.fill(image.Rect(x0+inset, row, x0+inset+1, row+1), panelInk)
		p.fill(image.Rect(x1-inset-1, row, x1-inset, row+1), panelInk)
	}
}

// scaleBar draws a bar of a round length in mm at the photo's scale (the
// panel is drawn at the photo's pixel size), or says the scale is unknown.
func (p *sidePanel) scaleBar(mmPerPx float64) {
	l := p.l
	if !(mmPerPx > 0) {
		p.text(p.fine, panelMuted, "scale unknown: lengths in px")
		return
	}
	maxPx := 0.55 * float64(l.width-2*l.margin)
	mm := barRoundDown(maxPx * mmPerPx)
	px := int(math.Round(mm / mmPerPx))
	if px < 2 {
		p.text(p.fine, panelMuted, fmt.Sprintf("scale %.3g mm/px", mmPerPx))
		return
	}
	h := max(2, l.thick+1)
	y := p.y - int(0.35*l.font)
	p.fill(image.Rect(l.margin, y-h/2, l.margin+px, y-h/2+h), panelInk)
	p.fill(image.Rect(l.margin, y-int(0.4*l.font), l.margin+1, y+int(0.4*l.font)), panelInk)
	p.fill(image.Rect(l.margin+px-1, y-int(0.4*l.font), l.margin+px, y+int(0.4*l.font)), panelInk)
	p.textAt(l.margin+px+int(0.6*l.font), p.normal, panelInk, scaleLabel(mm)+" mm")
	p.y += l.line
}

// zoneSample draws a short piece of zone outline followed by its meaning.
func (p *sidePanel) zoneSample(class string, text string) {
	l := p.l
	y := p.y - int(0.35*l.font)
	w := int(1.6 * l.font)
	outer, inner := zoneInks(class)
	t := l.thick
	p.fill(image.Rect(l.margin, y-(t+2)/2-1, l.margin+w, y-(t+2)/2-1+t+2), outer)
	p.fill(image.Rect(l.margin+1, y-t/2-1, l.margin+w-1, y-t/2-1+t), inner)
	p.textAt(l.margin+w+int(0.5*l.font), p.fine, panelInk, text)
	p.y += l.line
}

// badge draws an onset badge (a white disc with a dark rim and the number)
// centred at (cx, cy) of img.
func onsetBadge(img *image.RGBA, face font.Face, cx, cy, r int, n int) {
	for y := cy - r - 1; y <= cy+r+1; y++ {
		for x := cx - r - 1; x <= cx+r+1; x++ {
			if !image.Pt(x, y).In(img.Rect) {
				continue
			}
			d := math.Hypot(float64(x-cx), float64(y-cy))
			var c color.RGBA
			switch {
			case d <= float64(r)-1.2:
				c = markLight
			case d <= float64(r)+0.5:
				c = markDark
			default:
				continue
			}
			img.SetRGBA(x, y, c)
		}
	}
	s := strconv.Itoa(n)
	m := face.Metrics()
	annotateText(img, face, cx-annotateWidth(face, s)/2, cy+(m.Ascent.Ceil()-m.Descent.Ceil())/2, markDark, s)
}

// zoneInks returns the outer and inner colours of a zone outline:
// localization zones are white lines edged in black, decorrelation zones
// (points lost: material spalled off or cracked open) black edged in white.
func zoneInks(class string) (outer, inner color.RGBA) {
	if class == "decorrelation" {
		return markLight, markDark
	}
	return markDark, markLight
}

// barTick is a colour-bar tick: its value in the display unit and its label.
type barTick struct {
	value float64
	label string
}

// barTicks returns about n ticks at multiples of 1, 2 or 5 × 10^k inside
// [lo, hi], labelled with as many decimals as the step needs.
func barTicks(lo, hi float64, n int) []barTick {
	if !(hi > lo) {
		return nil
	}
	step := barRoundUp((hi - lo) / float64(n))
	dec := max(0, -int(math.Floor(math.Log10(step)+1e-9)))
	var ts []barTick
	for k := math.Ceil(lo/step - 1e-9); k*step <= hi+1e-9*step; k++ {
		v := k * step
		if math.Abs(v) < 1e-12*step {
			v = 0
		}
		ts = append(ts, barTick{v, barTickLabel(v, dec)})
	}
	return ts
}

// barTickLabel writes v with dec decimals and a true minus sign.
func barTickLabel(v float64, dec int) string {
	s := strconv.FormatFloat(v, 'f', dec, 64)
	if v < 0 {
		s = "−" + s[1:]
	}
	return s
}

// barRoundUp returns the smallest of 1, 2, 5 × 10^k that is ≥ x (x > 0).
func barRoundUp(x float64) float64 {
	e := math.Pow(10, math.Floor(math.Log10(x)))
	for _, m := range []float64{1, 2, 5, 10} {
		if m*e >= x*(1-1e-9) {
			return m * e
		}
	}
	return 10 * e
}

// barRoundDown returns the largest of 1, 2, 5 × 10^k that is ≤ x (x > 0).
func barRoundDown(x float64) float64 {
	e := math.Pow(10, math.Floor(math.Log10(x)))
	for _, m := range []float64{5, 2, 1} {
		if m*e <= x*(1+1e-9) {
			return m * e
		}
	}
	return e
}

// scaleLabel writes a round length without trailing zeros.
func scaleLabel(mm float64) string { return strconv.FormatFloat(mm, 'g', 3, 64) }

func annotateAbs(x int) int {
	if x < 0 {
		return -x
	}
	return x
}

func annotateSign(x int) int {
	if x < 0 {
		return -1
	}
	return 1
}
