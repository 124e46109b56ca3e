package strain

import (
	"fmt"
	"math"

	"spallscope/dic"
)

// Frame is one frame's input to zone finding: its place in the test (time
// and nominal stress from the load log, given as plain values) and its
// strain and displacement fields.
type Frame struct {
	Index  int
	Name   string
	Time   float64
	Stress float64 // MPa, compression positive; 0 without a load log
	InSpan bool    // the load log covers the frame's time
	Strain *Field
	Disp   *dic.Field
}

// FinderConfig sets up zone finding.
type FinderConfig struct {
	Indicators  []Indicator
	Thresholds  Thresholds
	Sectors     Sectors
	Scale       dic.Scale
	Persistence int     // frames a zone must last to count as an onset (default 3)
	Touch       float64 // px within which a zone reaches a wall (default 2 grid steps)
	// SubsetHalf is half the correlation subset in px (default 10): points
	// left unmeasured within reach of a subset of an opening are the
	// opening's shadow, not a free edge.
	SubsetHalf int
}

// Finder finds localized zones frame by frame, keeps their identities
// across frames and times their onsets. Frames must be added in order.
type Finder struct {
	cfg      FinderConfig
	baseline Baseline
	ref      *dic.Field
	geo      *geometry
	grid     dic.Grid
	nextID   int
	prev     map[Indicator][]Zone
	frames   []Frame     // without fields
	framePos map[int]int // frame index → position in frames
	zones    []Zone      // every zone of every frame, in order
	// vsg is the virtual strain gauge of the strain fields in px, (window
	// − 1) × step + subset (0 while unknown): the distance within which
	// zones of one opening are one event (see events).
	vsg int
	// noise is each strain indicator's noise over the calibration frames
	// (SetNoise); floor the bar it sets under every frame's threshold.
	noise, floor map[Indicator]float64
	// scale is each strain indicator's per-point noise over the
	// calibration frames relative to the face's (at least 1; nil: 1).
	scale map[Indicator][]float64
	// bars is each indicator's threshold per frame, in order, and spreads
	// the frame's robust spread of the indicator over the points.
	bars, spreads map[Indicator][]float64
}

// Effective returns the configuration with defaults in its zero fields
// (indicators e1, gamma_max and decorrelation, persistence 3, and the
// defaults of the thresholds and sectors), as a finder applies them; Touch
// and SubsetHalf depend on the run and keep their zero.
func (cfg FinderConfig) Effective() FinderConfig {
	if len(cfg.Indicators) == 0 {
		cfg.Indicators = []Indicator{MaxPrincipal, MaxShear, Decorrelation}
	}
	if cfg.Persistence == 0 {
		cfg.Persistence = 3
	}
	cfg.Thresholds, cfg.Sectors = cfg.Thresholds.Effective(), cfg.Sectors.Effective()
	return cfg
}

// NewFinder prepares zone finding on the grid of ref, the reference
// frame's displacement field (which points were measured), with the
// elastic baseline fitted on the calibration frames (see FitBaseline).
func NewFinder(cfg FinderConfig, ref *dic.Field, baseline Baseline) (*Finder, error) {
	cfg = cfg.Effective()
	if cfg.Persistence < 1 {
		return nil, fmt.Errorf("persistence %d frames, expected at least 1", cfg.Persistence)
	}
	if err := cfg.Sectors.Validate(); err != nil {
		return nil, err
	}
	if cfg.Touch == 0 {
		cfg.Touch = 2 * float64(ref.Grid.Step)
	}
	if cfg.SubsetHalf == 0 {
		cfg.SubsetHalf = 10
	}
	f := &Finder{cfg: cfg, baseline: baseline, ref: ref, grid: ref.Grid, prev: map[Indicator][]Zone{}}
	shadow := math.Sqrt2*float64(cfg.SubsetHalf) + cfg.Touch
	f.geo = newGeometry(cfg.Sectors, ref.Grid, ref, cfg.Touch, shadow)
	return f, nil
}

// MinFloor is the least noise floor of a strain indicator: 1 µε, below
// what any camera resolves (common practice, no source). It keeps the
// threshold of a noise-free synthetic run above round-off.
const MinFloor = 1e-6

// SetNoise measures each strain indicator's noise on the calibration
// frames (strain fields at their stresses, the frames the baseline was
// fitted on): the median over the frames of the indicator's robust
// standard deviation across the points (see robustSpread). The threshold
// of every later frame is then at least K times that noise, and at least
// MinFloor: a frame whose own scatter is smaller (a quiet frame, a
// round-off field) cannot mark its noise as a zone. Call it before Add.
// It is NoiseFit over the frames in order, then SetNoiseFrom.
func (f *Finder) SetNoise(calib []*Field, stress []float64) {
	nf := f.NoiseFit()
	for j, sf := range calib {
		nf.Add(sf, stress[j])
	}
	f.SetNoiseFrom(nf)
}

// NoiseFit accumulates SetNoise's measures one calibration frame at a
// time, so that a long test's calibration frames need not be held at
// once: per strain indicator, one robust spread a frame, and each point's
// running mean and sum of squared deviations (Welford 1962,
// Technometrics 4, 419: the numerically stable one-pass variance; from
// memory) for its own noise (pointScale).
type NoiseFit struct {
	f       *Finder
	frames  int
	spreads map[Indicator][]float64
	points  map[Indicator]*pointNoise
	vals    []float64
}

// pointNoise is each point's running count, mean and sum of squared
// deviations of an indicator over the calibration frames.
type pointNoise struct {
	n        []int
	mean, m2 []float64
}

// NoiseFit starts measuring the noise against the finder's baseline.
func (f *Finder) NoiseFit() *NoiseFit {
	return &NoiseFit{f: f, spreads: map[Indicator][]float64{}, points: map[Indicator]*pointNoise{}}
}

// Add adds one calibration frame's strain field at its stress (MPa).
func (nf *NoiseFit) Add(sf *Field, stress float64) {
	nf.frames++
	t, bl := nf.f.cfg.Thresholds, nf.f.baseline
	for _, ind := range nf.f.cfg.Indicators {
		if ind == Decorrelation {
			continue
		}
		pn := nf.points[ind]
		if pn == nil {
			n := len(sf.Points)
			pn = &pointNoise{n: make([]int, n), mean: make([]float64, n), m2: make([]float64, n)}
			nf.points[ind] = pn
		}
		nf.vals = nf.vals[:0]
		for i := range min(len(sf.Points), len(pn.n)) {
			v, ok := t.value(ind, bl, sf, nil, nil, i, stress)
			if !ok {
				continue
			}
			nf.vals = append(nf.vals, v)
			pn.n[i]++
			d := v - pn.mean[i]
			pn.mean[i] += d / float64(pn.n[i])
			pn.m2[i] += d * (v - pn.mean[i])
		}
		if len(nf.vals) >= 8 {
			_, sp := robustSpread(nf.vals)
			nf.spreads[ind] = append(nf.spreads[ind], sp)
		}
	}
}

// SetNoiseFrom sets the finder's noise, floors and per-point scales from
// the frames nf was given (see SetNoise). Call it before Add.
func (f *Finder) SetNoiseFrom(nf *NoiseFit) {
	f.noise, f.floor, f.scale = map[Indicator]float64{}, map[Indicator]float64{}, map[Indicator][]float64{}
	k := f.cfg.Thresholds.Effective().K
	for _, ind := range f.cfg.Indicators {
		if ind == Decorrelation {
			continue
		}
		if sp := nf.spreads[ind]; len(sp) > 0 {
			f.noise[ind] = medianOf(sp)
		}
		f.floor[ind] = math.Max(k*f.noise[ind], MinFloor)
		f.scale[ind] = nf.pointScale(ind)
	}
}

// pointScale is each point's noise of the indicator over the calibration
// frames (the standard deviation of its values) relative to the median
// over the points, at least 1: points whose own noise is larger than the
// face's — next to an opening's wall or the face's edge, where the strain
// window is one-sided, and where the baseline extrapolates that noise into
// the loaded frames — need a higher bar, in proportion, to be marked. A
// point needs values in three frames to have a noise of its own (1
// without). nil with fewer than three calibration frames.
func (nf *NoiseFit) pointScale(ind Indicator) []float64 {
	pn := nf.points[ind]
	if nf.frames < 3 || pn == nil {
		return nil
	}
	sd := make([]float64, len(pn.n))
	var all []float64
	for i, n := range pn.n {
		sd[i] = math.NaN()
		if n >= 3 {
			sd[i] = math.Sqrt(pn.m2[i] / float64(n-1))
			all = append(all, sd[i])
		}
	}
	if len(all) == 0 {
		return nil
	}
	med := medianOf(all)
	if !(med > 0) {
		return nil
	}
	for i, s := range sd {
		sd[i] = 1
		if s > med {
			sd[i] = s / med
		}
	}
	return sd
}

// NoiseScale returns the factor by which each strain indicator's bar is
// raised at each grid point (see pointScale): one value a point, in the
// grid's row-major order, at least 1; all 1 when the calibration had too
// few frames to measure it (fewer than three), as the bar then is. nil
// before SetNoise. The kernel truth's detectable frame is taken at this
// bar (KernelTruth.FirstAboveScale), the one the run applied.
func (f *Finder) NoiseScale() map[Indicator][]float64 {
	if f.scale == nil {
		return nil
	}
	out := map[Indicator][]float64{}
	for ind, s := range f.scale {
		if s == nil {
			s = make([]float64, f.grid.Len())
			for i := range s {
				s[i] = 1
			}
		}
		out[ind] = s
	}
	return out
}

// Noise returns the indicators' noise measured by SetNoise (nil before).
func (f *Finder) Noise() map[Indicator]float64 { return f.noise }

// Floor returns the least threshold above a frame's median of each
// strain indicator: K × its noise, at least MinFloor (nil before SetNoise).
func (f *Finder) Floor() map[Indicator]float64 { return f.floor }

// Config returns the configuration in use, defaults filled in.
func (f *Finder) Config() FinderConfig {
	c := f.cfg
	c.Thresholds = c.Thresholds.Effective()
	return c
}

// Add finds the zones of the next frame, gives them stable IDs, and
// returns them.
func (f *Finder) Add(fr Frame) ([]Zone, error) {
	if fr.Strain == nil || fr.Strain.Grid != f.grid || (fr.Disp != nil && fr.Disp.Grid != f.grid) {
		return nil, fmt.Errorf("frame %s: its fields are not on the reference grid", fr.Name)
	}
	var out []Zone
	for _, ind := range f.cfg.Indicators {
		marked, value, bar, spread := f.cfg.Thresholds.marks(ind, f.baseline, fr.Strain, fr.Disp, f.ref, fr.Stress, f.floor[ind], f.scale[ind])
		if f.bars == nil {
			f.bars, f.spreads = map[Indicator][]float64{}, map[Indicator][]float64{}
		}
		f.bars[ind], f.spreads[ind] = append(f.bars[ind], bar), append(f.spreads[ind], spread)
		zones := f.cfg.Thresholds.describe(ind, f.grid, marked, value, fr.Index, f.geo, f.cfg.Scale)
		f.identify(zones, f.prev[ind])
		f.prev[ind] = zones
		out = append(out, zones...)
	}
	f.zones = append(f.zones, out...)
	if f.vsg == 0 && fr.Strain.Window > 1 {
		f.vsg = (fr.Strain.Window-1)*f.grid.Step + 2*f.cfg.SubsetHalf + 1
	}
	fr.Strain, fr.Disp = nil, nil
	if f.framePos == nil {
		f.framePos = map[int]int{}
	}
	f.framePos[fr.Index] = len(f.frames)
	f.frames = append(f.frames, fr)
	return out, nil
}

// identify gives each zone the ID of the previous frame's zone it overlaps
// most; when two zones claim one ID the larger overlap keeps it (a split:
// the bigger part carries on), and a zone that overlaps none gets a new ID.
func (f *Finder) identify(zones, prev []Zone) {
	owner := map[int]int{} // cell → previous zone ID
	for _, z := range prev {
		for _, c := range z.Cells {
			owner[c] = z.ID
		}
	}
	claim := make([]int, len(zones))
	overlap := make([]int, len(zones))
	for k, z := range zones {
		count := map[int]int{}
		for _, c := range z.Cells {
			if id, ok := owner[c]; ok {
				count[id]++
			}
		}
		claim[k] = -1
		for id, n := range count {
			if n > overlap[k] || (n == overlap[k] && id < claim[k]) {
				claim[k], overlap[k] = id, n
			}
		}
	}
	for k := range zones {
		if claim[k] >= 0 {
			for j := range zones {
				if j != k && claim[j] == claim[k] && (overlap[j] > overlap[k] || (overlap[j] == overlap[k] && j < k)) {
					claim[k] = -1 // the other part keeps the ID
					break
				}
			}
		}
		if claim[k] < 0 {
			f.nextID++
			claim[k] = f.nextID
		}
		zones[k].ID = claim[k]
	}
}

// Zones returns every zone found so far, frame by frame.
func (f *Finder) Zones() []Zone { return f.zones }

// Frames returns the frames added so far (without their fields).
func (f *Finder) Frames() []Frame { return f.frames }
