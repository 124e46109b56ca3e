package strain

import (
	"fmt"
	"strings"
)

// Indicator is what marks rock as part of a localized zone.
type Indicator string

const (
	// MaxPrincipal is the maximum principal strain e1 of the inelastic
	// strain: extension, as in tensile cracking and slabbing.
	MaxPrincipal Indicator = "e1"
	// EquivalentStrain is the von Mises equivalent of the inelastic strain.
	EquivalentStrain Indicator = "e_eq"
	// MaxShear is the engineering maximum shear e1 − e2 of the inelastic
	// strain: shear bands, the arms of a notch.
	MaxShear Indicator = "gamma_max"
	// Decorrelation is loss of correlation: a point that was measured in the
	// reference is lost or diverged, or matches with a ZNCC below the
	// decorrelation limit — material that spalled off or cracked open.
	Decorrelation Indicator = "decorrelation"
)

// Indicators lists every indicator in the order ties between them are
// reported.
var Indicators = []Indicator{MaxPrincipal, EquivalentStrain, MaxShear, Decorrelation}

// ParseIndicators reads a comma-separated list of indicator names.
func ParseIndicators(s string) ([]Indicator, error) {
	var out []Indicator
	for _, f := range strings.Split(s, ",") {
		f = strings.TrimSpace(f)
		ok := false
		for _, ind := range Indicators {
			if Indicator(f) == ind {
				out, ok = append(out, ind), true
			}
		}
		if !ok {
			return nil, fmt.Errorf("indicator %q, expected e1, e_eq, gamma_max or decorrelation", f)
		}
	}
	return out, nil
}

// Class is the kind of onset an indicator reports.
func (ind Indicator) Class() string {
	if ind == Decorrelation {
		return "decorrelation"
	}
	return "localization"
}

// value returns the indicator of an inelastic strain tensor.
func (ind Indicator) value(t Tensor) float64 {
	e1, e2, _ := Principal(t[0], t[1], t[2])
	switch ind {
	case EquivalentStrain:
		return Equivalent(t[0], t[1], t[2])
	case MaxShear:
		return e1 - e2
	}
	return e1
}
