package subset

import "math"

// choleskyFactor overwrites the leading n×n block of the row-major 12×12
// symmetric matrix a with its lower Cholesky factor L (a = L·Lᵀ).
//
// The Gauss–Newton Hessian mixes parameters of different units (pixels for
// u, pixels per pixel for ux, …), so rank deficiency is judged on the
// matrix scaled by scale (scale[i] converts parameter i to pixels of motion
// at the subset edge): the factorisation fails when a pivot of the scaled
// matrix falls below 1e-10 of its largest diagonal entry. It reports
// whether a is positive definite by that test.
func choleskyFactor(a *[144]float64, n int, scale *[12]float64) bool {
	const ld = 12
	var maxDiag float64
	for i := 0; i < n; i++ {
		maxDiag = math.Max(maxDiag, a[ld*i+i]*scale[i]*scale[i])
	}
	if !(maxDiag > 0) || math.IsInf(maxDiag, 0) {
		return false
	}
	for j := 0; j < n; j++ {
		d := a[ld*j+j]
		for k := 0; k < j; k++ {
			d -= a[ld*j+k] * a[ld*j+k]
		}
		if !(d*scale[j]*scale[j] > 1e-10*maxDiag) {
			return false
		}
		d = math.Sqrt(d)
		a[ld*j+j] = d
		for i := j + 1; i < n; i++ {
			v := a[ld*i+j]
			for k := 0; k < j; k++ {
				v -= a[ld*i+k] * a[ld*j+k]
			}
			a[ld*i+j] = v / d
		}
	}
	return true
}

// choleskySolve solves L·Lᵀ·x = b in place in b for the factor computed by
// choleskyFactor.
func choleskySolve(l *[144]float64, n int, b *[12]float64) {
	const ld = 12
	for i := 0; i < n; i++ {
		v := b[i]
		for k := 0; k < i; k++ {
			v -= l[ld*i+k] * b[k]
		}
		b[i] = v / l[ld*i+i]
	}
	for i := n - 1; i >= 0; i-- {
		v := b[i]
		for k := i + 1; k < n; k++ {
			v -= l[ld*k+i] * b[k]
		}
		b[i] = v / l[ld*i+i]
	}
}
