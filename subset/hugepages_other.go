//go:build !linux

package subset

// adviseHugePages does nothing where there is no transparent huge page
// advice (see the Linux version).
func adviseHugePages(c []float32, collapse bool) {}
