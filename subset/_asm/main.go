// Command _asm generates the AVX2+FMA kernels of package subset
// (../vector_amd64.s and their declarations, ../vector_stubs_amd64.go)
// with avo. It is a module of its own so that the generator's
// dependencies stay out of spallscope's build; the underscore keeps it
// out of ./... patterns. Run `go generate ./subset/` from the repository
// root after changing it, and commit the generated files with it.
package main

import (
	. "github.com/mmcloughlin/avo/build"
)

func main() {
	ConstraintExpr("!purego")
	deformedSums()
	cubicKernels(float32Coef)
	cubicCentresKernel()
	affineMoments()
	prefilterKernels()
	prefetchKernel()
	Generate()
}
