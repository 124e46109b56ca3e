package main

import (
	"fmt"
	"math"

	. "github.com/mmcloughlin/avo/build"
	"github.com/mmcloughlin/avo/gotypes"
	. "github.com/mmcloughlin/avo/operand"
	. "github.com/mmcloughlin/avo/reg"
)

// The cubic B-spline interpolant at many positions (subset/bspline_bulk.go:
// cubicValues, lineValues and their kernel cubicAt), four positions to a
// block, one position to a lane:
//
//   - the integer parts, fractions and window offsets of four positions
//     at once, and their weights by cubicAt's own formulas in the same
//     order (no FMA), so the weights equal cubicAt's bit for bit (as the
//     Go compiler forms them below GOAMD64=v3, where it does not fuse);
//   - for each position, the sum over the window's four rows of its
//     y-weight times the row (a vector over the four taps along x), with
//     the y-weight broadcast from the stack and FMA;
//   - the four sums transposed so that a lane is a position again, and
//     summed over the taps with their x-weights, with FMA.
//
// The sums thus run in another order than cubicAt's (rows weighted along
// y first) and round once per multiply-add: the values agree with
// cubicAt's to rounding. Every lane's arithmetic is its own, so a
// position's value does not depend on the block or lane it falls in: the
// kernels agree with each other bit for bit, as the Go ones do. The last
// n mod 4 positions take a block of their own, the unused lanes at
// position (0, 0) and their values not stored.

// coefType is a storage of the spline coefficients.
type coefType struct {
	goType string
	size   int
	// row loads the four coefficients at m as float64 into r.
	row func(m Mem, r VecVirtual)
}

// float32Coef is the storage of Spline.coef: the four coefficients widen
// to float64 exactly as they load.
var float32Coef = coefType{goType: "float32", size: 4, row: func(m Mem, r VecVirtual) { VCVTPS2PD(m, r) }}

// cubicConsts are the constants of the kernels: each 32 bytes, the value
// in all four lanes.
type cubicConsts struct {
	one, sixth, twoThirds, three, lane, four Mem
	masks                                    Mem // lanes < r set, at 32·r, r = 1 … 3
}

func cubicData() cubicConsts {
	var c cubicConsts
	put := func(name string, v [4]float64) Mem {
		m := GLOBL(name, RODATA|NOPTR)
		for k, x := range v {
			// As bits: avo writes F64(1) as $(1), which the assembler
			// reads as the integer 1.
			DATA(8*k, U64(math.Float64bits(x)))
		}
		return m
	}
	c.one = put("cubicOne", [4]float64{1, 1, 1, 1})
	c.sixth = put("cubicSixth", [4]float64{1.0 / 6, 1.0 / 6, 1.0 / 6, 1.0 / 6})
	c.twoThirds = put("cubicTwoThirds", [4]float64{2.0 / 3, 2.0 / 3, 2.0 / 3, 2.0 / 3})
	c.three = put("cubicThree", [4]float64{3, 3, 3, 3})
	c.lane = put("cubicLane", [4]float64{0, 1, 2, 3})
	c.four = put("cubicFour", [4]float64{4, 4, 4, 4})
	c.masks = GLOBL("cubicTailMasks", RODATA|NOPTR)
	for r := 0; r < 4; r++ {
		for k := 0; k < 4; k++ {
			var v uint64
			if k < r {
				v = ^uint64(0)
			}
			DATA(32*r+8*k, U64(v))
		}
	}
	return c
}

// cubicArgs are what the block needs: the coefficients, the stride in
// bytes (and three times it), the stride and origin broadcast as int32,
// and stack space for the window offsets and the y-weights.
type cubicArgs struct {
	ct               coefType
	c                cubicConsts
	coef             Register
	rowBytes, rows3  Register
	stride, origin   Mem // 4 × int32
	offsets, weights Mem
}

func loadCubicArgs(ct coefType, c cubicConsts) cubicArgs {
	a := cubicArgs{ct: ct, c: c}
	a.coef = Load(Param("coef").Base(), GP64())
	s := Load(Param("stride"), GP64())
	o := Load(Param("origin"), GP64())
	a.stride, a.origin = AllocLocal(16), AllocLocal(16)
	a.offsets, a.weights = AllocLocal(16), AllocLocal(4*32)
	for _, v := range []struct {
		r Register
		m Mem
	}{{s, a.stride}, {o, a.origin}} {
		x := XMM()
		MOVQ(v.r, x)
		VPBROADCASTD(x, x)
		VMOVDQU(x, v.m)
	}
	a.rowBytes, a.rows3 = GP64(), GP64()
	MOVQ(s, a.rowBytes)
	SHLQ(U8(map[int]uint8{4: 2, 8: 3}[ct.size]), a.rowBytes)
	LEAQ(Mem{Base: a.rowBytes, Index: a.rowBytes, Scale: 2}, a.rows3)
	return a
}

// weights4 returns the cubic weights of taps 0 … 3 at the fractions t,
// formed as cubicAt forms them.
func (a cubicArgs) weights4(t VecVirtual) [4]VecVirtual {
	c := a.c
	u, t2, u2 := YMM(), YMM(), YMM()
	VMOVUPD(c.one, u)
	VSUBPD(t, u, u)
	VMULPD(t, t, t2)
	VMULPD(u, u, u2)
	var w [4]VecVirtual
	for k := range w {
		w[k] = YMM()
	}
	VMULPD(c.sixth, u2, w[0])
	VMULPD(u, w[0], w[0])
	VMULPD(c.sixth, t2, w[3])
	VMULPD(t, w[3], w[3])
	for _, v := range []struct {
		dst, sq, cube VecVirtual
	}{{w[1], t2, w[3]}, {w[2], u2, w[0]}} {
		p := YMM()
		VMOVUPD(c.twoThirds, v.dst)
		VSUBPD(v.sq, v.dst, v.dst)
		VMULPD(c.three, v.cube, p)
		VADDPD(p, v.dst, v.dst)
	}
	return w
}

// block returns the values at the positions (x, y) of four lanes.
func (a cubicArgs) block(x, y VecVirtual) VecVirtual {
	ix, iy := XMM(), XMM()
	VCVTTPD2DQY(x, ix)
	VCVTTPD2DQY(y, iy)
	tx, ty := YMM(), YMM()
	VCVTDQ2PD(ix, tx)
	VSUBPD(tx, x, tx)
	VCVTDQ2PD(iy, ty)
	VSUBPD(ty, y, ty)
	off := XMM()
	VPMULLD(a.stride, iy, off)
	VPADDD(ix, off, off)
	VPADDD(a.origin, off, off)
	VMOVDQU(off, a.offsets)
	wy := a.weights4(ty)
	for j, w := range wy {
		VMOVUPD(w, a.weights.Offset(32*j))
	}
	wx := a.weights4(tx)

	var acc [4]VecVirtual
	for p := range acc {
		k, base := GP64(), GP64()
		MOVLQSX(a.offsets.Offset(4*p), k)
		LEAQ(Mem{Base: a.coef, Index: k, Scale: uint8(a.ct.size)}, base)
		var rows, b [4]VecVirtual
		for j := 0; j < 4; j++ {
			m := Mem{Base: base}
			switch j {
			case 1:
				m = m.Idx(a.rowBytes, 1)
			case 2:
				m = m.Idx(a.rowBytes, 2)
			case 3:
				m = m.Idx(a.rows3, 1)
			}
			rows[j], b[j] = YMM(), YMM()
			a.ct.row(m, rows[j])
			VBROADCASTSD(a.weights.Offset(32*j+8*p), b[j])
		}
		acc[p] = pairSum(rows, b)
	}
	// Transpose: lane p of tap[i] is tap i of position p.
	t0, t1, t2, t3 := YMM(), YMM(), YMM(), YMM()
	VUNPCKLPD(acc[1], acc[0], t0)
	VUNPCKHPD(acc[1], acc[0], t1)
	VUNPCKLPD(acc[3], acc[2], t2)
	VUNPCKHPD(acc[3], acc[2], t3)
	var tap [4]VecVirtual
	for i := range tap {
		tap[i] = YMM()
	}
	VINSERTF128(U8(1), t2.AsX(), t0, tap[0])
	VINSERTF128(U8(1), t3.AsX(), t1, tap[1])
	VPERM2F128(U8(0x31), t2, t0, tap[2])
	VPERM2F128(U8(0x31), t3, t1, tap[3])
	return pairSum(tap, wx)
}

// pairSum returns (a0·b0 + a1·b1) + (a2·b2 + a3·b3), each pair by a
// multiply and an FMA: two short chains rather than one long one, so that
// more blocks overlap.
func pairSum(a, b [4]VecVirtual) VecVirtual {
	lo, hi := YMM(), YMM()
	VMULPD(a[0], b[0], lo)
	VFMADD231PD(a[1], b[1], lo)
	VMULPD(a[2], b[2], hi)
	VFMADD231PD(a[3], b[3], hi)
	VADDPD(hi, lo, lo)
	return lo
}

// blockLoop runs the blocks over len(out) positions: positions(k, mask)
// loads those of positions k … k+3 into (x, y), the lanes of a nil mask
// all used, else those set in mask (the others at (0, 0)).
func blockLoop(name string, a cubicArgs, positions func(k Register, mask Op) (x, y VecVirtual)) {
	out := Mem{Base: Load(Param("out").Base(), GP64())}
	n := Load(Param("out").Len(), GP64())
	k, end := GP64(), GP64()
	XORQ(k, k)
	MOVQ(n, end)
	ANDQ(I32(-4), end)
	CMPQ(end, I32(0))
	JE(LabelRef(name + "_tail"))
	Label(name + "_block")
	x, y := positions(k, nil)
	VMOVUPD(a.block(x, y), out.Idx(k, 8))
	ADDQ(I32(4), k)
	CMPQ(k, end)
	JB(LabelRef(name + "_block"))
	Label(name + "_tail")
	CMPQ(k, n)
	JAE(LabelRef(name + "_done"))
	// The last block's values go to the stack and from there one by one
	// to out: a masked store (VMASKMOVPD) is slow on some processors.
	rem, sel := GP64(), GP64()
	MOVQ(n, rem)
	SUBQ(k, rem)
	MOVQ(rem, sel)
	SHLQ(U8(5), sel)
	masks, mask := GP64(), YMM()
	LEAQ(a.c.masks, masks)
	VMOVDQU(Mem{Base: masks, Index: sel, Scale: 1}, mask)
	x, y = positions(k, mask)
	last := AllocLocal(32)
	VMOVUPD(a.block(x, y), last)
	LEAQ(out.Idx(k, 8), masks)
	j, v := GP64(), GP64()
	XORQ(j, j)
	Label(name + "_copy")
	MOVQ(last.Idx(j, 8), v)
	MOVQ(v, Mem{Base: masks, Index: j, Scale: 8})
	INCQ(j)
	CMPQ(j, rem)
	JB(LabelRef(name + "_copy"))
	Label(name + "_done")
	VZEROUPPER()
	RET()
}

// cubicKernels generates cubicValuesAVX2 and cubicLineAVX2 for
// coefficients of type ct.
func cubicKernels(ct coefType) {
	c := cubicData()

	TEXT("cubicValuesAVX2", NOSPLIT, fmt.Sprintf("func(coef []%s, stride, origin int, xs, ys, out []float64)", ct.goType))
	Pragma("noescape")
	Doc("cubicValuesAVX2 sets out[k] to the cubic interpolant of coef (rows",
		"stride apart, origin the offset of the coefficient up and left of",
		"pixel (0, 0)) at (xs[k], ys[k]) for every k < len(out). Every position",
		"must lie inside the image (see Spline.values): nothing is checked.")
	a := loadCubicArgs(ct, c)
	xs := Mem{Base: Load(Param("xs").Base(), GP64())}
	ys := Mem{Base: Load(Param("ys").Base(), GP64())}
	blockLoop("values", a, func(k Register, mask Op) (x, y VecVirtual) {
		x, y = YMM(), YMM()
		if mask == nil {
			VMOVUPD(xs.Idx(k, 8), x)
			VMOVUPD(ys.Idx(k, 8), y)
		} else {
			VMASKMOVPD(xs.Idx(k, 8), mask, x)
			VMASKMOVPD(ys.Idx(k, 8), mask, y)
		}
		return x, y
	})

	TEXT("cubicLineAVX2", NOSPLIT, fmt.Sprintf("func(coef []%s, stride, origin int, x0, y0, ax, ay float64, i0 int, out []float64)", ct.goType))
	Pragma("noescape")
	Doc("cubicLineAVX2 sets out[k] to the cubic interpolant of coef (see",
		"cubicValuesAVX2) at (x0 + t·ax, y0 + t·ay), t = i0 + k, for every",
		"k < len(out), the positions rounded as Spline.lineValues rounds them.")
	a = loadCubicArgs(ct, c)
	line := AllocLocal(5 * 32) // x0, y0, ax, ay, t of the block
	for i, name := range []string{"x0", "y0", "ax", "ay"} {
		v, b := Load(Param(name), XMM()), YMM()
		VBROADCASTSD(v, b)
		VMOVUPD(b, line.Offset(32*i))
	}
	storeFirstT(c, line.Offset(4*32))
	blockLoop("line", a, func(k Register, mask Op) (x, y VecVirtual) {
		return linePositions(line, c, mask)
	})

	cubicGrid(ct, c)
}

// storeFirstT stores t of a row's first block, i0 + lane (the parameter
// i0, the row's first pixel), at dst.
func storeFirstT(c cubicConsts, dst Mem) {
	i0 := Load(Param("i0"), GP64())
	ti, t := XMM(), YMM()
	VXORPD(ti, ti, ti)
	VCVTSI2SDQ(i0, ti, ti)
	VBROADCASTSD(ti, t)
	VADDPD(c.lane, t, t)
	VMOVUPD(t, dst)
}

// paramAddr returns the stack address of a basic argument, for use as a
// memory operand instead of a register.
func paramAddr(c gotypes.Component) Mem {
	b, err := c.Resolve()
	if err != nil {
		panic(err)
	}
	return b.Addr
}

// cubicGrid generates cubicGridAVX2: the values of the full square subset
// under an affine warp in one call, row after row, as cubicLineAVX2 would
// give them row by row. The positions past a row's last whole block wait
// on the stack, with where their values go, until four have gathered and
// take a block of their own: every block is full but the last.
func cubicGrid(ct coefType, c cubicConsts) {
	TEXT("cubicGridAVX2", NOSPLIT, fmt.Sprintf("func(coef []%s, stride, origin int, ox, oy []float64, ax, ay float64, i0, side int, out []float64)", ct.goType))
	Pragma("noescape")
	Doc("cubicGridAVX2 sets out[r·side + k] to the cubic interpolant of coef",
		"(see cubicValuesAVX2) at (ox[r] + t·ax, oy[r] + t·ay), t = i0 + k,",
		"for every row r < len(ox) and k < side: cubicLineAVX2 over each row",
		"from i0, bit for bit. out holds len(ox)·side values.")
	a := loadCubicArgs(ct, c)
	line := AllocLocal(5 * 32) // x0, y0, ax, ay of the row, t of the block
	for i, name := range []string{"ax", "ay"} {
		v, b := Load(Param(name), XMM()), YMM()
		VBROADCASTSD(v, b)
		VMOVUPD(b, line.Offset(32*(2+i)))
	}
	// t of a row's first block: i0 + lane.
	first := AllocLocal(32)
	storeFirstT(c, first)
	waiting := AllocLocal(3 * 32) // x, y and the destination of up to four positions
	last := AllocLocal(32)
	wx, wy, wdst := waiting, waiting.Offset(32), waiting.Offset(64)
	flush := func(name string, count Op) {
		x, y := YMM(), YMM()
		VMOVUPD(wx, x)
		VMOVUPD(wy, y)
		VMOVUPD(a.block(x, y), last)
		j, v, p := GP64(), GP64(), GP64()
		XORQ(j, j)
		Label(name)
		MOVQ(last.Idx(j, 8), v)
		MOVQ(wdst.Idx(j, 8), p)
		MOVQ(v, Mem{Base: p})
		INCQ(j)
		CMPQ(j, count)
		JB(LabelRef(name))
	}

	ox := Load(Param("ox").Base(), GP64())
	oy := Load(Param("oy").Base(), GP64())
	rows := paramAddr(Param("ox").Len())
	side := paramAddr(Param("side"))
	dst := Load(Param("out").Base(), GP64())
	full := AllocLocal(8) // side rounded down to whole blocks
	fr := GP64()
	MOVQ(side, fr)
	ANDQ(I32(-4), fr)
	MOVQ(fr, full)
	cnt, r := GP64(), GP64()
	XORQ(cnt, cnt)
	XORQ(r, r)
	CMPQ(rows, I32(0))
	JE(LabelRef("grid_final"))

	Label("grid_row")
	for i, base := range []Register{ox, oy} {
		b := YMM()
		VBROADCASTSD(Mem{Base: base, Index: r, Scale: 8}, b)
		VMOVUPD(b, line.Offset(32*i))
	}
	t := YMM()
	VMOVUPD(first, t)
	VMOVUPD(t, line.Offset(4*32))
	k := GP64()
	XORQ(k, k)
	CMPQ(full, I32(0))
	JE(LabelRef("grid_rest"))
	Label("grid_block")
	x, y := linePositions(line, c, nil)
	VMOVUPD(a.block(x, y), Mem{Base: dst, Index: k, Scale: 8})
	ADDQ(I32(4), k)
	CMPQ(k, full)
	JB(LabelRef("grid_block"))

	Label("grid_rest")
	CMPQ(k, side)
	JAE(LabelRef("grid_next"))
	Label("grid_pixel")
	ts, px, py := XMM(), XMM(), XMM()
	tk := GP64()
	MOVQ(paramAddr(Param("i0")), tk)
	ADDQ(k, tk)
	VXORPD(ts, ts, ts)
	VCVTSI2SDQ(tk, ts, ts)
	VMULSD(line.Offset(2*32), ts, px)
	VADDSD(line.Offset(0), px, px)
	VMOVSD(px, wx.Idx(cnt, 8))
	VMULSD(line.Offset(3*32), ts, py)
	VADDSD(line.Offset(32), py, py)
	VMOVSD(py, wy.Idx(cnt, 8))
	p := GP64()
	LEAQ(Mem{Base: dst, Index: k, Scale: 8}, p)
	MOVQ(p, wdst.Idx(cnt, 8))
	INCQ(cnt)
	CMPQ(cnt, I32(4))
	JB(LabelRef("grid_nextpixel"))
	flush("grid_flush", I32(4))
	XORQ(cnt, cnt)
	Label("grid_nextpixel")
	INCQ(k)
	CMPQ(k, side)
	JB(LabelRef("grid_pixel"))

	Label("grid_next")
	MOVQ(side, p)
	LEAQ(Mem{Base: dst, Index: p, Scale: 8}, dst)
	INCQ(r)
	CMPQ(r, rows)
	JB(LabelRef("grid_row"))

	Label("grid_final")
	CMPQ(cnt, I32(0))
	JE(LabelRef("grid_done"))
	// The unused lanes at (0, 0), inside any image.
	j := GP64()
	MOVQ(cnt, j)
	Label("grid_zero")
	MOVQ(U32(0), wx.Idx(j, 8))
	MOVQ(U32(0), wy.Idx(j, 8))
	INCQ(j)
	CMPQ(j, I32(4))
	JB(LabelRef("grid_zero"))
	flush("grid_lastflush", cnt)
	Label("grid_done")
	VZEROUPPER()
	RET()
}

// linePositions returns the positions (x0 + t·ax, y0 + t·ay) of the
// block's four lanes from line (x0, y0, ax, ay, t, each broadcast), and
// advances t by four for a whole block (mask nil), else sets the lanes
// outside mask to (0, 0).
func linePositions(line Mem, c cubicConsts, mask Op) (x, y VecVirtual) {
	t := YMM()
	VMOVUPD(line.Offset(4*32), t)
	x, y = YMM(), YMM()
	VMULPD(line.Offset(2*32), t, x)
	VADDPD(line.Offset(0), x, x)
	VMULPD(line.Offset(3*32), t, y)
	VADDPD(line.Offset(32), y, y)
	if mask == nil {
		VADDPD(c.four, t, t)
		VMOVUPD(t, line.Offset(4*32))
	} else {
		VANDPD(mask, x, x)
		VANDPD(mask, y, y)
	}
	return x, y
}
