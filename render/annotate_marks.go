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
		pts := zoneContours(w, h, g, zones, class)
		if len(pts) == 0 {
			continue
		}
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

// zoneContours are the outlines, in photo px, of the grid cells (a step
// square about each grid point, clipped to the w×h photo) of zones of
// class (decorrelation, or any other class as localization): OpenCV's
// contours of the cells' mask. The mask covers only the cells' bounding
// box and a pixel of background around it (none beyond the photo's
// edge), so it is a few kB for a zone where a photo-sized one is 20 MB at
// 20 MP; the contours are the same as on the whole photo's mask, offset
// (TestZoneContoursEqualWholePhotoMask).
func zoneContours(w, h int, g dic.Grid, zones []ZoneOutline, class string) [][]image.Point {
	type box struct{ x0, y0, x1, y1 int }
	cell := func(c int) (box, bool) {
		if c < 0 || c >= g.Len() {
			return box{}, false
		}
		x, y := g.Pos(c)
		x0, y0 := max(0, x-g.Step/2), max(0, y-g.Step/2)
		b := box{x0, y0, min(w, x0+g.Step), min(h, y0+g.Step)}
		return b, b.x1 > b.x0 && b.y1 > b.y0
	}
	bb, found := box{w, h, 0, 0}, false
	for _, z := range zones {
		if (z.Class == "decorrelation") != (class == "decorrelation") {
			continue
		}
		for _, c := range z.Cells {
			if b, ok := cell(c); ok {
				bb = box{min(bb.x0, b.x0), min(bb.y0, b.y0), max(bb.x1, b.x1), max(bb.y1, b.y1)}
				found = true
			}
		}
	}
	if !found {
		return nil
	}
	bb = box{max(0, bb.x0-1), max(0, bb.y0-1), min(w, bb.x1+1), min(h, bb.y1+1)}
	mw, mh := bb.x1-bb.x0, bb.y1-bb.y0
	mask := make([]byte, mw*mh)
	for _, z := range zones {
		if (z.Class == "decorrelation") != (class == "decorrelation") {
			continue
		}
		for _, c := range z.Cells {
			b, ok := cell(c)
			if !ok {
				continue
			}
			for yy := b.y0; yy < b.y1; yy++ {
				row := mask[(yy-bb.y0)*mw:]
				for xx := b.x0; xx < b.x1; xx++ {
					row[xx-bb.x0] = 255
				}
			}
		}
	}
	m, err := gocv.NewMatFromBytes(mh, mw, gocv.MatTypeCV8U, mask)
	if err != nil {
		return nil
	}
	contours := gocv.FindContours(m, gocv.RetrievalList, gocv.ChainApproxSimple)
	m.Close()
	pts := contours.ToPoints()
	contours.Close()
	for _, c := range pts {
		for k := range c {
			c[k] = c[k].Add(image.Pt(bb.x0, bb.y0))
		}
	}
	return pts
}
