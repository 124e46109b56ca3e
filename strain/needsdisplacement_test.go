package strain

import "testing"

// The zones stage reads a frame's displacement field for back-dating only
// when an onset is of decorrelation, whose cells come from the fields'
// point statuses (Dating.NeedsDisplacement); a mixed list needs them, a
// list of strain onsets or no onset does not.
func TestNeedsDisplacement(t *testing.T) {
	f := &Finder{}
	for _, c := range []struct {
		name   string
		onsets []Onset
		want   bool
	}{
		{"no onset", nil, false},
		{"strain onsets", []Onset{{Indicator: MaxShear}, {Indicator: MaxPrincipal}}, false},
		{"decorrelation alone", []Onset{{Indicator: Decorrelation}}, true},
		{"decorrelation among strain onsets", []Onset{{Indicator: MaxShear}, {Indicator: Decorrelation}}, true},
	} {
		if got := f.Dating(c.onsets).NeedsDisplacement(); got != c.want {
			t.Errorf("%s: NeedsDisplacement %v, want %v", c.name, got, c.want)
		}
	}
}
