//go:build !linux

package frames

// returnLargeBlocks does nothing where the allocator is not glibc's (see
// largeblocks_linux.go).
func returnLargeBlocks() {}
