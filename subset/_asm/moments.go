package main

import (
	"fmt"

	. "github.com/mmcloughlin/avo/build"
	. "github.com/mmcloughlin/avo/operand"
	. "github.com/mmcloughlin/avo/reg"
)

// The reference-side moments of the Affine order (subset/icgn_normal.go:
// affineMoments), four pixels to a vector, over all valid pixels at once
// with each pixel's own offsets dx, dy: for the gradient products
// q ∈ {gx², gx·gy, gy²} the sums Σq·m over the monomials
// m ∈ {1, dx, dx², dy, dx·dy, dy²}, and for h ∈ {gx, gy, gx·fc, gy·fc}
// over m ∈ {1, dx, dy}. Four sweeps of at most nine sums each keep the
// sums in registers (sumLoop, as for the deformed-side sums).

// momentsArgs are the loaded arguments of affineMomentsAVX2.
type momentsArgs struct {
	gx, gy, fc, dx, dy Mem
	n                  Register
	out                Mem
}

// quantity forms one summand per pixel from the loaded gx, gy and fc, and
// says how many of its moments are wanted: 6 (degree 2) or 3 (degree 1),
// and where in out they go.
type quantity struct {
	form    func(l lanes, x, y, f VecVirtual) VecVirtual
	moments int
	at      int
}

func product(a, b func(x, y, f VecVirtual) VecVirtual) func(l lanes, x, y, f VecVirtual) VecVirtual {
	return func(l lanes, x, y, f VecVirtual) VecVirtual {
		d := l.reg()
		l.mul(a(x, y, f), b(x, y, f), d)
		return d
	}
}

func gxOf(x, y, f VecVirtual) VecVirtual { return x }
func gyOf(x, y, f VecVirtual) VecVirtual { return y }
func fcOf(x, y, f VecVirtual) VecVirtual { return f }

func plain(get func(x, y, f VecVirtual) VecVirtual) func(l lanes, x, y, f VecVirtual) VecVirtual {
	return func(l lanes, x, y, f VecVirtual) VecVirtual { return get(x, y, f) }
}

// momentSweeps are the four sweeps and what each sums.
var momentSweeps = [][]quantity{
	{{product(gxOf, gxOf), 6, 0}, {plain(gxOf), 3, 18}},
	{{product(gxOf, gyOf), 6, 6}, {plain(gyOf), 3, 21}},
	{{product(gyOf, gyOf), 6, 12}},
	{{product(gxOf, fcOf), 3, 24}, {product(gyOf, fcOf), 3, 27}},
}

// momentsBody accumulates the moments of qs, in order, into acc.
func momentsBody(a momentsArgs, qs []quantity) func(l lanes, i Register, acc []VecVirtual) {
	return func(l lanes, i Register, acc []VecVirtual) {
		x, y, f, dx, dy := l.reg(), l.reg(), l.reg(), l.reg(), l.reg()
		l.load(a.gx.Idx(i, 8), x)
		l.load(a.gy.Idx(i, 8), y)
		l.load(a.fc.Idx(i, 8), f)
		l.load(a.dx.Idx(i, 8), dx)
		l.load(a.dy.Idx(i, 8), dy)
		k := 0
		for _, q := range qs {
			v := q.form(l, x, y, f)
			l.add(acc[k], v, acc[k])
			if q.moments == 3 {
				l.fma(v, dx, acc[k+1])
				l.fma(v, dy, acc[k+2])
				k += 3
				continue
			}
			vx, vy := l.reg(), l.reg()
			l.mul(v, dx, vx)
			l.mul(v, dy, vy)
			l.add(acc[k+1], vx, acc[k+1])
			l.fma(vx, dx, acc[k+2])
			l.add(acc[k+3], vy, acc[k+3])
			l.fma(vx, dy, acc[k+4])
			l.fma(vy, dy, acc[k+5])
			k += 6
		}
	}
}

// affineMoments generates affineMomentsAVX2.
func affineMoments() {
	TEXT("affineMomentsAVX2", NOSPLIT, "func(gx, gy, fc, dx, dy []float64, out *[30]float64)")
	Pragma("noescape")
	Doc("affineMomentsAVX2 sets out to the moments over the len(gx) pixels:",
		"for q = gx², gx·gy, gy² in turn Σq, Σq·dx, Σq·dx², Σq·dy, Σq·dx·dy,",
		"Σq·dy² (out[0 … 17]), then for h = gx, gy, gx·fc, gy·fc in turn Σh,",
		"Σh·dx, Σh·dy (out[18 … 29]). All slices hold at least len(gx) values.")
	var a momentsArgs
	a.gx = Mem{Base: Load(Param("gx").Base(), GP64())}
	a.gy = Mem{Base: Load(Param("gy").Base(), GP64())}
	a.fc = Mem{Base: Load(Param("fc").Base(), GP64())}
	a.dx = Mem{Base: Load(Param("dx").Base(), GP64())}
	a.dy = Mem{Base: Load(Param("dy").Base(), GP64())}
	a.n = Load(Param("gx").Len(), GP64())
	a.out = Mem{Base: Load(Param("out"), GP64())}
	s := sumsArgs{n: a.n}
	for k, sweep := range momentSweeps {
		n := 0
		for _, q := range sweep {
			n += q.moments
		}
		xs := sumLoop(fmt.Sprintf("sweep%d", k), s, yRegs(n), momentsBody(a, sweep))
		for _, q := range sweep {
			storeSums(a.out, q.at, xs[:q.moments])
			xs = xs[q.moments:]
		}
	}
	VZEROUPPER()
	RET()
}
