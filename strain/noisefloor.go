package strain

import (
	"fmt"
	"math"

	"spallscope/dic"
)

// Resolution is the measurement resolution of a run: the noise floor, the
// standard deviation over the field of each quantity measured on static
// frames (no load, so all variation is error), pooled over the frames as
// the root mean square of the per-frame standard deviations. The mean of
// each frame is removed first, so a rigid shift of the specimen between
// shots does not count. It is reported beside every result with the
// settings that produced it, as the iDICs Good Practices Guide (2018) asks.
type Resolution struct {
	Frames   int     `json:"static_frames"`
	U        float64 `json:"u_px"`
	V        float64 `json:"v_px"`
	Exx      float64 `json:"exx"`
	Eyy      float64 `json:"eyy"`
	Exy      float64 `json:"exy"`
	E1       float64 `json:"e1"`
	E2       float64 `json:"e2"`
	GammaMax float64 `json:"gamma_max"`
	Eeq      float64 `json:"e_eq"`
}

// NoiseFloor measures the resolution from the displacement fields of
// static frames and their strain fields (same order). Frames with no
// scatter at all (the reference correlated with itself) are left out. It
// fails when no static frame has valid points.
func NoiseFloor(fields []*dic.Field, strains []*Field) (Resolution, error) {
	if len(fields) != len(strains) {
		return Resolution{}, fmt.Errorf("noise floor: %d displacement fields and %d strain fields", len(fields), len(strains))
	}
	var r Resolution
	var acc [9]float64
	for k, f := range fields {
		var us, vs []float64
		for i := range f.Points {
			if f.Points[i].Valid() {
				u, v := f.Points[i].U()
				us, vs = append(us, u), append(vs, v)
			}
		}
		su, sv := stdDev(us), stdDev(vs)
		if len(us) < 2 || (su < 1e-9 && sv < 1e-9) {
			continue
		}
		var comp [7][]float64
		for _, p := range strains[k].Points {
			if p.Valid {
				for c, v := range [7]float64{p.Exx, p.Eyy, p.Exy, p.E1, p.E2, p.GammaMax, p.Eeq} {
					comp[c] = append(comp[c], v)
				}
			}
		}
		acc[0] += su * su
		acc[1] += sv * sv
		for c := range comp {
			s := stdDev(comp[c])
			acc[2+c] += s * s
		}
		r.Frames++
	}
	if r.Frames == 0 {
		return r, fmt.Errorf("noise floor: none of the %d static frames has valid points that scatter", len(fields))
	}
	n := float64(r.Frames)
	out := [9]*float64{&r.U, &r.V, &r.Exx, &r.Eyy, &r.Exy, &r.E1, &r.E2, &r.GammaMax, &r.Eeq}
	for i, p := range out {
		*p = math.Sqrt(acc[i] / n)
	}
	return r, nil
}

// stdDev is the sample standard deviation (NaN-free input), 0 for fewer
// than two values.
func stdDev(xs []float64) float64 {
	if len(xs) < 2 {
		return 0
	}
	m := 0.0
	for _, x := range xs {
		m += x
	}
	m /= float64(len(xs))
	s := 0.0
	for _, x := range xs {
		s += (x - m) * (x - m)
	}
	return math.Sqrt(s / float64(len(xs)-1))
}
