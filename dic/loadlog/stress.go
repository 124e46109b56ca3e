package loadlog

import (
	"errors"
	"fmt"
	"math"
)

// Stress is the nominal stress of a specimen through a test: the force of
// its load log over its loaded area, σ = F/A, read at camera times. With
// force in N and area in mm², N/mm² is MPa. Compression is positive, as in
// the Log.
//
// The method value s.At is the frame-time → stress function that other
// packages take as a plain func(float64) (float64, bool).
//
// Make one with NewStress, which checks the area and the clock; the
// methods of a Stress without a Log return NaN.
type Stress struct {
	Log     *Log
	AreaMM2 float64 // loaded area in mm², > 0
	Clock   Clock
}

// FrameStress is the nominal stress at one frame. Percent is NaN when the
// log's peak is not positive; encoding/json refuses NaN, so callers that
// write JSON check for it.
type FrameStress struct {
	Time    float64 `json:"time_s"`          // camera time, s
	Stress  float64 `json:"stress_mpa"`      // nominal stress, MPa
	Percent float64 `json:"percent_of_peak"` // Stress as a percentage of the log's peak
	InSpan  bool    `json:"in_span"`         // false: the frame is outside the log's time span
}

// NewStress returns the nominal stress of log over a loaded area in mm²,
// with camera times related to the log by clock. It rejects a missing or
// empty log, an area that is not a positive finite number, an invalid
// clock, and a hand-made log or an area so small that a force or time
// comes out non-finite.
func NewStress(log *Log, areaMM2 float64, clock Clock) (*Stress, error) {
	if log == nil || log.Len() == 0 {
		return nil, errors.New("loadlog: nominal stress: no load log rows")
	}
	if len(log.Force) != len(log.Time) {
		return nil, fmt.Errorf("loadlog: nominal stress: %s has %d times but %d forces", log.Path, len(log.Time), len(log.Force))
	}
	if !(areaMM2 > 0) || math.IsInf(areaMM2, 0) {
		return nil, fmt.Errorf("loadlog: nominal stress: loaded area %g mm², expected a positive area in mm²", areaMM2)
	}
	if err := clock.Validate(); err != nil {
		return nil, fmt.Errorf("loadlog: nominal stress: %w", err)
	}
	for i, f := range log.Force {
		if math.IsNaN(f) || math.IsInf(f, 0) || math.IsInf(f/areaMM2, 0) {
			return nil, fmt.Errorf("loadlog: nominal stress: %s row %d: force %g N over the loaded area %g mm² is not a finite stress; expected a finite force and an area in mm²", log.Path, i+1, f, areaMM2)
		}
	}
	for i, t := range log.Time {
		if lt := clock.CameraTime(t); math.IsNaN(lt) || math.IsInf(lt, 0) {
			return nil, fmt.Errorf("loadlog: nominal stress: %s row %d: log time %g s is camera time %g s with the clock offset; expected finite times", log.Path, i+1, t, lt)
		}
	}
	return &Stress{Log: log, AreaMM2: areaMM2, Clock: clock}, nil
}

// At returns the nominal stress in MPa at a camera time, interpolated
// linearly between log rows. Outside the log's time span it returns the
// stress at the nearest end and inSpan=false, so that callers can flag the
// frame.
func (s *Stress) At(cameraTime float64) (mpa float64, inSpan bool) {
	if s == nil || s.Log == nil {
		return math.NaN(), false
	}
	f, in := s.Log.ForceAt(s.Clock.LogTime(cameraTime))
	return f / s.AreaMM2, in
}

// Peak returns the largest nominal stress of the log in MPa and its camera
// time (the first row with it). The peak is over the whole log, which may
// run before and after the camera.
func (s *Stress) Peak() (mpa, cameraTime float64) {
	if s == nil || s.Log == nil {
		return math.NaN(), math.NaN()
	}
	f, t := s.Log.PeakForce()
	return f / s.AreaMM2, s.Clock.CameraTime(t)
}

// PercentOfPeak returns a stress in MPa as a percentage of the peak. It
// returns NaN when the peak is not positive (no compression logged).
func (s *Stress) PercentOfPeak(mpa float64) float64 {
	peak, _ := s.Peak()
	if !(peak > 0) {
		return math.NaN()
	}
	return 100 * mpa / peak
}

// Frames returns the nominal stress at each of the camera times.
func (s *Stress) Frames(times []float64) []FrameStress {
	peak, _ := s.Peak()
	out := make([]FrameStress, len(times))
	for i, t := range times {
		mpa, in := s.At(t)
		pct := math.NaN()
		if peak > 0 {
			pct = 100 * mpa / peak
		}
		out[i] = FrameStress{Time: t, Stress: mpa, Percent: pct, InSpan: in}
	}
	return out
}
