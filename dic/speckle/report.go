package speckle

// NoiseSource tells how the image noise σ of a Report was obtained.
type NoiseSource string

const (
	// NoiseGiven: σ was given (Options.Noise).
	NoiseGiven NoiseSource = "given"
	// NoiseStaticPair: σ = std(I1 − I2)/√2 from a second still photo.
	NoiseStaticPair NoiseSource = "static-pair"
	// NoiseNone: σ is unknown; no displacement noise is predicted.
	NoiseNone NoiseSource = "none"
)

// Report is the assessment of one speckle photo. Gray levels are on the
// scale of the source (0–255 for 8-bit, 0–65535 for 16-bit); lengths are
// in px. Quantities that are undefined (no texture, unknown noise) are 0
// and left out of the JSON where marked omitempty; Notes says why.
type Report struct {
	Width  int `json:"width_px"`
	Height int `json:"height_px"`
	// Depth is the bit depth of the source, 0 if unknown.
	Depth int `json:"depth_bits"`

	// Mean is the mean gray level; Contrast its standard deviation over
	// the image (population form).
	Mean     float64 `json:"mean_gray"`
	Contrast float64 `json:"contrast_gray"`
	Min      float64 `json:"min_gray"`
	Max      float64 `json:"max_gray"`
	// Saturated and Dark are the fractions of pixels at the top and at the
	// bottom gray level of the depth (0 when the depth is unknown).
	Saturated float64 `json:"saturated_fraction"`
	Dark      float64 `json:"dark_fraction"`
	// MIG is the mean intensity gradient in gray levels per px (Sobel/8).
	MIG float64 `json:"mean_intensity_gradient"`
	// Textured is false for an image without any variation of gray level.
	Textured bool `json:"textured"`

	// CorrelationRadiusX and CorrelationRadiusY are the lags in px at which
	// the normalised autocorrelation along x and along y falls to 1/2;
	// CorrelationRadius is their mean and SpeckleSize twice that. All are
	// 0 when undefined (no texture, or correlated beyond a quarter of the
	// image).
	CorrelationRadiusX float64 `json:"correlation_radius_x_px"`
	CorrelationRadiusY float64 `json:"correlation_radius_y_px"`
	CorrelationRadius  float64 `json:"correlation_radius_px"`
	SpeckleSize        float64 `json:"speckle_size_px"`

	// Noise is the image noise σ in gray levels, NoiseSource how it was
	// obtained (Noise is 0 for NoiseNone).
	Noise       float64     `json:"noise_gray"`
	NoiseSource NoiseSource `json:"noise_source"`
	// NoisePixels is the number of pixels the static-pair estimate used
	// (both images unclipped).
	NoisePixels int `json:"noise_pixels,omitempty"`

	// Interpolation is the B-spline of the SSSIG gradients.
	Interpolation string `json:"interpolation"`
	// Target is the displacement noise, px, that SmallestSubset reaches.
	Target float64 `json:"target_px"`
	// Subsets lists the predicted noise for each subset size, smallest
	// first.
	Subsets []SubsetNoise `json:"subsets"`
	// SmallestSubset is the smallest listed size whose median predicted
	// σ_u is at most Target, 0 when none is. SmallestSubsetText says the
	// same for people: the size, "none" (no listed size reaches the
	// target, or there is no texture) or "unknown" (noise not known).
	SmallestSubset     int    `json:"smallest_subset_px"`
	SmallestSubsetText string `json:"smallest_subset"`

	// Map is the SSSIG of subsets of size Options.Subset on a grid.
	Map Map `json:"map"`

	// Notes are findings a person should read: clipping, small speckles,
	// missing texture, unknown noise.
	Notes []string `json:"notes"`
}

// SubsetNoise is the texture and predicted displacement noise of one
// subset size, over a grid of subsets that is the same for every size.
type SubsetNoise struct {
	// Size is the subset side in px.
	Size int `json:"subset_px"`
	// Samples is the number of subsets sampled.
	Samples int `json:"samples"`
	// SSSIG is the median SSSIG of the subsets (gray levels² summed over
	// the subset).
	SSSIG float64 `json:"sssig_median"`
	// PerGray is √2/√SSSIG: the predicted σ_u in px per gray level of
	// image noise (0 when SSSIG is 0).
	PerGray float64 `json:"noise_per_gray_px,omitempty"`
	// Predicted is √2·σ/√SSSIG in px, the median predicted σ_u (0 when
	// the noise is unknown or SSSIG is 0).
	Predicted float64 `json:"predicted_noise_px,omitempty"`
	// MeetsTarget reports Predicted ≤ Target (false when unknown).
	MeetsTarget bool `json:"meets_target"`
}

// Map is the SSSIG of subsets of one size centred on a grid: subset (i, j)
// is centred on pixel (X0 + i·Step, Y0 + j·Step), wholly inside the image.
type Map struct {
	Subset  int `json:"subset_px"`
	Step    int `json:"step_px"`
	X0      int `json:"x0_px"`
	Y0      int `json:"y0_px"`
	Columns int `json:"columns"`
	Rows    int `json:"rows"`
	// SSSIG holds Columns×Rows values, row-major. It is drawn by WriteMap
	// and left out of the JSON (which summarises it below).
	SSSIG []float64 `json:"-"`
	// Min, Median and Max summarise SSSIG.
	Min    float64 `json:"sssig_min"`
	Median float64 `json:"sssig_median"`
	Max    float64 `json:"sssig_max"`
	// MeetsTarget is the fraction of the map's subsets whose predicted σ_u
	// is at most the target; absent when the noise is unknown.
	MeetsTarget *float64 `json:"meets_target_fraction,omitempty"`
}
