package baseline

import (
	"math"
	"testing"
)

// testSize keeps the tests fast: 160 px frames give a 5×5 point grid.
const testSize = 160

// Compare on small frames. The truth is exact by construction (package
// synth renders each frame from the analytic pattern and field); OpenCV is
// the reference library for the baselines.
func TestCompare(t *testing.T) {
	cases, err := Cases(testSize)
	if err != nil {
		t.Fatal(err)
	}
	rows, err := Compare(cases, 21)
	if err != nil {
		t.Fatal(err)
	}
	if want := len(cases) * len(Methods()); len(rows) != want {
		t.Fatalf("%d rows, want %d (cases × methods)", len(rows), want)
	}
	byCase := map[string]map[string]Row{}
	for _, r := range rows {
		if byCase[r.Case] == nil {
			byCase[r.Case] = map[string]Row{}
		}
		byCase[r.Case][r.Method] = r
		t.Logf("%-26s %-19s rmse %.4f px  max %.4f px  missing %d  %.1f µs/pt", r.Case, r.Method, r.RMSE, r.MaxErr, r.Missing, 1e6*r.TimePerPoint)
	}
	kinds := map[string]bool{}
	for _, c := range cases {
		kinds[c.Kind] = true
		rs := byCase[c.Name]
		sp, lk := rs[NameSpallscope], rs[NameLucasKanade]

		// Neither spallscope nor the reference tracker drops a point on
		// well-textured, fully visible frames.
		if sp.Missing != 0 || lk.Missing != 0 {
			t.Errorf("%s: missing points: spallscope %d, lucas-kanade %d, want 0", c.Name, sp.Missing, lk.Missing)
		}
		// Sanity bound on OpenCV's tracker: a wrong sign or axis swap in
		// the harness would give errors of the order of the shift itself.
		if c.Kind == KindTranslation && !(lk.RMSE < 0.05) {
			t.Errorf("%s: lucas-kanade RMSE %.4f px, want < 0.05 px", c.Name, lk.RMSE)
		}
		// Every baseline measures something: its RMSE is below that of
		// the null estimate u = v = 0.
		null := nullRMSE(c)
		for _, m := range Methods() {
			if r := rs[m.Name]; !(r.RMSE < null) {
				t.Errorf("%s: %s RMSE %.4f px, want below %.4f px (reporting no motion)", c.Name, m.Name, r.RMSE, null)
			}
		}
		// The product requirement: at least 3× lower RMSE than the best
		// baseline on every case.
		if !(3*sp.RMSE <= sp.RMSE/sp.VsBest) {
			t.Errorf("%s: spallscope RMSE %.4f px is %.2f× the best baseline's %.4f px, want ≤ 1/3", c.Name, sp.RMSE, sp.VsBest, sp.RMSE/sp.VsBest)
		}
		if !(math.Abs(lk.VsLK-1) < 1e-12) {
			t.Errorf("%s: lucas-kanade time ratio to itself %g, want 1", c.Name, lk.VsLK)
		}
	}
	if !kinds[KindTranslation] || !kinds[KindStrain] {
		t.Errorf("case kinds %v, want both %s and %s", kinds, KindTranslation, KindStrain)
	}
}

// nullRMSE is the RMSE of reporting zero displacement at every point.
func nullRMSE(c *Case) float64 {
	var s float64
	for _, m := range c.Truth {
		s += m.U*m.U + m.V*m.V
	}
	return math.Sqrt(s / float64(len(c.Truth)))
}

// A window that is even, too small, or too large for the margin is an
// error, not a silent shift of the subset centre.
func TestCheckWindow(t *testing.T) {
	c := &Case{Search: 3}
	for _, w := range []int{4, 3, 21 + 1, 2*(Margin-3) + 3} {
		if err := checkWindow(c, w); err == nil {
			t.Errorf("window %d accepted, want an error", w)
		}
	}
	for _, w := range []int{5, 21, 2*(Margin-3) + 1} {
		if err := checkWindow(c, w); err != nil {
			t.Errorf("window %d: %v, want accepted", w, err)
		}
	}
}
