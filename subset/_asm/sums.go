package main

import (
	"fmt"

	. "github.com/mmcloughlin/avo/build"
	. "github.com/mmcloughlin/avo/operand"
	. "github.com/mmcloughlin/avo/reg"
)

// The deformed-side sums of an IC-GN iteration (subset/icgn_sums.go) over
// the n valid pixels of a subset, four pixels to a vector: with
// g = gs − fm, a = gx·g and b = gy·g they are Σg, Σg², Σfc·g and the
// moments Σa·m, Σb·m of the monomials m of the shape function in the
// pixel offsets dx, dy. The lanes are summed ((l0 + l2) + (l1 + l3)) at
// the end of the vector loop and the last n mod 4 pixels are added one by
// one after.

// sumsArgs are the loaded arguments of a sums kernel.
type sumsArgs struct {
	gs, fc, gx, gy, dx, dy Mem
	n                      Register
	fm                     VecVirtual // fm broadcast to all lanes
	out                    Mem
}

func loadSumsArgs() sumsArgs {
	var a sumsArgs
	a.gs = Mem{Base: Load(Param("gs").Base(), GP64())}
	a.fc = Mem{Base: Load(Param("fc").Base(), GP64())}
	a.gx = Mem{Base: Load(Param("gx").Base(), GP64())}
	a.gy = Mem{Base: Load(Param("gy").Base(), GP64())}
	a.dx = Mem{Base: Load(Param("dx").Base(), GP64())}
	a.dy = Mem{Base: Load(Param("dy").Base(), GP64())}
	a.n = Load(Param("gs").Len(), GP64())
	fm := Load(Param("fm"), XMM())
	a.fm = YMM()
	VBROADCASTSD(fm, a.fm)
	a.out = Mem{Base: Load(Param("out"), GP64())}
	return a
}

// lanes abstracts over the vector (four pixels, Y registers) and the
// scalar (one pixel, the low lane of X registers) forms of the loop body.
type lanes struct {
	width         int
	reg           func() VecVirtual
	load          func(m Mem, r Op)
	sub, add, mul func(a, b, dst Op) // dst = a − b, a + b, a·b
	fma           func(a, b, acc Op) // acc += a·b
	store         func(r Op, m Mem)
}

var vector = lanes{
	width: 4, reg: YMM,
	load:  func(m Mem, r Op) { VMOVUPD(m, r) },
	sub:   func(a, b, d Op) { VSUBPD(b, a, d) },
	add:   func(a, b, d Op) { VADDPD(b, a, d) },
	mul:   func(a, b, d Op) { VMULPD(b, a, d) },
	fma:   func(a, b, acc Op) { VFMADD231PD(b, a, acc) },
	store: func(r Op, m Mem) { VMOVUPD(r, m) },
}

var scalar = lanes{
	width: 1, reg: XMM,
	load:  func(m Mem, r Op) { VMOVSD(m, r) },
	sub:   func(a, b, d Op) { VSUBSD(b, a, d) },
	add:   func(a, b, d Op) { VADDSD(b, a, d) },
	mul:   func(a, b, d Op) { VMULSD(b, a, d) },
	fma:   func(a, b, acc Op) { VFMADD231SD(b, a, acc) },
	store: func(r Op, m Mem) { VMOVSD(r, m) },
}

// sumLoop runs body over the n pixels: in vectors of four while four
// remain, then on the lane sums one pixel at a time. acc are the
// accumulators (zeroed here); on return they hold the scalar sums in the
// low lanes of their X forms.
func sumLoop(name string, a sumsArgs, acc []VecVirtual, body func(l lanes, i Register, acc []VecVirtual)) []VecVirtual {
	for _, r := range acc {
		VXORPD(r, r, r)
	}
	var i, end Register = GP64(), GP64()
	XORQ(i, i)
	MOVQ(a.n, end)
	ANDQ(I32(-4), end)
	CMPQ(end, I32(0))
	JE(LabelRef(name + "_reduce"))
	Label(name + "_vector")
	body(vector, i, acc)
	ADDQ(I32(4), i)
	CMPQ(i, end)
	JB(LabelRef(name + "_vector"))
	Label(name + "_reduce")
	xs := make([]VecVirtual, len(acc))
	for k, r := range acc {
		xs[k] = laneSum(r)
	}
	CMPQ(i, a.n)
	JAE(LabelRef(name + "_done"))
	Label(name + "_scalar")
	body(scalar, i, xs)
	INCQ(i)
	CMPQ(i, a.n)
	JB(LabelRef(name + "_scalar"))
	Label(name + "_done")
	return xs
}

// laneSum returns an X register whose low lane is (l0 + l2) + (l1 + l3)
// of the Y register y.
func laneSum(y VecVirtual) VecVirtual {
	hi, x := XMM(), XMM()
	VEXTRACTF128(U8(1), y, hi)
	VADDPD(hi, y.AsX(), x)
	VUNPCKHPD(x, x, hi)
	VADDSD(hi, x, x)
	return x
}

// firstMomentsBody accumulates, for pixels i … i+width−1, Σg, Σg², Σfc·g,
// Σa, Σa·dx, Σa·dy, Σb, Σb·dx, Σb·dy into acc[0 … 8].
func firstMomentsBody(a sumsArgs) func(l lanes, i Register, acc []VecVirtual) {
	return func(l lanes, i Register, acc []VecVirtual) {
		var fm Op = a.fm
		if l.width == 1 {
			fm = a.fm.AsX()
		}
		g := l.reg()
		l.load(a.gs.Idx(i, 8), g)
		l.sub(g, fm, g)
		l.add(acc[0], g, acc[0])
		l.fma(g, g, acc[1])
		f := l.reg()
		l.load(a.fc.Idx(i, 8), f)
		l.fma(f, g, acc[2])
		ga, gb := l.reg(), l.reg()
		l.load(a.gx.Idx(i, 8), ga)
		l.mul(ga, g, ga)
		l.load(a.gy.Idx(i, 8), gb)
		l.mul(gb, g, gb)
		dx, dy := l.reg(), l.reg()
		l.load(a.dx.Idx(i, 8), dx)
		l.load(a.dy.Idx(i, 8), dy)
		l.add(acc[3], ga, acc[3])
		l.fma(ga, dx, acc[4])
		l.fma(ga, dy, acc[5])
		l.add(acc[6], gb, acc[6])
		l.fma(gb, dx, acc[7])
		l.fma(gb, dy, acc[8])
	}
}

// secondMomentsBody accumulates Σa·dx², Σa·dx·dy, Σa·dy², Σb·dx²,
// Σb·dx·dy, Σb·dy² into acc[0 … 5].
func secondMomentsBody(a sumsArgs) func(l lanes, i Register, acc []VecVirtual) {
	return func(l lanes, i Register, acc []VecVirtual) {
		var fm Op = a.fm
		if l.width == 1 {
			fm = a.fm.AsX()
		}
		g := l.reg()
		l.load(a.gs.Idx(i, 8), g)
		l.sub(g, fm, g)
		dx, dy := l.reg(), l.reg()
		l.load(a.dx.Idx(i, 8), dx)
		l.load(a.dy.Idx(i, 8), dy)
		for k, grad := range []Mem{a.gx, a.gy} {
			c, cx, cy := l.reg(), l.reg(), l.reg()
			l.load(grad.Idx(i, 8), c)
			l.mul(c, g, c)
			l.mul(c, dx, cx)
			l.mul(c, dy, cy)
			l.fma(cx, dx, acc[3*k])
			l.fma(cx, dy, acc[3*k+1])
			l.fma(cy, dy, acc[3*k+2])
		}
	}
}

func yRegs(n int) []VecVirtual {
	r := make([]VecVirtual, n)
	for k := range r {
		r[k] = YMM()
	}
	return r
}

func storeSums(out Mem, first int, xs []VecVirtual) {
	for k, x := range xs {
		VMOVSD(x, out.Offset(8*(first+k)))
	}
}

// deformedSums generates affineSumsAVX2 and quadraticSumsAVX2.
func deformedSums() {
	const args = "gs, fc, gx, gy, dx, dy []float64, fm float64, out *[%d]float64"
	TEXT("affineSumsAVX2", NOSPLIT, "func("+fmt.Sprintf(args, 9)+")")
	Pragma("noescape")
	Doc("affineSumsAVX2 sets out to the sums over the len(gs) pixels, with",
		"g = gs − fm, a = gx·g, b = gy·g: Σg, Σg², Σfc·g, Σa, Σa·dx, Σa·dy,",
		"Σb, Σb·dx, Σb·dy. All slices hold at least len(gs) values.")
	a := loadSumsArgs()
	xs := sumLoop("first", a, yRegs(9), firstMomentsBody(a))
	storeSums(a.out, 0, xs)
	VZEROUPPER()
	RET()

	TEXT("quadraticSumsAVX2", NOSPLIT, "func("+fmt.Sprintf(args, 15)+")")
	Pragma("noescape")
	Doc("quadraticSumsAVX2 is affineSumsAVX2 followed by Σa·dx², Σa·dx·dy,",
		"Σa·dy², Σb·dx², Σb·dx·dy, Σb·dy² in out[9 … 14].")
	a = loadSumsArgs()
	xs = sumLoop("first", a, yRegs(9), firstMomentsBody(a))
	storeSums(a.out, 0, xs)
	xs = sumLoop("second", a, yRegs(6), secondMomentsBody(a))
	storeSums(a.out, 9, xs)
	VZEROUPPER()
	RET()
}
