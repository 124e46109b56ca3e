package subset

// MarshalText writes the shape order's name ("affine", "quadratic"), so
// settings files and run records read in words.
func (o ShapeOrder) MarshalText() ([]byte, error) { return []byte(o.String()), nil }

// UnmarshalText reads a shape order's name.
func (o *ShapeOrder) UnmarshalText(b []byte) error {
	v, err := ParseShapeOrder(string(b))
	if err == nil {
		*o = v
	}
	return err
}

// MarshalText writes the interpolation's name ("bicubic", "biquintic").
func (k Interpolation) MarshalText() ([]byte, error) { return []byte(k.String()), nil }

// UnmarshalText reads an interpolation's name.
func (k *Interpolation) UnmarshalText(b []byte) error {
	v, err := ParseInterpolation(string(b))
	if err == nil {
		*k = v
	}
	return err
}
