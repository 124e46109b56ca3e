package baseline

import (
	"fmt"
	"math"

	"gocv.io/x/gocv"

	"spallscope/dic/synth"
	"spallscope/subset"
)

// Case kinds.
const (
	// KindTranslation: a rigid subpixel translation, no sensor noise (only
	// 8-bit quantisation).
	KindTranslation = "translation"
	// KindStrain: a homogeneous strain about the image centre plus a
	// subpixel translation, with Gaussian sensor noise on both frames.
	KindStrain = "strain"
)

// Grid layout of the measurement points.
const (
	// Margin is the smallest distance in px between a point and the image
	// edge: it keeps every window (subset plus search range) inside the
	// image for subsets up to 2·(Margin − search) + 1 px.
	Margin = 40
	// GridStep is the spacing of the points in px.
	GridStep = 8
)

// Case is one reference/deformed frame pair with measurement points and the
// exact displacement at each.
type Case struct {
	Name string
	Kind string
	// Ref and Def are the reference and deformed frames (8-bit levels).
	Ref, Def *subset.Image
	// Points are the reference pixel positions (x, y) to measure.
	Points [][2]int
	// Truth is the exact motion of the material point at each of Points.
	Truth []synth.Motion
	// Search is the integer search radius in px for methods that search: the
	// largest true displacement component rounded up, plus one. It is the
	// bound a user would set from the expected motion, not the answer.
	Search int
	// mats are Ref and Def as OpenCV images while holdMats holds them.
	mats *[2]gocv.Mat
}

// Pattern is the speckle pattern of every case: spots of 2 px radius
// (speckles about 4–5 px across) covering half the face.
var Pattern = synth.Pattern{Radius: 2, Coverage: 0.5, Seed: 1}

// translationShifts are the rigid shifts (u, v) in px of the translation
// cases, spread over the subpixel cycle so that no method's interpolation
// bias is sampled only where it vanishes (at 0 and ½ px).
var translationShifts = [][2]float64{{0.1, 0.5}, {0.4, 0.8}, {0.7, 0.2}}

// Strain case motion: strain about the centre plus a subpixel translation,
// recorded with noise of StrainNoise gray levels (8-bit).
const (
	StrainExx   = 0.005
	StrainEyy   = -0.003
	StrainExy   = 0.002
	StrainU     = 0.3
	StrainV     = -0.6
	StrainNoise = 1.0
)

// Cases returns the translation cases followed by the strain case, on
// size×size frames.
func Cases(size int) ([]*Case, error) {
	cs, err := TranslationCases(size)
	if err != nil {
		return nil, err
	}
	sc, err := StrainCase(size)
	if err != nil {
		return nil, err
	}
	return append(cs, sc), nil
}

// TranslationCases renders one noise-free case per shift of
// translationShifts, all against the same reference frame.
func TranslationCases(size int) ([]*Case, error) {
	sp, err := speckles(size)
	if err != nil {
		return nil, err
	}
	cam := synth.Camera{Depth: 8, Oversample: 2}
	ref, err := synth.Render(synth.Scene{Speckles: sp}, cam, size, size, 0)
	if err != nil {
		return nil, fmt.Errorf("translation cases: reference: %w", err)
	}
	var cs []*Case
	for i, s := range translationShifts {
		f := synth.Translation{U: s[0], V: s[1]}
		def, err := synth.Render(synth.Scene{Speckles: sp, Field: f}, cam, size, size, i+1)
		if err != nil {
			return nil, fmt.Errorf("translation case u=%g v=%g: %w", s[0], s[1], err)
		}
		cs = append(cs, newCase(fmt.Sprintf("shift %.1f,%.1f", s[0], s[1]), KindTranslation, ref, def, f))
	}
	return cs, nil
}

// StrainCase renders the strain case: StrainExx, StrainEyy, StrainExy about
// the image centre plus the translation (StrainU, StrainV), both frames with
// sensor noise StrainNoise.
func StrainCase(size int) (*Case, error) {
	sp, err := speckles(size)
	if err != nil {
		return nil, err
	}
	c := float64(size-1) / 2
	f := synth.Sum{
		synth.UniformStrain{Cx: c, Cy: c, Exx: StrainExx, Eyy: StrainEyy, Exy: StrainExy},
		synth.Translation{U: StrainU, V: StrainV},
	}
	cam := synth.Camera{Depth: 8, Noise: StrainNoise, Oversample: 2, Seed: 7}
	ref, err := synth.Render(synth.Scene{Speckles: sp}, cam, size, size, 0)
	if err != nil {
		return nil, fmt.Errorf("strain case: reference: %w", err)
	}
	def, err := synth.Render(synth.Scene{Speckles: sp, Field: f}, cam, size, size, 1)
	if err != nil {
		return nil, fmt.Errorf("strain case: deformed: %w", err)
	}
	name := fmt.Sprintf("strain %.3f,%.3f,%.3f", StrainExx, StrainEyy, StrainExy)
	return newCase(name, KindStrain, ref, def, f), nil
}

// speckles draws Pattern over a size×size face.
func speckles(size int) (*synth.Speckles, error) {
	if size < 2*Margin+1 {
		return nil, fmt.Errorf("image size %d px, want at least %d for a %d px margin", size, 2*Margin+1, Margin)
	}
	sp, err := synth.NewSpeckles(Pattern, size, size)
	if err != nil {
		return nil, fmt.Errorf("speckle pattern: %w", err)
	}
	return sp, nil
}

// newCase lays the point grid over ref and takes the truth from f.
func newCase(name, kind string, ref, def *subset.Image, f synth.Field) *Case {
	c := &Case{Name: name, Kind: kind, Ref: ref, Def: def, Points: Grid(ref.Width, ref.Height)}
	largest := 0.0
	for _, p := range c.Points {
		m := f.At(float64(p[0]), float64(p[1]))
		c.Truth = append(c.Truth, m)
		largest = math.Max(largest, math.Max(math.Abs(m.U), math.Abs(m.V)))
	}
	c.Search = int(math.Ceil(largest)) + 1
	return c
}

// Grid returns the points every GridStep px at least Margin px from the
// edges of a width×height image, row by row.
func Grid(width, height int) [][2]int {
	var pts [][2]int
	for y := Margin; y <= height-1-Margin; y += GridStep {
		for x := Margin; x <= width-1-Margin; x += GridStep {
			pts = append(pts, [2]int{x, y})
		}
	}
	return pts
}
