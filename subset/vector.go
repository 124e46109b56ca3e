package subset

// SetVectorForTesting switches the vector kernels of the solver's hot
// loops on or off for the whole process and returns a function that
// restores the previous choice, and ok, false when on was asked where
// there are no vector kernels (the purego build tag, another
// architecture, a processor without AVX2 or FMA): the Go loops then stay.
// It is for tests and benchmarks only, which compare the two paths on the
// same inputs in one process; it is not safe to call while a Solver runs
// in another goroutine, so call it before starting any and restore after
// all have returned.
//
// Why a function: the Go standard library's crypto packages choose their
// assembly with the purego build tag and the processor's features
// (internal/cpu), and their tests switch the choice from inside the
// package; x/sys/cpu honours GODEBUG=cpu.avx2=off for a whole process. A
// build tag or GODEBUG gives one path per process, so a test outside this
// package (whole-field tracking in dic) could compare the two only by
// running itself again and passing its results across. The switch is
// kept to this one function, named so that no production code calls it
// by accident (the ForTesting suffix: common practice, no source); the
// build tag and GODEBUG remain the ways to run a whole program on the Go
// loops.
func SetVectorForTesting(on bool) (restore func(), ok bool) {
	saved := useVector
	useVector = on && hasVector
	return func() { useVector = saved }, useVector == on
}
