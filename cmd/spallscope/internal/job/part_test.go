package job

import (
	"reflect"
	"testing"
)

// Parts cover the frames once, in order, none longer than asked and as
// even as integer division makes them (worked by hand).
func TestSplitFrames(t *testing.T) {
	for _, c := range []struct {
		n, per int
		want   [][2]int
	}{
		{14, 8, [][2]int{{0, 7}, {7, 14}}},
		{20, 7, [][2]int{{0, 6}, {6, 13}, {13, 20}}},
		{5, 0, [][2]int{{0, 5}}},
		{5, 5, [][2]int{{0, 5}}},
		{5, 1, [][2]int{{0, 1}, {1, 2}, {2, 3}, {3, 4}, {4, 5}}},
	} {
		var got [][2]int
		for k, p := range SplitFrames(c.n, c.per) {
			if p.Index != k || p.Count != len(c.want) {
				t.Errorf("SplitFrames(%d, %d) part %d: index %d of %d", c.n, c.per, k, p.Index, p.Count)
			}
			got = append(got, [2]int{p.From, p.To})
		}
		if !reflect.DeepEqual(got, c.want) {
			t.Errorf("SplitFrames(%d, %d) = %v, want %v", c.n, c.per, got, c.want)
		}
	}
}
