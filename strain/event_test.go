package strain_test

import (
	"fmt"
	"slices"
	"testing"

	"spallscope/dic/synth"
	"spallscope/strain"
)

// eventCase is a seed scenario with damage features, and the localization
// onsets it must give: one per physical event, each at its place.
type eventCase struct {
	name string
	twin bool
	wide bool // the twin openings 96 px apart at the walls (wideTwin)
	// noises are the gray-level noises run (nil: grayNoises).
	noises   []float64
	features []synth.FieldSpec
	want     []strain.Place // the events' places (Wall unused)
	// reached, if set, is a sector the first event's zones must reach
	// besides their own in most seeds (a feature that grows across a
	// sector boundary).
	reached strain.Sector
}

// eventSeeds is the number of noise seeds per case and noise level.
const eventSeeds = 5

// eventCases are our own features on the seed scenarios (seedScenario: a
// 32 px opening at (127.5, 127.5); twinSeedScenario: 28 px openings at
// x = 99.5 and 219.5, walls of the 64 px pillar at 127.5 and 191.5), each
// growing from frame 14 to full size at frame 34 unless said otherwise.
func eventCases() []eventCase {
	const cx, cy, a = 127.5, 127.5, 32.0
	grow := func(f synth.FieldSpec, from int) synth.FieldSpec {
		f.Drive, f.StartFrame, f.FullFrame = synth.DriveGrowth, from, from+20
		return f
	}
	notch := func(wx, side float64) synth.FieldSpec {
		return synth.FieldSpec{Notch: &synth.Notch{X0: wx, Y0: cy, X1: wx + side*30, Y1: cy - 22, X2: wx + side*30, Y2: cy + 22, Slip: 1.0, HalfWidth: 3}}
	}
	return []eventCase{
		// A band from the right sidewall (its root 30° above the
		// springline: 60° from the crown direction) growing up and out into
		// the crown sector (its tip 38° from the crown direction).
		{name: "band across a sector boundary",
			features: []synth.FieldSpec{grow(synth.FieldSpec{Band: &synth.ShearBand{X0: 155.2, Y0: 111.5, X1: 185, Y1: 55, Slip: 1.0, HalfWidth: 3}}, 14)},
			want:     []strain.Place{{Opening: 0, Sector: strain.RightSidewall}}, reached: strain.Crown},
		// Notches at both sidewalls, the left one three frames later: two
		// fractures, two onsets.
		{name: "two sidewall notches",
			features: []synth.FieldSpec{grow(notch(cx+a, 1), 14), grow(notch(cx-a, -1), 17)},
			want:     []strain.Place{{Opening: 0, Sector: strain.RightSidewall}, {Opening: 0, Sector: strain.LeftSidewall}}},
		// A tensile crack from the right sidewall only: nothing at the
		// left sidewall.
		{name: "one-sided crack",
			features: []synth.FieldSpec{grow(synth.FieldSpec{Crack: &synth.Crack{X0: cx + a, Y0: cy, X1: cx + a + 50, Y1: cy - 4, Opening: 0.8, Decay: 10}}, 14)},
			want:     []strain.Place{{Opening: 0, Sector: strain.RightSidewall}}},
		// Notches at both walls of a 96 px pillar (wideTwin), the right
		// one a frame later, their arms 20 px into it: two fractures,
		// one at each opening's wall (a pillar point's opening is the
		// nearer wall's, sector.Layout.Locate), their zones' centroids
		// about a VSG apart.
		{name: "two pillar-wall notches", twin: true, wide: true,
			features: []synth.FieldSpec{
				grow(synth.FieldSpec{Notch: &synth.Notch{X0: 127.5, Y0: cy, X1: 147.5, Y1: cy - 16, X2: 147.5, Y2: cy + 16, Slip: 1.5, HalfWidth: 3}}, 14),
				grow(synth.FieldSpec{Notch: &synth.Notch{X0: 223.5, Y0: cy, X1: 203.5, Y1: cy - 16, X2: 203.5, Y2: cy + 16, Slip: 1.5, HalfWidth: 3}}, 15)},
			want: []strain.Place{{Opening: 0, Sector: strain.Pillar}, {Opening: 1, Sector: strain.Pillar}},
			// At σ 2 the right notch is not confirmed at all in 4 of 5
			// seeds, by the old rule too (measured): the detection
			// limit, not this test's subject.
			noises: []float64{0.5, 1}},
		// A band from the left opening's pillar wall into the pillar: its
		// lobes either side of its root lie in the pillar and just below
		// it, in the left opening's invert; one event, in the pillar.
		{name: "pillar band", twin: true,
			features: []synth.FieldSpec{grow(synth.FieldSpec{Band: &synth.ShearBand{X0: 127.5, Y0: 127.5, X1: 165.5, Y1: 117.5, Slip: 1.5, HalfWidth: 3}}, 14)},
			want:     []strain.Place{{Opening: 0, Sector: strain.Pillar}}},
	}
}

// wideTwin is twinSeedScenario widened to 352 px with its right opening
// moved to x = 251.5: a 96 px pillar between walls at 127.5 and 223.5,
// wider than the seed runs' 69 px VSG, so fractures at its two walls can be
// told apart.
func wideTwin() *synth.Scenario {
	sc := twinSeedScenario()
	const y, a, x1, x2 = 127.5, 28.0, 99.5, 251.5
	sc.Width = 352
	sc.Openings = []synth.Opening{synth.Circle(x1, y, a), synth.Circle(x2, y, a)}
	sc.Fields = []synth.FieldSpec{{KirschPair: &synth.KirschPair{X1: x1, Y1: y, R1: a, X2: x2, Y2: y, R2: a, Stress: 40, K: 0, E: 15000, Nu: 0.2}, Drive: synth.DriveLoad}}
	return sc
}

// One onset per physical event (the zone finder's event rule, see
// Finder.Onsets and events, then JoinEvents after back-dating, as the zones
// stage runs them): on synthetic displacement fields with a subset's noise
// (runSeed) at gray-level noise 0.5, 1 and 2, over eventSeeds seeds each,
// each case gives exactly its events' localization onsets, at their
// places, in all but at most 2 of its runs, and at most 1 onset at a place
// without an event (the opposite sidewall of a one-sided crack, a band's
// lobe in the next sector). Measured, runs exact / onsets at places
// without an event, this rule against the old one (one onset per place and
// zone ID, no joining): band across a sector boundary 14/1 against 0/15,
// two sidewall notches 15/0 against 12/3, one-sided crack 14/1 against
// 12/3, pillar band 14/1 against 0/17 (the old rule gave its lobe below
// the pillar an onset in the invert), pillar-wall notches 10/0 against
// 8/4.
func TestOneOnsetPerEvent(t *testing.T) {
	for _, c := range eventCases() {
		t.Run(c.name, func(t *testing.T) {
			t.Parallel()
			sc := seedScenario()
			switch {
			case c.wide:
				sc = wideTwin()
			case c.twin:
				sc = twinSeedScenario()
			}
			sc.Fields = append(sc.Fields, c.features...)
			exact, stray, reached, runs := 0, 0, 0, 0
			noises := c.noises
			if noises == nil {
				noises = grayNoises
			}
			for ni, sigma := range noises {
				for s := range eventSeeds {
					r := runSeed(t, sc, sigma, uint64(5000+100*ni+s))
					r.onsets = strain.JoinEvents(r.onsets, r.finder.VSG())
					runs++
					var got []strain.Place
					var desc []string
					for _, o := range r.onsets {
						desc = append(desc, fmt.Sprintf("%s %s/%d %s frame %d (trigger %d) reached %v", o.Class, o.Sector, o.Opening, o.Indicator, o.Frame, o.TriggerFrame, o.Reached))
						if o.Class != strain.Localization {
							continue
						}
						pl := strain.Place{Opening: o.Opening, Sector: o.Sector}
						got = append(got, pl)
						if !slices.Contains(c.want, pl) {
							stray++
						}
						if c.reached != "" && pl == c.want[0] && slices.Contains(o.Reached, strain.Reach{Opening: 0, Sector: c.reached}) {
							reached++
						}
					}
					ok := len(got) == len(c.want)
					for _, w := range c.want {
						ok = ok && slices.Contains(got, w)
					}
					if ok {
						exact++
					} else {
						t.Logf("σ %g seed %d: onsets %v", sigma, s, desc)
					}
				}
			}
			t.Logf("%s: %d of %d runs give exactly the events' onsets; %d onsets at a place without an event; first event reached %q in %d", c.name, exact, runs, stray, c.reached, reached)
			if exact < runs-2 {
				t.Errorf("%d of %d runs give exactly the onsets of %v, want at least %d", exact, runs, c.want, runs-2)
			}
			if stray > 1 {
				t.Errorf("%d localization onsets at places without an event, want at most 1", stray)
			}
			if c.reached != "" && reached < runs/2 {
				t.Errorf("the event reached the %s in %d of %d runs, want at least half", c.reached, reached, runs)
			}
		})
	}
}

// JoinEvents joins a localization and a decorrelation onset at one place
// whose intervals share frames (the demo's crack from the crown: its strain
// and its decorrelation dated to frames 30 and 29, intervals 15–31 and
// 23–33, measured) into one, the earlier, and leaves apart those at one
// place whose intervals are apart (the demo's right sidewall: the notch
// localized at 18 within 10–19, the spall decorrelated at 54), onsets more
// than a VSG apart with overlapping intervals (the notch and the crack's
// strain, 132 px apart) and onsets at another opening; a band's lobe in
// the next sector, 40 px away with an overlapping interval, joins the
// band. Centroids and frames as measured on the demo's front face, the
// lobe our own.
func TestJoinEvents(t *testing.T) {
	iv := func(lo, hi int) *strain.OnsetInterval { return &strain.OnsetInterval{FirstFrame: lo, LastFrame: hi} }
	onsets := []strain.Onset{
		{Opening: 0, Sector: strain.RightSidewall, Class: strain.Localization, Indicator: strain.MaxShear, Frame: 18, Interval: iv(10, 19), Cx: 339, Cy: 257, ByIndicator: map[strain.Indicator]int{strain.MaxShear: 21}},
		{Opening: 0, Sector: strain.Crown, Class: strain.Decorrelated, Indicator: strain.Decorrelation, Frame: 29, Interval: iv(23, 33), Cx: 255, Cy: 183, ByIndicator: map[strain.Indicator]int{strain.Decorrelation: 34}},
		{Opening: 0, Sector: strain.Crown, Class: strain.Localization, Indicator: strain.MaxShear, Frame: 30, Interval: iv(15, 31), Cx: 239, Cy: 171, ByIndicator: map[strain.Indicator]int{strain.MaxShear: 39}},
		{Opening: 0, Sector: strain.Invert, Class: strain.Localization, Indicator: strain.MaxPrincipal, Frame: 19, Interval: iv(17, 22), Cx: 331, Cy: 296, ByIndicator: map[strain.Indicator]int{strain.MaxPrincipal: 24}},
		{Opening: 0, Sector: strain.RightSidewall, Class: strain.Decorrelated, Indicator: strain.Decorrelation, Frame: 54, Interval: iv(54, 54), Cx: 331, Cy: 256, ByIndicator: map[strain.Indicator]int{strain.Decorrelation: 54}},
		{Opening: 1, Sector: strain.Crown, Class: strain.Localization, Indicator: strain.MaxShear, Frame: 31, Interval: iv(25, 32), Cx: 250, Cy: 190},
	}
	got := strain.JoinEvents(onsets, 69)
	if len(got) != 4 {
		t.Fatalf("%d onsets, want 4: %+v", len(got), got)
	}
	want := []struct {
		sec   strain.Sector
		op    int
		class string
		frame int
	}{{strain.RightSidewall, 0, strain.Localization, 18}, {strain.Crown, 0, strain.Decorrelated, 29}, {strain.RightSidewall, 0, strain.Decorrelated, 54}, {strain.Crown, 1, strain.Localization, 31}}
	for k, w := range want {
		if o := got[k]; o.Sector != w.sec || o.Opening != w.op || o.Class != w.class || o.Frame != w.frame {
			t.Errorf("onset %d: %d %s %s at %d, want %d %s %s at %d", k, o.Opening, o.Sector, o.Class, o.Frame, w.op, w.sec, w.class, w.frame)
		}
	}
	if r := got[0].Reached; len(r) != 1 || r[0] != (strain.Reach{Opening: 0, Sector: strain.Invert}) {
		t.Errorf("the sidewall's event reached %v, want the invert (its lobe)", r)
	}
	if by := got[0].ByIndicator; by[strain.MaxPrincipal] != 24 || by[strain.MaxShear] != 21 {
		t.Errorf("the sidewall's frames by indicator %v, want e1 24 and gamma_max 21", by)
	}
	if by := got[1].ByIndicator; by[strain.Decorrelation] != 34 || by[strain.MaxShear] != 39 {
		t.Errorf("joined onset's frames by indicator %v, want decorrelation 34 and gamma_max 39", by)
	}
	if by := onsets[1].ByIndicator; len(by) != 1 {
		t.Errorf("the input's frames by indicator were changed: %v", by)
	}
}
