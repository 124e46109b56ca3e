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
// over the columns left, at and right, the value then less a level (the
// subset's mean, when known). The operations are cubicCentres'
// own, in its order and without FMA, so the results equal it bit for bit.
// As cubicCentres carries a column's sums over to the next pixel, the
// kernel forms the sums of four columns once and carries them to the next
// block: a block of pixels takes its columns' sums and those of the four
// columns after, the latter shifted into place by one and two lanes
// (VEXTRACTF128, VINSERTF128, VSHUFPD), so that each coefficient of a row is widened and
// summed once rather than three times. The last side mod 4 pixels of a
// row take a block of their own, stored through the stack.

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

// centresColumns returns the column sums cv and cd (see above) of the four
// columns from float i of the coefficient rows a, b and c.
func centresColumns(k centresConsts, a, b, c Mem, i Register) (cv, cd VecVirtual) {
	ra, rb, rc := YMM(), YMM(), YMM()
	VCVTPS2PD(a.Idx(i, 4), ra)
	VCVTPS2PD(b.Idx(i, 4), rb)
	VCVTPS2PD(c.Idx(i, 4), rc)
	cv, cd = YMM(), YMM()
	// cv = sixth·(a + c) + twoThirds·b
	VADDPD(rc, ra, cv)
	VMULPD(k.sixth, cv, cv)
	VMULPD(k.twoThirds, rb, rb)
	VADDPD(rb, cv, cv)
	// cd = 0.5·(c − a)
	VSUBPD(ra, rc, cd)
	VMULPD(k.half, cd, cd)
	return cv, cd
}

// centresPixels returns the values (less level) and the gradients of four
// pixels from
// the column sums of their columns (p, lanes 0 … 3) and of the four
// columns after (n): the stencils over the columns left, at and right,
// that is p and p shifted by one and two lanes.
func centresPixels(k centresConsts, level, pv, pd, nv, nd VecVirtual) (v, gx, gy VecVirtual) {
	// x2 = [p2 p3 n0 n1], x1 = [p1 p2 p3 n0].
	shift := func(p, n VecVirtual) (x1, x2 VecVirtual) {
		// p's upper half under n's lower (VPERM2F128 takes 8 µops on
		// some processors, extract and insert 3).
		hi := XMM()
		x1, x2 = YMM(), YMM()
		VEXTRACTF128(U8(1), p, hi)
		VINSERTF128(U8(1), n.AsX(), hi.AsY(), x2)
		VSHUFPD(U8(5), x2, p, x1)
		return x1, x2
	}
	stencil := func(x0, x1, x2 VecVirtual) VecVirtual { // sixth·(x₀ + x₂) + twoThirds·x₁
		s, t := YMM(), YMM()
		VADDPD(x2, x0, s)
		VMULPD(k.sixth, s, s)
		VMULPD(k.twoThirds, x1, t)
		VADDPD(t, s, s)
		return s
	}
	v1, v2 := shift(pv, nv)
	d1, d2 := shift(pd, nd)
	v = stencil(pv, v1, v2)
	VSUBPD(level, v, v)
	gx = YMM()
	VSUBPD(pv, v2, gx)
	VMULPD(k.half, gx, gx)
	gy = stencil(pd, d1, d2)
	return v, gx, gy
}

// cubicCentresKernel generates cubicCentresAVX2.
func cubicCentresKernel() {
	k := centresData()
	TEXT("cubicCentresAVX2", NOSPLIT, "func(coef []float32, stride, top, side int, level float64, v, gx, gy []float64)")
	Pragma("noescape")
	Doc("cubicCentresAVX2 sets v, gx and gy (row-major, side×side) to the cubic",
		"interpolant less level and its gradient at the pixel centres of a",
		"window (the value rounded, then level taken off), top",
		"being the offset in coef (rows stride apart) of the coefficient up",
		"and left of its first pixel, as cubicCentres does, bit for bit. The",
		"window must lie inside the image, and coef hold centresReach(side)",
		"coefficients of each of its side + 2 rows from top (up to three",
		"past the window's right end are read, not used); v, gx, gy hold",
		"side² values, side ≥ 1.")
	coef := Load(Param("coef").Base(), GP64())
	stride := Load(Param("stride"), GP64())
	top := Load(Param("top"), GP64())
	side := Load(Param("side"), GP64())
	vp := Load(Param("v").Base(), GP64())
	xp := Load(Param("gx").Base(), GP64())
	yp := Load(Param("gy").Base(), GP64())
	lv := Load(Param("level"), XMM())
	level := YMM()
	VBROADCASTSD(lv, level)
	a := GP64()
	LEAQ(Mem{Base: coef, Index: top, Scale: 4}, a)
	SHLQ(U8(2), stride) // in bytes
	full, rem := GP64(), GP64()
	MOVQ(side, full)
	ANDQ(I32(-4), full) // pixels in full blocks of a row
	MOVQ(side, rem)
	SUBQ(full, rem)
	last := AllocLocal(3 * 32) // the tail block's v, gx, gy
	pv, pd := YMM(), YMM()     // the column sums carried to the next block
	j := GP64()
	MOVQ(side, j)
	Label("centres_row")
	b, c := GP64(), GP64()
	LEAQ(Mem{Base: a, Index: stride, Scale: 1}, b)
	LEAQ(Mem{Base: a, Index: stride, Scale: 2}, c)
	rowA, rowB, rowC := Mem{Base: a}, Mem{Base: b}, Mem{Base: c}
	i, n := GP64(), GP64()
	XORQ(i, i)
	cv, cd := centresColumns(k, rowA, rowB, rowC, i)
	VMOVAPD(cv, pv)
	VMOVAPD(cd, pd)
	CMPQ(full, I32(0))
	JE(LabelRef("centres_tail"))
	Label("centres_block")
	LEAQ(Mem{Base: i, Disp: 4}, n)
	nv, nd := centresColumns(k, rowA, rowB, rowC, n)
	v, gx, gy := centresPixels(k, level, pv, pd, nv, nd)
	VMOVUPD(v, Mem{Base: vp, Index: i, Scale: 8})
	VMOVUPD(gx, Mem{Base: xp, Index: i, Scale: 8})
	VMOVUPD(gy, Mem{Base: yp, Index: i, Scale: 8})
	VMOVAPD(nv, pv)
	VMOVAPD(nd, pd)
	MOVQ(n, i)
	CMPQ(i, full)
	JB(LabelRef("centres_block"))
	Label("centres_tail")
	CMPQ(rem, I32(0))
	JE(LabelRef("centres_next"))
	// The last side mod 4 pixels: a block to the stack, then its used
	// lanes one by one to the outputs (a masked store is slow on some
	// processors).
	// Their columns end in the block's (in lane 3 of p) unless three
	// remain, whose last reads lane 0 of the block after; otherwise that
	// block is not read and p stands in for it (its lanes unused).
	tv, td := YMM(), YMM()
	VMOVAPD(pv, tv)
	VMOVAPD(pd, td)
	CMPQ(rem, I32(3))
	JNE(LabelRef("centres_tail_pixels"))
	LEAQ(Mem{Base: i, Disp: 4}, n)
	nv, nd = centresColumns(k, rowA, rowB, rowC, n)
	VMOVAPD(nv, tv)
	VMOVAPD(nd, td)
	Label("centres_tail_pixels")
	v, gx, gy = centresPixels(k, level, pv, pd, tv, td)
	VMOVUPD(v, last)
	VMOVUPD(gx, last.Offset(32))
	VMOVUPD(gy, last.Offset(64))
	t, x := GP64(), GP64()
	XORQ(t, t)
	Label("centres_copy")
	for o, p := range []Register{vp, xp, yp} {
		MOVQ(last.Offset(32*o).Idx(t, 8), x)
		MOVQ(x, Mem{Base: p, Index: i, Scale: 8})
	}
	INCQ(i)
	INCQ(t)
	CMPQ(t, rem)
	JB(LabelRef("centres_copy"))
	Label("centres_next")
	ADDQ(stride, a)
	for _, p := range []Register{vp, xp, yp} {
		LEAQ(Mem{Base: p, Index: side, Scale: 8}, p)
	}
	DECQ(j)
	JNZ(LabelRef("centres_row"))
	VZEROUPPER()
	RET()
}
