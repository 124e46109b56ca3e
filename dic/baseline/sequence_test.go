package baseline

import (
	"math"
	"slices"
	"testing"
)

// The sequence's exact field at the centre of the face, where strain and
// rotation about it vanish, is the drift of the ramp alone: frame k of n
// moves by k/(n−1) × (0.6, −0.35) px (main) or (−0.4, 0.5) px (held out),
// exact by construction (tolerance 1e-12 px). Bad specs are refused.
func TestSequenceTruth(t *testing.T) {
	for _, held := range []bool{false, true} {
		seq, err := NewSequence(SequenceSpec{Width: 96, Height: 64, Frames: 3, Noise: 1, HeldOut: held})
		if err != nil {
			t.Fatal(err)
		}
		du, dv := 0.6, -0.35
		if held {
			du, dv = -0.4, 0.5
		}
		if len(seq.Fields) != 2 || seq.Ref.Width != 96 || seq.Ref.Height != 64 {
			t.Fatalf("held out %v: %d fields, reference %dx%d", held, len(seq.Fields), seq.Ref.Width, seq.Ref.Height)
		}
		// A frame rendered on demand is the frame kept.
		demand := seq.Spec
		demand.OnDemand = true
		lazy, err := NewSequence(demand)
		if err != nil {
			t.Fatal(err)
		}
		kept, _, err1 := seq.Frame(2)
		made, _, err2 := lazy.Frame(2)
		if err1 != nil || err2 != nil || !slices.Equal(kept.Pix, made.Pix) {
			t.Errorf("held out %v: frame 2 on demand differs from the kept one (%v, %v)", held, err1, err2)
		}
		if _, _, err := seq.Frame(3); err == nil {
			t.Errorf("frame 3 of 3 frames (0…2) given")
		}
		for k, f := range seq.Fields {
			s := float64(k+1) / 2
			m := f.At(48, 32)
			if math.Abs(m.U-s*du) > 1e-12 || math.Abs(m.V-s*dv) > 1e-12 {
				t.Errorf("held out %v, frame %d: centre moves (%g, %g), want (%g, %g)", held, k+1, m.U, m.V, s*du, s*dv)
			}
		}
	}
	for _, bad := range []SequenceSpec{{Width: 96, Height: 96, Frames: 2}, {Width: 32, Height: 96, Frames: 3}, {Width: 96, Height: 96, Frames: 3, Noise: -1}} {
		if _, err := NewSequence(bad); err == nil {
			t.Errorf("%+v accepted", bad)
		}
	}
}
