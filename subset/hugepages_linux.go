package subset

import (
	"unsafe"

	"golang.org/x/sys/unix"
)

// hugePlane is the size from which a coefficient plane is worth huge
// pages: a few of them at least (2 MB each on amd64).
const hugePlane = 8 << 20

// adviseHugePages asks Linux to back a large coefficient plane with
// transparent huge pages (madvise MADV_HUGEPAGE; with collapse, also
// MADV_COLLAPSE, which turns the pages already touched into huge ones at
// once, Linux 6.1 and later). The interpolant reads a 4×4 window a
// position, each of its rows a stride apart: at 20 MP a window's rows lie
// on four 4 KB pages, and the solver's subsets, visited in the order of
// reliability rather than of memory, touch some 48 pages an iteration
// across the two planes, more than the processor's translation caches
// hold for long. With 2 MB pages the planes' 160 MB fit in them (measured:
// the tracker's CPU time 5–7 % lower at 20 MP). Where the kernel does not
// allow it (transparent huge pages off, older kernels, other systems) the
// advice fails and is ignored: only speed depends on it.
func adviseHugePages(c []float32, collapse bool) {
	if len(c)*4 < hugePlane {
		return
	}
	b := unsafe.Slice((*byte)(unsafe.Pointer(&c[0])), len(c)*4)
	_ = unix.Madvise(b, unix.MADV_HUGEPAGE)
	if collapse {
		_ = unix.Madvise(b, unix.MADV_COLLAPSE)
	}
}
