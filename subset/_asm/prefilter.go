package main

import (
	. "github.com/mmcloughlin/avo/build"
	. "github.com/mmcloughlin/avo/operand"
	. "github.com/mmcloughlin/avo/reg"
)

// The recursions of the B-spline prefilter (subset/bspline.go:
// filterLines and the column pass of Spline.fit) over m independent
// lines at once, four lines to a vector: the causal step
// c[k] = c[k] + z·c[k−1] and the anticausal step c[k] = z·(c[k+1] − c[k])
// along k, for every line. The operations are filterLines' own, in its
// order and without FMA (the Go compiler does not fuse below
// GOAMD64=v3), so the coefficients equal the Go loops' bit for bit. The
// steps along k depend on each other; the lines do not, so the loop over
// the lines is the inner one. The last m mod 4 lines of a step are taken
// one at a time.

// lineStep emits one step over the m lines: body(l, i) for the lines i
// (an index in lines) in vectors of four while four remain, then one at a
// time. m4 is m rounded down to a multiple of four.
func lineStep(name string, m, m4 Register, body func(l lanes, i Register)) {
	i := GP64()
	XORQ(i, i)
	CMPQ(m4, I32(0))
	JE(LabelRef(name + "_rest"))
	Label(name + "_block")
	body(vector, i)
	ADDQ(I32(4), i)
	CMPQ(i, m4)
	JB(LabelRef(name + "_block"))
	Label(name + "_rest")
	CMPQ(i, m)
	JAE(LabelRef(name + "_done"))
	Label(name + "_line")
	body(scalar, i)
	INCQ(i)
	CMPQ(i, m)
	JB(LabelRef(name + "_line"))
	Label(name + "_done")
}

// broadcastZ loads the pole z into all four lanes of a Y register (its low
// lane serves the scalar steps).
func broadcastZ() VecVirtual {
	x, z := Load(Param("z"), XMM()), YMM()
	VBROADCASTSD(x, z)
	return z
}

// zFor returns z as the lanes' operand: the Y register, or its low lane.
func zFor(l lanes, z VecVirtual) Op {
	if l.width == 1 {
		return z.AsX()
	}
	return z
}

// loadF32 loads float32 values at m widened to float64: four (vector) or
// one (scalar).
func loadF32(l lanes, m Mem, r VecVirtual) {
	if l.width == 4 {
		VCVTPS2PD(m, r)
		return
	}
	VXORPD(r, r, r)
	VCVTSS2SD(m, r, r)
}

// storeF32 stores r rounded to float32 at m: four lanes or one.
func storeF32(l lanes, r VecVirtual, m Mem) {
	x := XMM()
	if l.width == 4 {
		VCVTPD2PSY(r, x)
		VMOVUPS(x, m)
		return
	}
	VCVTSD2SS(r, x, x)
	VMOVSS(x, m)
}

// prefilterKernels generates the recursions: over contiguous lines (the
// rows' bundles of the quintic kernel), over the columns of the coefficient
// plane, and over four rows of the image.
func prefilterKernels() {
	causalKernel()
	anticausalKernel()
	columnsInKernel()
	columnsOutKernel()
	rowsKernels()
}

// lineArgs loads step as bytes (shifted left by shift: 3 for float64
// lines, 2 for float32), n, m and m rounded down to four.
func lineArgs(step string, shift uint8) (stepBytes, n, m, m4 Register) {
	stepBytes = Load(Param(step), GP64())
	SHLQ(U8(shift), stepBytes)
	n = Load(Param("n"), GP64())
	m = Load(Param("m"), GP64())
	m4 = GP64()
	MOVQ(m, m4)
	ANDQ(I32(-4), m4)
	return
}

func causalKernel() {
	TEXT("splineCausalAVX2", NOSPLIT, "func(c []float64, step, n, m int, z float64)")
	Pragma("noescape")
	Doc("splineCausalAVX2 runs the causal recursion c[k] += z·c[k−1],",
		"k = 1 … n−1, over the m lines whose value k is c[k·step + l],",
		"l < m, as filterLines does, bit for bit.")
	prev := Load(Param("c").Base(), GP64())
	stepBytes, n, m, m4 := lineArgs("step", 3)
	z := broadcastZ()
	k := GP64()
	MOVQ(U32(1), k)
	CMPQ(k, n)
	JAE(LabelRef("causal_end"))
	Label("causal_step")
	cur := GP64()
	LEAQ(Mem{Base: prev, Index: stepBytes, Scale: 1}, cur)
	lineStep("causal", m, m4, func(l lanes, i Register) {
		a, b := l.reg(), l.reg()
		l.load(Mem{Base: prev, Index: i, Scale: 8}, a)
		l.mul(a, zFor(l, z), a)
		l.load(Mem{Base: cur, Index: i, Scale: 8}, b)
		l.add(b, a, b)
		l.store(b, Mem{Base: cur, Index: i, Scale: 8})
	})
	MOVQ(cur, prev)
	INCQ(k)
	CMPQ(k, n)
	JB(LabelRef("causal_step"))
	Label("causal_end")
	VZEROUPPER()
	RET()
}

func anticausalKernel() {
	TEXT("splineAnticausalAVX2", NOSPLIT, "func(c []float64, step, n, m int, z float64)")
	Pragma("noescape")
	Doc("splineAnticausalAVX2 runs the anticausal recursion",
		"c[k] = z·(c[k+1] − c[k]), k = n−2 … 0, over the m lines whose value",
		"k is c[k·step + l], l < m, as filterLines does, bit for bit.")
	base := Load(Param("c").Base(), GP64())
	stepBytes, n, m, m4 := lineArgs("step", 3)
	z := broadcastZ()
	// next: line k+1, from line n−1 down.
	k, next := GP64(), GP64()
	MOVQ(n, k)
	SUBQ(U32(1), k)
	JBE(LabelRef("anti_end")) // n ≤ 1
	MOVQ(k, next)
	IMULQ(stepBytes, next)
	ADDQ(base, next)
	Label("anti_step")
	cur := GP64()
	MOVQ(next, cur)
	SUBQ(stepBytes, cur)
	lineStep("anti", m, m4, func(l lanes, i Register) {
		anticausalStep(l, next, cur, i, z)
	})
	MOVQ(cur, next)
	DECQ(k)
	JNZ(LabelRef("anti_step"))
	Label("anti_end")
	VZEROUPPER()
	RET()
}

// anticausalStep sets the lanes at i of line cur to z·(next − cur), the
// anticausal recursion's step, and returns the register holding them.
func anticausalStep(l lanes, next, cur, i Register, z VecVirtual) VecVirtual {
	a, b := l.reg(), l.reg()
	l.load(Mem{Base: next, Index: i, Scale: 8}, a)
	l.load(Mem{Base: cur, Index: i, Scale: 8}, b)
	l.sub(a, b, a)
	l.mul(a, zFor(l, z), a)
	l.store(a, Mem{Base: cur, Index: i, Scale: 8})
	return a
}

func columnsInKernel() {
	TEXT("splineColumnsInAVX2", NOSPLIT, "func(src []float32, stride int, t []float64, n, m int, z float64)")
	Pragma("noescape")
	Doc("splineColumnsInAVX2 sets t[k·m + l] = src[k·stride + l] + z·t[(k−1)·m + l]",
		"for k = 1 … n−1 and l < m, t's first m values being set: the column",
		"pass's copy of m columns into float64 and its causal recursion in",
		"one, as the Go loops do them, bit for bit.")
	src := Load(Param("src").Base(), GP64())
	prev := Load(Param("t").Base(), GP64())
	stride, n, m, m4 := lineArgs("stride", 2)
	tBytes := GP64()
	MOVQ(m, tBytes)
	SHLQ(U8(3), tBytes)
	z := broadcastZ()
	k := GP64()
	MOVQ(U32(1), k)
	CMPQ(k, n)
	JAE(LabelRef("colin_end"))
	Label("colin_step")
	ADDQ(stride, src)
	cur := GP64()
	LEAQ(Mem{Base: prev, Index: tBytes, Scale: 1}, cur)
	lineStep("colin", m, m4, func(l lanes, i Register) {
		a, b := l.reg(), l.reg()
		l.load(Mem{Base: prev, Index: i, Scale: 8}, a)
		l.mul(a, zFor(l, z), a)
		loadF32(l, Mem{Base: src, Index: i, Scale: 4}, b)
		l.add(b, a, b)
		l.store(b, Mem{Base: cur, Index: i, Scale: 8})
	})
	MOVQ(cur, prev)
	INCQ(k)
	CMPQ(k, n)
	JB(LabelRef("colin_step"))
	Label("colin_end")
	VZEROUPPER()
	RET()
}

func columnsOutKernel() {
	TEXT("splineColumnsOutAVX2", NOSPLIT, "func(t []float64, n, m int, z float64, dst []float32, stride int)")
	Pragma("noescape")
	Doc("splineColumnsOutAVX2 runs the anticausal recursion",
		"t[k·m + l] = z·(t[(k+1)·m + l] − t[k·m + l]), k = n−2 … 0, l < m, from",
		"the last line as set, and stores every line k rounded to float32 at",
		"dst[k·stride + l]: the column pass's anticausal recursion and its",
		"copy back in one, as the Go loops do them, bit for bit.")
	base := Load(Param("t").Base(), GP64())
	dst := Load(Param("dst").Base(), GP64())
	stride, n, m, m4 := lineArgs("stride", 2)
	tBytes := GP64()
	MOVQ(m, tBytes)
	SHLQ(U8(3), tBytes)
	z := broadcastZ()
	k, next, out := GP64(), GP64(), GP64()
	MOVQ(n, k)
	SUBQ(U32(1), k)
	JB(LabelRef("colout_end")) // n = 0
	// The last line, stored as it is.
	MOVQ(k, next)
	IMULQ(tBytes, next)
	ADDQ(base, next)
	MOVQ(k, out)
	IMULQ(stride, out)
	ADDQ(dst, out)
	lineStep("colout_last", m, m4, func(l lanes, i Register) {
		a := l.reg()
		l.load(Mem{Base: next, Index: i, Scale: 8}, a)
		storeF32(l, a, Mem{Base: out, Index: i, Scale: 4})
	})
	CMPQ(k, U32(0))
	JE(LabelRef("colout_end"))
	Label("colout_step")
	SUBQ(stride, out)
	cur := GP64()
	MOVQ(next, cur)
	SUBQ(tBytes, cur)
	lineStep("colout", m, m4, func(l lanes, i Register) {
		a := anticausalStep(l, next, cur, i, z)
		storeF32(l, a, Mem{Base: out, Index: i, Scale: 4})
	})
	MOVQ(cur, next)
	DECQ(k)
	JNZ(LabelRef("colout_step"))
	Label("colout_end")
	VZEROUPPER()
	RET()
}

// rowsLane holds the lane numbers 0 … 3 as int32, for the rows' gather
// offsets.
var rowsLane Mem

func rowsKernels() {
	rowsLane = GLOBL("prefilterRowsLane", RODATA|NOPTR)
	for k := 0; k < 4; k++ {
		DATA(4*k, U32(k))
	}
	rowsInKernel()
	rowsOutKernel()
}

func rowsInKernel() {
	TEXT("splineRowsInAVX2", NOSPLIT, "func(img []float32, stride int, t []float64, w int, gain, z float64)")
	Pragma("noescape")
	Doc("splineRowsInAVX2 sets t[4x + l] = gain·img[l·stride + x] + z·t[4(x−1) + l]",
		"for x = 1 … w−1 and the four rows l < 4, t's first four values being",
		"set: the row pass's transposed copy (with the gain) and its causal",
		"recursion in one, four rows to a vector, as the Go loops do them,",
		"bit for bit.")
	src := Load(Param("img").Base(), GP64())
	tp := Load(Param("t").Base(), GP64())
	stride := Load(Param("stride"), GP64())
	w := Load(Param("w"), GP64())
	g, z := YMM(), broadcastZ()
	VBROADCASTSD(Load(Param("gain"), XMM()), g)
	idx := XMM()
	MOVQ(stride, idx)
	VPBROADCASTD(idx, idx)
	VPMULLD(rowsLane, idx, idx)
	prev := YMM()
	VMOVUPD(Mem{Base: tp}, prev)
	x := GP64()
	MOVQ(U32(1), x)
	CMPQ(x, w)
	JAE(LabelRef("rowsin_end"))
	Label("rowsin_step")
	ADDQ(U8(4), src)
	ADDQ(U8(32), tp)
	mask, v := XMM(), XMM()
	VPCMPEQD(mask, mask, mask)
	VXORPS(v, v, v)
	VGATHERDPS(mask, Mem{Base: src, Index: idx, Scale: 4}, v)
	in := YMM()
	VCVTPS2PD(v, in)
	VMULPD(g, in, in)
	VMULPD(z, prev, prev)
	VADDPD(prev, in, prev)
	VMOVUPD(prev, Mem{Base: tp})
	INCQ(x)
	CMPQ(x, w)
	JB(LabelRef("rowsin_step"))
	Label("rowsin_end")
	VZEROUPPER()
	RET()
}

func rowsOutKernel() {
	TEXT("splineRowsOutAVX2", NOSPLIT, "func(t []float64, w int, z float64, dst []float32, stride int)")
	Pragma("noescape")
	Doc("splineRowsOutAVX2 runs the anticausal recursion",
		"t[4x + l] = z·(t[4(x+1) + l] − t[4x + l]), x = w−2 … 0, of four rows",
		"from their last values as set, and stores row l's value x rounded to",
		"float32 at dst[l·stride + x]: the row pass's anticausal recursion",
		"and its transposed copy back in one, as the Go loops do them, bit for",
		"bit (t keeps the causal values).")
	tp := Load(Param("t").Base(), GP64())
	dst := Load(Param("dst").Base(), GP64())
	s := Load(Param("stride"), GP64())
	SHLQ(U8(2), s)
	s3 := GP64()
	LEAQ(Mem{Base: s, Index: s, Scale: 2}, s3)
	x := Load(Param("w"), GP64())
	z := broadcastZ()
	SUBQ(U32(1), x)
	JB(LabelRef("rowsout_end")) // w = 0
	p := GP64()
	LEAQ(Mem{Base: dst, Index: x, Scale: 4}, p)
	q := GP64()
	MOVQ(x, q)
	SHLQ(U8(5), q)
	ADDQ(tp, q)
	next := YMM()
	VMOVUPD(Mem{Base: q}, next)
	store := func() {
		f := XMM()
		VCVTPD2PSY(next, f)
		VMOVSS(f, Mem{Base: p})
		VEXTRACTPS(U8(1), f, Mem{Base: p, Index: s, Scale: 1})
		VEXTRACTPS(U8(2), f, Mem{Base: p, Index: s, Scale: 2})
		VEXTRACTPS(U8(3), f, Mem{Base: p, Index: s3, Scale: 1})
	}
	store()
	CMPQ(x, U32(0))
	JE(LabelRef("rowsout_end"))
	Label("rowsout_step")
	SUBQ(U8(4), p)
	SUBQ(U8(32), q)
	cur := YMM()
	VMOVUPD(Mem{Base: q}, cur)
	VSUBPD(cur, next, next)
	VMULPD(z, next, next)
	store()
	DECQ(x)
	JNZ(LabelRef("rowsout_step"))
	Label("rowsout_end")
	VZEROUPPER()
	RET()
}
