package strain

import (
	"hash/fnv"
	"math"
	"slices"

	"gonum.org/v1/gonum/stat"

	"spallscope/dic"
)

// Confidence is the confidence of every onset interval.
const Confidence = 0.95

// bootstrapDraws is the number of parametric-bootstrap draws behind each
// onset interval.
const bootstrapDraws = 500

// OnsetInterval is the range of frames an onset lies in with the stated
// confidence, and the times and stresses of its ends.
type OnsetInterval struct {
	Confidence float64     `json:"confidence"`
	Method     string      `json:"method"`
	Model      ChangeModel `json:"change_model"`
	FirstFrame int         `json:"first_frame_index"`
	LastFrame  int         `json:"last_frame_index"`
	First      string      `json:"first_frame"`
	Last       string      `json:"last_frame"`
	TimeLo     float64     `json:"time_lo_s"`
	TimeHi     float64     `json:"time_hi_s"`
	StressLo   float64     `json:"stress_lo_MPa"`
	StressHi   float64     `json:"stress_hi_MPa"`
	// LogLik is the change's log likelihood ratio against no change.
	LogLik float64 `json:"log_likelihood_ratio"`
}

// OnsetHistory is a confirmed zone's indicator frame by frame, up to the
// end of the frames that confirmed it, for the report's plot: the mean of
// the zone's cells (strain, or the decorrelation value below), the frame's
// threshold for the indicator (0 where a frame had too few points, and for
// decorrelation, whose rule is per point), and the normalised signal the
// change point was estimated on (0 where it could not be formed). For
// decorrelation a cell's value is 1 for a point lost or diverged, 1 − ZNCC
// below the decorrelation limit and 0 otherwise, so the zone mean of a few
// cells moves in steps while its points are lost.
type OnsetHistory struct {
	Frames    []int     `json:"frame_index"`
	ZoneMean  []float64 `json:"zone_mean"`
	Threshold []float64 `json:"threshold"`
	Signal    []float64 `json:"signal"`
}

// Dating back-dates confirmed onsets from the whole history of their
// cells. The per-frame threshold (Finder.Add) is the trigger: it says that
// something happened, and roughly where. Once a zone is confirmed, the
// history of its cells' indicator — each cell normalised by its own noise
// over the calibration frames, then averaged, and the average normalised
// by its own calibration scatter — is a signal with unit noise and zero
// mean before the damage began; its maximum-likelihood change point (see
// EstimateChange) between the end of calibration and the trigger is the
// onset, with a bootstrap interval (ChangePoint.Interval). The onset is
// never later than the trigger, and never in the calibration frames.
//
// Feed every frame to Add in order (a second pass over the run), then
// call Onsets.
type Dating struct {
	f      *Finder
	onsets []Onset
	cells  [][]int       // per onset: its zone's cells at the trigger
	ring   [][]int       // per onset: the cells around them (ringCells)
	values [][][]float64 // per onset, frame, cell: the indicator (NaN: none)
	around [][][]float64 // the same of the ring's cells
	frames []Frame
}

// Ring bounds, in grid steps from the zone's nearest cell.
const ringInner, ringOuter = 2, 4

// ringCells are the grid points between ringInner and ringOuter grid steps
// (Chebyshev distance) from the nearest of cells, measured in ref.
func ringCells(g dic.Grid, ref *dic.Field, cells []int) []int {
	dist := map[int]int{}
	for _, c := range cells {
		cc, cr := c%g.Cols, c/g.Cols
		for dr := -ringOuter; dr <= ringOuter; dr++ {
			for dc := -ringOuter; dc <= ringOuter; dc++ {
				x, y := cc+dc, cr+dr
				if x < 0 || y < 0 || x >= g.Cols || y >= g.Rows {
					continue
				}
				i, d := g.Index(x, y), max(abs(dc), abs(dr))
				if old, ok := dist[i]; !ok || d < old {
					dist[i] = d
				}
			}
		}
	}
	var ring []int
	for i, d := range dist {
		if d >= ringInner && ref.Points[i].Valid() {
			ring = append(ring, i)
		}
	}
	slices.Sort(ring)
	return ring
}

func abs(x int) int {
	if x < 0 {
		return -x
	}
	return x
}

// Dating starts back-dating the onsets (from Onsets).
func (f *Finder) Dating(onsets []Onset) *Dating {
	n := len(onsets)
	d := &Dating{f: f, onsets: onsets, cells: make([][]int, n), ring: make([][]int, n), values: make([][][]float64, n), around: make([][][]float64, n)}
	for k, o := range onsets {
		for _, z := range f.zones {
			if z.ID == o.Zone && z.Frame == o.Frame && z.Indicator == o.Indicator {
				d.cells[k] = z.Cells
				break
			}
		}
		d.ring[k] = ringCells(f.grid, f.ref, d.cells[k])
	}
	return d
}

// Add reads one frame's values of every onset's cells and of the ring
// around them; frames come in the order they were given to the finder.
func (d *Dating) Add(fr Frame) {
	t := d.f.cfg.Thresholds.withDefaults()
	read := func(ind Indicator, cells []int) []float64 {
		vals := make([]float64, len(cells))
		for j, c := range cells {
			v, ok := t.value(ind, d.f.baseline, fr.Strain, fr.Disp, d.f.ref, c, fr.Stress)
			if !ok {
				v = math.NaN()
			}
			vals[j] = v
		}
		return vals
	}
	for k, o := range d.onsets {
		d.values[k] = append(d.values[k], read(o.Indicator, d.cells[k]))
		d.around[k] = append(d.around[k], read(o.Indicator, d.ring[k]))
	}
	fr.Strain, fr.Disp = nil, nil
	d.frames = append(d.frames, fr)
}

// Onsets returns the onsets back-dated, with their intervals and trigger
// frames. calibration[k] says frame position k calibrated the elastic
// baseline; an onset whose trigger lies there, or at the reference frame,
// is dropped: nothing can begin before the rock is known to be elastic.
// peak is the peak stress for the percent-of-peak figure.
func (d *Dating) Onsets(calibration []bool, peak float64) []Onset {
	lastCalib := 0
	for k, c := range calibration {
		if c {
			lastCalib = k
		}
	}
	pos := map[int]int{}
	for k, fr := range d.frames {
		pos[fr.Index] = k
	}
	var out []Onset
	for k, o := range d.onsets {
		trigger, ok := pos[o.Frame]
		if !ok || trigger <= lastCalib {
			continue
		}
		o.TriggerFrame, o.TriggerName = o.Frame, o.Name
		end := min(len(d.frames)-1, trigger+d.f.cfg.Persistence-1)
		z := d.signal(k, calibration, end+1)
		from := lastCalib + 1
		at := trigger
		iv := OnsetInterval{Confidence: Confidence, Method: "maximum-likelihood change point, parametric bootstrap", FirstFrame: trigger, LastFrame: trigger}
		if z != nil {
			if c, ok := EstimateChange(z, from, trigger); ok {
				// Where the fit's residuals are wider than the
				// normalisation says, the interval takes their width.
				sigma := math.Max(1, c.ResidualSigma(z))
				lo, hi := c.Interval(len(z), from, trigger, sigma, Confidence, bootstrapDraws, seedOf(o))
				at, iv.Model, iv.LogLik = c.Onset, c.Model, c.LogLik
				iv.FirstFrame, iv.LastFrame = lo, hi
			}
		}
		fr := d.frames[at]
		o.Frame, o.Name, o.Time, o.Stress, o.InSpan = fr.Index, fr.Name, fr.Time, fr.Stress, fr.InSpan
		if peak > 0 {
			o.Percent = 100 * fr.Stress / peak
		}
		lo, hi := d.frames[iv.FirstFrame], d.frames[iv.LastFrame]
		iv.FirstFrame, iv.LastFrame, iv.First, iv.Last = lo.Index, hi.Index, lo.Name, hi.Name
		iv.TimeLo, iv.TimeHi = lo.Time, hi.Time
		iv.StressLo, iv.StressHi = math.Min(lo.Stress, hi.Stress), math.Max(lo.Stress, hi.Stress)
		o.Interval = &iv
		o.History = d.history(k, end+1, z)
		out = append(out, o)
	}
	return out
}

// signal returns the normalised history of onset k over the first n
// frames: the zone's localization, the mean of its cells' normalised
// values less the median of the ring's around them — each cell's value
// less its calibration mean over its calibration standard deviation (at
// least the indicator's least noise) — so that a change the zone shares
// with the rock around it (the far field of another fracture, a drift of
// the elastic baseline at high load) does not read as the zone's own; the
// history is then divided by its own standard deviation over the
// calibration frames (at least that of independent cells, 1/√cells). nil
// when fewer than two calibration frames or no cell has a calibration
// noise.
func (d *Dating) signal(k int, calibration []bool, n int) []float64 {
	least := MinFloor
	if d.onsets[k].Indicator == Decorrelation {
		least = 1e-3 // a ZNCC change no correlation resolves
	}
	zone, zok := normalised(d.values[k], calibration, n, least)
	ring, _ := normalised(d.around[k], calibration, n, least)
	if !zok {
		return nil
	}
	x := make([]float64, n)
	for f := range n {
		x[f] = meanOf(zone[f])
		if r := ring[f]; len(r) > 0 {
			x[f] -= medianOf(r)
		}
	}
	// A frame whose scatter over the whole face has grown since
	// calibration (systematic errors that grow with the load: the
	// interpolation bias of larger gradients, a baseline that bends) counts
	// its signal in units of that larger scatter, so that what the whole
	// face shares does not read as this zone's onset.
	spreads := d.f.spreads[d.onsets[k].Indicator]
	var calibSpread []float64
	for f, c := range calibration {
		if c && f < len(spreads) && spreads[f] > 0 {
			calibSpread = append(calibSpread, spreads[f])
		}
	}
	if len(calibSpread) > 0 {
		base := medianOf(calibSpread)
		for f := range n {
			if f < len(spreads) && spreads[f] > base {
				x[f] /= spreads[f] / base
			}
		}
	}
	var calib []float64
	for f, c := range calibration[:min(n, len(calibration))] {
		if c {
			calib = append(calib, x[f])
		}
	}
	m, sd, ok := calibrationSpread(calib)
	if !ok {
		return nil
	}
	sx := math.Max(sd, 1/math.Sqrt(float64(len(d.cells[k]))))
	for f := range x {
		x[f] = (x[f] - m) / sx
	}
	return x
}

// normalised returns, per frame, the values of the cells that have a
// calibration noise, each less its calibration mean over its calibration
// standard deviation (at least least); ok is false when no cell has one.
func normalised(values [][]float64, calibration []bool, n int, least float64) (out [][]float64, ok bool) {
	if len(values) == 0 {
		return make([][]float64, n), false
	}
	cells := len(values[0])
	mean, sd := make([]float64, cells), make([]float64, cells)
	var vals []float64
	for j := range cells {
		vals = vals[:0]
		for f, c := range calibration {
			if v := values[f][j]; c && !math.IsNaN(v) {
				vals = append(vals, v)
			}
		}
		m, s, enough := calibrationSpread(vals)
		if !enough {
			sd[j] = math.NaN()
			continue
		}
		mean[j], sd[j], ok = m, math.Max(s, least), true
	}
	out = make([][]float64, n)
	for f := range n {
		for j, v := range values[f] {
			if !math.IsNaN(v) && !math.IsNaN(sd[j]) {
				out[f] = append(out[f], (v-mean[j])/sd[j])
			}
		}
	}
	return out, ok
}

// calibrationSpread is the mean and the sample standard deviation of a
// series' calibration values (gonum's stat.MeanStdDev); false with fewer
// than two.
func calibrationSpread(xs []float64) (mean, sd float64, ok bool) {
	if len(xs) < 2 {
		return 0, 0, false
	}
	mean, sd = stat.MeanStdDev(xs, nil)
	return mean, sd, true
}

// meanOf is the mean of xs (0 for none).
func meanOf(xs []float64) float64 {
	if len(xs) == 0 {
		return 0
	}
	return stat.Mean(xs, nil)
}

// history is onset k's OnsetHistory over the first n frames; z is its
// normalised signal (nil: none). Values that are not finite are written as
// 0, so that none reaches a JSON writer.
func (d *Dating) history(k, n int, z []float64) *OnsetHistory {
	finite := func(v float64) float64 {
		if math.IsNaN(v) || math.IsInf(v, 0) {
			return 0
		}
		return v
	}
	h := &OnsetHistory{}
	bars := d.f.bars[d.onsets[k].Indicator]
	for f := range n {
		var vals []float64
		for _, v := range d.values[k][f] {
			if !math.IsNaN(v) {
				vals = append(vals, v)
			}
		}
		bar := 0.0
		if f < len(bars) {
			bar = bars[f]
		}
		sig := 0.0
		if z != nil {
			sig = z[f]
		}
		h.Frames = append(h.Frames, d.frames[f].Index)
		h.ZoneMean = append(h.ZoneMean, finite(meanOf(vals)))
		h.Threshold = append(h.Threshold, finite(bar))
		h.Signal = append(h.Signal, finite(sig))
	}
	return h
}

// seedOf is a repeatable bootstrap seed for an onset.
func seedOf(o Onset) uint64 {
	h := fnv.New64a()
	h.Write([]byte(string(o.Sector) + "/" + o.Class + "/" + string(o.Indicator)))
	return h.Sum64() ^ uint64(o.Frame)<<32 ^ uint64(o.Zone)
}
