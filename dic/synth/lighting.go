package synth

import (
	"errors"
	"fmt"
	"math"

	"spallscope/dic/region"
	"spallscope/subset"
)

// Lighting is how the light on the face changes over a test, applied to
// each frame's exposure before noise and quantisation: a gain that drifts
// linearly from Exposure at the first frame to Exposure·(1 + Drift) at
// the last (a lamp
// that dims), a fall-off across the face (gain × (1 + Gradient·(x/W −
// ½)), light from one side), a flicker of ±Flicker gray levels on
// alternate frames, and an optional flash.
type Lighting struct {
	// Exposure is the gain of the first frame (0: 1), below 1 to leave
	// headroom for a flash.
	Exposure float64 `json:"exposure,omitempty"`
	Drift    float64 `json:"drift,omitempty"`
	Gradient float64 `json:"gradient,omitempty"`
	Flicker  float64 `json:"flicker_levels,omitempty"`
	Flash    *Flash  `json:"flash,omitempty"`
}

// Flash is a light that fires in one frame: the exposure inside Region
// (nil: the whole frame) is multiplied by Gain in frame Frame — a flash or
// an LED in view, a visible event to sync the camera with the load log.
type Flash struct {
	Frame  int          `json:"frame"`
	Gain   float64      `json:"gain"`
	Region *region.Rect `json:"region,omitempty"`
}

// Validate reports lighting that cannot be rendered.
func (l *Lighting) Validate(frames int) error {
	var errs []error
	if !finiteAll(l.Exposure, l.Drift, l.Gradient, l.Flicker) || l.Exposure < 0 || l.Drift <= -1 || math.Abs(l.Gradient) >= 2 {
		errs = append(errs, fmt.Errorf("exposure %g, drift %g, gradient %g and flicker %g: expected finite numbers, exposure ≥ 0, drift above −1 and gradient within ±2", l.Exposure, l.Drift, l.Gradient, l.Flicker))
	}
	if f := l.Flash; f != nil {
		if f.Frame < 0 || f.Frame >= frames || !(f.Gain > 0) || math.IsInf(f.Gain, 0) {
			errs = append(errs, fmt.Errorf("flash: frame %d and gain %g, expected a frame 0 to %d and a positive gain", f.Frame, f.Gain, frames-1))
		}
		if f.Region != nil {
			if err := f.Region.Validate(); err != nil {
				errs = append(errs, fmt.Errorf("flash region: %w", err))
			}
		}
	}
	return errors.Join(errs...)
}

func finiteAll(v ...float64) bool {
	for _, x := range v {
		if math.IsNaN(x) || math.IsInf(x, 0) {
			return false
		}
	}
	return true
}

// Light applies the lighting of a frame of an n-frame sequence to an
// exposure in place (nil: steady light).
func (l *Lighting) Light(img *subset.Image, frame, n int) {
	if l == nil {
		return
	}
	s := 0.0
	if n > 1 {
		s = float64(frame) / float64(n-1)
	}
	gain := 1 + l.Drift*s
	if l.Exposure != 0 {
		gain *= l.Exposure
	}
	offset := l.Flicker
	if frame%2 == 1 {
		offset = -offset
	}
	w := float64(img.Width)
	for y := 0; y < img.Height; y++ {
		row := img.Row(y)
		for x := range row {
			g := gain * (1 + l.Gradient*(float64(x)/w-0.5))
			if f := l.Flash; f != nil && f.Frame == frame && (f.Region == nil || f.Region.Contains(float64(x), float64(y))) {
				g *= f.Gain
			}
			row[x] = float32(g*float64(row[x]) + offset)
		}
	}
}
