package main

import (
	. "github.com/mmcloughlin/avo/build"
	. "github.com/mmcloughlin/avo/operand"
)

// prefetchKernel generates prefetchRows: a software prefetch (PREFETCHT0)
// of every cache line of a block of coefficient rows, so that the misses
// of a subset's window are in flight together, while another subset is
// solved, rather than met one row at a time by the interpolation kernels
// (subset/prefetch.go). It loads nothing into registers and stores
// nothing: the values the kernels compute do not depend on it.
func prefetchKernel() {
	TEXT("prefetchRows", NOSPLIT, "func(coef []float32, off, stride, rows, width int)")
	Pragma("noescape")
	Doc("prefetchRows asks the processor to bring into its caches the",
		"coefficients coef[off + r·stride + i], r < rows, i < width (every",
		"cache line they touch). It reads no value and writes none; the",
		"caller keeps the block inside coef and rows, width ≥ 1.")
	coef := Load(Param("coef").Base(), GP64())
	off := Load(Param("off"), GP64())
	stride := Load(Param("stride"), GP64())
	rows := Load(Param("rows"), GP64())
	width := Load(Param("width"), GP64())
	p := GP64()
	LEAQ(Mem{Base: coef, Index: off, Scale: 4}, p)
	SHLQ(U8(2), stride) // in bytes
	SHLQ(U8(2), width)
	DECQ(width) // the last byte of a row
	Label("prefetch_row")
	q := GP64()
	XORQ(q, q)
	Label("prefetch_line")
	PREFETCHT0(Mem{Base: p, Index: q, Scale: 1})
	ADDQ(I32(64), q)
	CMPQ(q, width)
	JB(LabelRef("prefetch_line"))
	PREFETCHT0(Mem{Base: p, Index: width, Scale: 1})
	ADDQ(stride, p)
	DECQ(rows)
	JNZ(LabelRef("prefetch_row"))
	RET()
}
