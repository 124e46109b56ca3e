package baseline

import (
	"math"
	"testing"
)

// The Hanning taper is 0 on the border and 1 at the centre of an odd
// window, by its definition (tolerance: float32 rounding, 1e-6).
func TestHanning(t *testing.T) {
	const n = 21
	m, err := hanning(n)
	if err != nil {
		t.Fatal(err)
	}
	defer m.Close()
	if m.Rows() != n || m.Cols() != n {
		t.Fatalf("size %dx%d, want %dx%d", m.Cols(), m.Rows(), n, n)
	}
	checks := []struct {
		row, col int
		want     float64
	}{{0, 0, 0}, {0, 10, 0}, {10, 20, 0}, {10, 10, 1}, {10, 5, 0.5}}
	for _, c := range checks {
		if got := float64(m.GetFloatAt(c.row, c.col)); math.Abs(got-c.want) > 1e-6 {
			t.Errorf("w(%d, %d) = %g, want %g", c.row, c.col, got, c.want)
		}
	}
}
