package synth

import (
	"math"
	"math/cmplx"

	"gonum.org/v1/gonum/dsp/fourier"

	"spallscope/subset"
)

// FourierShift returns img translated by (dx, dy) px, so that the result at
// (x, y) is img at (x−dx, y−dy), using the Fourier shift theorem: the 2-D
// spectrum is multiplied by exp(−2πi(kx·dx/W + ky·dy/H)). It is exact for a
// periodic, band-limited image and treats the image as one period. The
// result is not quantised.
func FourierShift(img *subset.Image, dx, dy float64) *subset.Image {
	w, h := img.Width, img.Height
	data := make([]complex128, w*h)
	for i, v := range img.Pix {
		data[i] = complex(float64(v), 0)
	}
	rows, cols := fourier.NewCmplxFFT(w), fourier.NewCmplxFFT(h)
	row := make([]complex128, w)
	col := make([]complex128, h)
	// Forward transform: rows, then columns.
	for y := 0; y < h; y++ {
		rows.Coefficients(data[y*w:(y+1)*w], data[y*w:(y+1)*w])
	}
	for x := 0; x < w; x++ {
		for y := 0; y < h; y++ {
			col[y] = data[y*w+x]
		}
		cols.Coefficients(col, col)
		for y := 0; y < h; y++ {
			data[y*w+x] = col[y]
		}
	}
	// Phase ramp; frequencies above Nyquist are the negative ones.
	for y := 0; y < h; y++ {
		fy := float64(signedFreq(y, h)) / float64(h)
		for x := 0; x < w; x++ {
			fx := float64(signedFreq(x, w)) / float64(w)
			data[y*w+x] *= cmplx.Exp(complex(0, -2*math.Pi*(fx*dx+fy*dy)))
		}
	}
	// Inverse transform (gonum's Sequence is unnormalised).
	for x := 0; x < w; x++ {
		for y := 0; y < h; y++ {
			col[y] = data[y*w+x]
		}
		cols.Sequence(col, col)
		for y := 0; y < h; y++ {
			data[y*w+x] = col[y]
		}
	}
	out := subset.NewImage(w, h, img.Depth)
	norm := 1 / float64(w*h)
	for y := 0; y < h; y++ {
		copy(row, data[y*w:(y+1)*w])
		rows.Sequence(row, row)
		for x := 0; x < w; x++ {
			out.Pix[y*w+x] = float32(real(row[x]) * norm)
		}
	}
	return out
}

// signedFreq maps FFT bin k of n to its signed frequency index.
func signedFreq(k, n int) int {
	if k > n/2 {
		return k - n
	}
	return k
}
