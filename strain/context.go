package strain

// Context sets an onset beside the published range for spalling
// initiation: for a single circular opening in an elastic medium under a
// vertical far-field stress σv and a horizontal one K·σv, the tangential
// (hoop) stress at the sidewall is (3 − K)·σv and at the crown (3K − 1)·σv
// (compression positive; Kirsch 1898, Jaeger, Cook & Zimmerman,
// Fundamentals of Rock Mechanics §8.4). Spalling around openings in
// brittle rock has been observed to start when the boundary stress reaches
// about 0.4 ± 0.1 of the uniaxial compressive strength (Martin, Kaiser &
// McCreath 1999). This is a comparison to help read a result, not a
// verdict on it: openings that are not circular, interact, or sit in a
// finite specimen carry other stresses.
type Context struct {
	BoundaryFactor float64 `json:"boundary_stress_factor"`
	BoundaryStress float64 `json:"boundary_stress_MPa"`
	UCS            float64 `json:"ucs_MPa,omitempty"`
	RatioToUCS     float64 `json:"ratio_to_ucs,omitempty"`
	PublishedRange string  `json:"published_range"`
	Note           string  `json:"note"`
}

// KirschFactor returns the elastic boundary stress of a circular opening
// in units of the vertical far-field stress, for a sector and lateral
// stress ratio K: 3 − K at the sidewalls, 3K − 1 at the crown and invert
// (negative: tension). It reports false for other sectors.
func KirschFactor(sec Sector, k float64) (float64, bool) {
	switch sec {
	case LeftSidewall, RightSidewall:
		return 3 - k, true
	case Crown, Invert:
		return 3*k - 1, true
	}
	return 0, false
}

// NewContext returns the comparison for an onset at sector sec under the
// far-field vertical stress sigmaV (MPa); ucs may be 0 when not known.
func NewContext(sec Sector, sigmaV, k, ucs float64) (*Context, bool) {
	f, ok := KirschFactor(sec, k)
	if !ok {
		return nil, false
	}
	c := &Context{BoundaryFactor: f, BoundaryStress: f * sigmaV,
		PublishedRange: "spalling initiation at a boundary stress of about 0.4 ± 0.1 UCS (Martin, Kaiser & McCreath 1999)",
		Note:           "elastic approximation for a single circular opening in an infinite plate (Kirsch); a comparison, not a verdict",
	}
	if ucs > 0 {
		c.UCS, c.RatioToUCS = ucs, c.BoundaryStress/ucs
	}
	return c, true
}
