package similarity

import (
	"fmt"
	"math"

	"spallscope/dic"
	"spallscope/subset"
)

// Motion is a frame's similarity transform from the reference, fitted to
// tracked points: the points' centroid (Cx, Cy) moves by (U, V), and the
// points about it turn by RotationDeg and grow by 1 + Magnification. A
// point at X goes to x = c + (U, V) + (1+Magnification)·R·(X − c).
type Motion struct {
	Frame         string  `json:"frame"`
	Points        int     `json:"points"`
	Cx            float64 `json:"cx_px"`
	Cy            float64 `json:"cy_px"`
	U             float64 `json:"u_px"`
	V             float64 `json:"v_px"`
	RotationDeg   float64 `json:"rotation_deg"`
	Magnification float64 `json:"magnification"`
	// MagnificationSD is the standard error of Magnification from the
	// fit's residual scatter (RMS / sqrt(Σ|X − c|²)); it says how well a
	// region of this size and this noise measures a magnification. It
	// takes the points' errors as independent; subsets that overlap (a
	// step below the subset size) share pixels, which makes it optimistic
	// by about subset/step (measured: errors of up to 4 of it at a 21 px
	// subset and a 6 px step).
	MagnificationSD float64 `json:"magnification_sd"`
	// RMS is the root mean square of the residual displacement in px.
	RMS float64 `json:"rms_px"`
}

// MinPoints is the fewest points Fit accepts: a similarity has four
// parameters; a few more keep one bad subset from deciding it.
const MinPoints = 6

// Fit fits the similarity of field f's valid points for which keep (nil:
// every point) is true, by linear least squares on the deformed positions:
// with the points centred on their centroid, s·cos θ = Σ(X·x + Y·y)/Σ|X|²
// and s·sin θ = Σ(X·y − Y·x)/Σ|X|² (the closed form of Umeyama 1991, IEEE
// Trans. PAMI 13, 376–380, for a 2-D similarity without reflection). It
// fails with fewer than MinPoints points or when they are all in one place.
func Fit(f *dic.Field, keep func(x, y int) bool) (Motion, error) {
	m := Motion{Frame: f.Name}
	var sx, sy, su, sv float64
	n := 0
	for i := range f.Points {
		p := &f.Points[i]
		if !p.Valid() || (keep != nil && !keep(p.X, p.Y)) {
			continue
		}
		sx, sy = sx+float64(p.X), sy+float64(p.Y)
		su, sv = su+p.P[subset.PU], sv+p.P[subset.PV]
		n++
	}
	m.Points = n
	if n < MinPoints {
		return m, fmt.Errorf("frame %s: %d measured points in the fitting region, at least %d needed for its magnification", f.Name, n, MinPoints)
	}
	fn := float64(n)
	m.Cx, m.Cy, m.U, m.V = sx/fn, sy/fn, su/fn, sv/fn
	var sxx, dot, cross float64
	for i := range f.Points {
		p := &f.Points[i]
		if !p.Valid() || (keep != nil && !keep(p.X, p.Y)) {
			continue
		}
		X, Y := float64(p.X)-m.Cx, float64(p.Y)-m.Cy
		x, y := X+p.P[subset.PU]-m.U, Y+p.P[subset.PV]-m.V
		sxx += X*X + Y*Y
		dot += X*x + Y*y
		cross += X*y - Y*x
	}
	if !(sxx > 0) {
		return m, fmt.Errorf("frame %s: the fitting region's points are all at one place", f.Name)
	}
	a, b := dot/sxx, cross/sxx
	m.Magnification = math.Hypot(a, b) - 1
	m.RotationDeg = math.Atan2(b, a) * 180 / math.Pi
	var res float64
	for i := range f.Points {
		p := &f.Points[i]
		if !p.Valid() || (keep != nil && !keep(p.X, p.Y)) {
			continue
		}
		X, Y := float64(p.X)-m.Cx, float64(p.Y)-m.Cy
		x, y := X+p.P[subset.PU]-m.U, Y+p.P[subset.PV]-m.V
		ex, ey := x-(a*X-b*Y), y-(b*X+a*Y)
		res += ex*ex + ey*ey
	}
	m.RMS = math.Sqrt(res / fn)
	if n > 2 {
		// Two of the 2n residual components are used by each of the four
		// parameters' worth of fit: σ² = Σe²/(2n − 4) per component.
		sigma := math.Sqrt(res / (2*fn - 4))
		m.MagnificationSD = sigma / math.Sqrt(sxx)
	}
	return m, nil
}
