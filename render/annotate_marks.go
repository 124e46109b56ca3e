package render

import (
	"image"
	"math"
	"slices"

	"gocv.io/x/gocv"

	"spallscope/dic"
)

// drawZoneOutlines outlines the zones on img: each zone's grid points as
// squares of one step (the area each point stands for), their outer and
// inner boundaries traced by OpenCV (FindContours) and drawn as a light
// line edged in dark (localization) or the reverse (decorrelation). With d
// set, the outlines move with the material to the current frame.
func drawZoneOutlines(img *gocv.Mat, g dic.Grid, zones []ZoneOutline, d *Deformation, thick int) {
	if len(zones) == 0 || g.Step <= 0 {
		return
	}
	w, h := img.Cols(), img.Rows()
	for _, class := range []string{"localization", "decorrelation"} {
		mask := make([]byte, w*h)
		found := false
		for _, z := range zones {
			if (z.Class == "decorrelation") != (class == "decorrelation") {
				continue
			}
			for _, c := range z.Cells {
				if c < 0 || c >= g.Len() {
					continue
				}
				x, y := g.Pos(c)
				x0, y0 := max(0, x-g.Step/2), max(0, y-g.Step/2)
				x1, y1 := min(w, x0+g.Step), min(h, y0+g.Step)
				for yy := y0; yy < y1; yy++ {
					for xx := x0; xx < x1; xx++ {
						mask[yy*w+xx] = 255
					}
				}
				found = true
			}
		}
		if !found {
			continue
		}
		m, err := gocv.NewMatFromBytes(h, w, gocv.MatTypeCV8U, mask)
		if err != nil {
			continue
		}
		contours := gocv.FindContours(m, gocv.RetrievalList, gocv.ChainApproxSimple)
		m.Close()
		pts := contours.ToPoints()
		contours.Close()
		if d != nil {
			for _, c := range pts {
				for k, p := range c {
					if x, y, ok := d.Current(float64(p.X), float64(p.Y)); ok {
						c[k] = image.Pt(int(math.Round(x)), int(math.Round(y)))
					}
				}
			}
		}
		pv := gocv.NewPointsVectorFromPoints(pts)
		outer, inner := zoneInks(class)
		gocv.Polylines(img, pv, true, outer, thick+2)
		gocv.Polylines(img, pv, true, inner, thick)
		pv.Close()
	}
}

// drawVectors draws displacement arrows, light on a dark edge, at every
// v.Every-th grid point, from where the point is shown (its reference
// position, or with d its current one) along its displacement times the
// gain (vectorGain).
func drawVectors(img *gocv.Mat, v *Vectors, d *Deformation, gain float64) {
	every := max(1, v.Every)
	g := v.U.Grid
	if !(gain > 0) {
		return
	}
	type arrow struct{ a, b image.Point }
	var arrows []arrow
	for r := 0; r < g.Rows; r += every {
		for c := 0; c < g.Cols; c += every {
			i := g.Index(c, r)
			u, w := v.U.Values[i], v.V.Values[i]
			if math.IsNaN(u + w) {
				continue
			}
			x, y := g.Pos(i)
			fx, fy := float64(x), float64(y)
			if d != nil {
				var ok bool
				if fx, fy, ok = d.Current(fx, fy); !ok {
					continue
				}
			}
			a := image.Pt(int(math.Round(fx)), int(math.Round(fy)))
			b := image.Pt(int(math.Round(fx+gain*u)), int(math.Round(fy+gain*w)))
			if a != b {
				arrows = append(arrows, arrow{a, b})
			}
		}
	}
	for _, ar := range arrows {
		gocv.ArrowedLine(img, ar.a, ar.b, markDark, 3)
	}
	for _, ar := range arrows {
		gocv.ArrowedLine(img, ar.a, ar.b, markLight, 1)
	}
}

// vectorGain is the gain arrows are drawn at: v's own, or AutoVectorGain
// when it has none (0: nothing moved).
func vectorGain(v *Vectors) float64 {
	gain := v.Gain
	if gain == 0 {
		gain = AutoVectorGain(v.U, v.V, max(1, v.Every))
	}
	if !(gain > 0) {
		return 0
	}
	return gain
}

// AutoVectorGain returns the arrow gain at which the 99th percentile of the
// displacement magnitude is drawn 0.9 of the spacing of arrows drawn at
// every every-th point (0 when nothing moved).
func AutoVectorGain(u, v *GridValues, every int) float64 {
	var mags []float64
	for i := range u.Values {
		if m := math.Hypot(u.Values[i], v.Values[i]); !math.IsNaN(m) {
			mags = append(mags, m)
		}
	}
	if len(mags) == 0 {
		return 0
	}
	slices.Sort(mags)
	p := Percentile(mags, 99)
	if !(p > 0) {
		return 0
	}
	return 0.9 * float64(max(1, every)*u.Grid.Step) / p
}

// placedBadge is an onset badge's place on the image.
type placedBadge struct {
	at     image.Point
	number int
}

// placeOnsets marks each onset's place with a small ringed dot and a leader
// to where its numbered badge goes (up and to the right, turned until it
// clears the badges already placed and kept inside the image); the badges
// themselves are drawn on the canvas with the panel's lettering.
func placeOnsets(img *gocv.Mat, onsets []OnsetMark, d *Deformation, l panelLayout) []placedBadge {
	w, h := img.Cols(), img.Rows()
	r := l.badgeR
	var out []placedBadge
	for _, o := range onsets {
		x, y := o.X, o.Y
		if d != nil {
			x, y, _ = d.Current(x, y)
		}
		p := image.Pt(int(math.Round(x)), int(math.Round(y)))
		dist := 2.4 * float64(r)
		var at image.Point
		for k := 0; k < 12; k++ {
			ang := -math.Pi/4 - float64(k)*math.Pi/6
			at = image.Pt(p.X+int(dist*math.Cos(ang)), p.Y+int(dist*math.Sin(ang)))
			at.X = min(max(at.X, r+1), w-r-2)
			at.Y = min(max(at.Y, r+1), h-r-2)
			clear := true
			for _, b := range out {
				if math.Hypot(float64(b.at.X-at.X), float64(b.at.Y-at.Y)) < 2.2*float64(r) {
					clear = false
					break
				}
			}
			if clear {
				break
			}
		}
		gocv.Line(img, p, at, markDark, 3)
		gocv.Line(img, p, at, markLight, 1)
		gocv.Circle(img, p, max(2, r/3), markDark, -1)
		gocv.Circle(img, p, max(2, r/3), markLight, 1)
		out = append(out, placedBadge{at, o.Number})
	}
	return out
}
