package subset

import "fmt"

// Status is the outcome of measuring one subset.
type Status uint8

const (
	// Unsolved: no measurement was made (the zero value, so that a result
	// nobody filled in never reads as a measurement).
	Unsolved Status = iota
	// Converged: the iteration met the tolerance and the match passed the
	// correlation gate.
	Converged
	// Diverged: no convergence within the iteration limit, a non-finite or
	// singular update, a flat deformed subset, or a drift from the guess
	// larger than the subset half-size.
	Diverged
	// OutOfImage: the reference subset, or the warped subset in the
	// deformed image, does not lie inside the image.
	OutOfImage
	// LowTexture: the reference subset is too flat to be tracked (zero
	// variance, singular Hessian, or SSSIG below the configured gate).
	LowTexture
	// Masked: too few pixels of the reference subset lie inside the mask.
	Masked
	// Lost: the iteration converged but the deformed subset does not
	// resemble the reference one (ZNSSD above the configured gate), as when
	// the painted surface has spalled off or decorrelated.
	Lost
)

var statusNames = [...]string{
	Unsolved:   "unsolved",
	Converged:  "converged",
	Diverged:   "diverged",
	OutOfImage: "out-of-image",
	LowTexture: "low-texture",
	Masked:     "masked",
	Lost:       "lost",
}

// String returns the lower-case name of s, such as "out-of-image".
func (s Status) String() string {
	if int(s) < len(statusNames) {
		return statusNames[s]
	}
	return fmt.Sprintf("Status(%d)", uint8(s))
}

// ParseStatus is the inverse of Status.String.
func ParseStatus(name string) (Status, error) {
	for s, n := range statusNames {
		if n == name {
			return Status(s), nil
		}
	}
	return 0, fmt.Errorf("subset: unknown status %q", name)
}

// MarshalText implements encoding.TextMarshaler with the names of String.
func (s Status) MarshalText() ([]byte, error) {
	if int(s) >= len(statusNames) {
		return nil, fmt.Errorf("subset: cannot marshal unknown status %d", uint8(s))
	}
	return []byte(statusNames[s]), nil
}

// UnmarshalText implements encoding.TextUnmarshaler with ParseStatus.
func (s *Status) UnmarshalText(text []byte) error {
	v, err := ParseStatus(string(text))
	if err != nil {
		return err
	}
	*s = v
	return nil
}
