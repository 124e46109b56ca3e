package main

import (
	"math"

	. "github.com/mmcloughlin/avo/build"
	. "github.com/mmcloughlin/avo/operand"
	. "github.com/mmcloughlin/avo/reg"
)

// The cubic interpolant and its gradient at pixel centres
// (subset/bspline_bulk.go: cubicCentres), four pixels of a row to a
// vector. At a pixel centre the kernel is the stencil (1, 4, 1)/6 and its
// derivative (−1, 0, 1)/2: a column's sums along y are
// cv = (a + c)/6 + 4b/6 and cd = (c − a)/2 from the coefficients a, b, c
// of the rows above, at and below, and the pixel's value and gradient are
// v = (cv₋ + cv₊)/6 + 4cv/6, gx = (cv₊ − cv₋)/2, gy = (cd₋ + cd₊)/6 + 4cd/6
// over the columns left, at and right. The operations are cubicCentres'
// own, in its order and without FMA, so the results equal it bit for bit;
// where cubicCentres carries a column's sums over to the next pixel the
// kernel forms them again for each of the three pixels that use them. The
// last side mod 4 pixels of a row are taken one at a time.

// centresConsts are the stencil's constants, each in all four lanes.
type centresConsts struct{ sixth, twoThirds, half Mem }

func centresData() centresConsts {
	put := func(name string, x float64) Mem {
		m := GLOBL(name, RODATA|NOPTR)
		for k := 0; k < 4; k++ {
			DATA(8*k, U64(math.Float64bits(x)))
		}
		return m
	}
	return centresConsts{
		sixth:     put("centresSixth", 1.0/6),
		twoThirds: put("centresTwoThirds", 4.0/6),
		half:      put("centresHalf", 0.5),
	}
}

// widen loads float32 coefficients at m as float64: four (vector) or one
// (scalar).
func widen(l lanes, m Mem, r VecVirtual) {
	if l.width == 4 {
		VCVTPS2PD(m, r)
		return
	}
	VXORPD(r, r, r)
	VCVTSS2SD(m, r, r)
}

// centresBody computes, for the pixels at column i of one row (rows a, b,
// c of coefficients, one to the left of the pixel's), the value and the
// gradient, and stores them at v, gx and gy.
func centresBody(l lanes, k centresConsts, a, b, c Mem, i Register, v, gx, gy Mem) {
	var cv, cd [3]VecVirtual
	for sh := 0; sh < 3; sh++ {
		ra, rb, rc := l.reg(), l.reg(), l.reg()
		widen(l, a.Idx(i, 4).Offset(4*sh), ra)
		widen(l, b.Idx(i, 4).Offset(4*sh), rb)
		widen(l, c.Idx(i, 4).Offset(4*sh), rc)
		cv[sh], cd[sh] = l.reg(), l.reg()
		// cv = sixth·(a + c) + twoThirds·b
		l.add(ra, rc, cv[sh])
		l.mul(cv[sh], k.sixth, cv[sh])
		l.mul(rb, k.twoThirds, rb)
		l.add(cv[sh], rb, cv[sh])
		// cd = 0.5·(c − a)
		l.sub(rc, ra, cd[sh])
		l.mul(cd[sh], k.half, cd[sh])
	}
	out := func(x [3]VecVirtual, m Mem) { // sixth·(x₀ + x₂) + twoThirds·x₁
		s, t := l.reg(), l.reg()
		l.add(x[0], x[2], s)
		l.mul(s, k.sixth, s)
		l.mul(x[1], k.twoThirds, t)
		l.add(s, t, s)
		l.store(s, m.Idx(i, 8))
	}
	out(cv, v)
	d := l.reg()
	l.sub(cv[2], cv[0], d)
	l.mul(d, k.half, d)
	l.store(d, gx.Idx(i, 8))
	out(cd, gy)
}

// cubicCentresKernel generates cubicCentresAVX2.
func cubicCentresKernel() {
	k := centresData()
	TEXT("cubicCentresAVX2", NOSPLIT, "func(coef []float32, stride, top, side int, v, gx, gy []float64)")
	Pragma("noescape")
	Doc("cubicCentresAVX2 sets v, gx and gy (row-major, side×side) to the cubic",
		"interpolant and its gradient at the pixel centres of a window, top",
		"being the offset in coef (rows stride apart) of the coefficient up",
		"and left of its first pixel, as cubicCentres does, bit for bit. The",
		"window must lie inside the image and v, gx, gy hold side² values.")
	coef := Load(Param("coef").Base(), GP64())
	stride := Load(Param("stride"), GP64())
	top := Load(Param("top"), GP64())
	side := Load(Param("side"), GP64())
	vp := Load(Param("v").Base(), GP64())
	xp := Load(Param("gx").Base(), GP64())
	yp := Load(Param("gy").Base(), GP64())
	a := GP64()
	LEAQ(Mem{Base: coef, Index: top, Scale: 4}, a)
	SHLQ(U8(2), stride) // in bytes
	full := GP64()
	MOVQ(side, full)
	ANDQ(I32(-4), full)
	j := GP64()
	MOVQ(side, j)
	CMPQ(j, I32(0))
	JE(LabelRef("centres_done"))
	Label("centres_row")
	b, c := GP64(), GP64()
	LEAQ(Mem{Base: a, Index: stride, Scale: 1}, b)
	LEAQ(Mem{Base: a, Index: stride, Scale: 2}, c)
	rowA, rowB, rowC := Mem{Base: a}, Mem{Base: b}, Mem{Base: c}
	v, gx, gy := Mem{Base: vp}, Mem{Base: xp}, Mem{Base: yp}
	i := GP64()
	XORQ(i, i)
	CMPQ(full, I32(0))
	JE(LabelRef("centres_rest"))
	Label("centres_block")
	centresBody(vector, k, rowA, rowB, rowC, i, v, gx, gy)
	ADDQ(I32(4), i)
	CMPQ(i, full)
	JB(LabelRef("centres_block"))
	Label("centres_rest")
	CMPQ(i, side)
	JAE(LabelRef("centres_next"))
	Label("centres_pixel")
	centresBody(scalar, k, rowA, rowB, rowC, i, v, gx, gy)
	INCQ(i)
	CMPQ(i, side)
	JB(LabelRef("centres_pixel"))
	Label("centres_next")
	ADDQ(stride, a)
	for _, p := range []Register{vp, xp, yp} {
		LEAQ(Mem{Base: p, Index: side, Scale: 8}, p)
	}
	DECQ(j)
	JNZ(LabelRef("centres_row"))
	Label("centres_done")
	VZEROUPPER()
	RET()
}
