package synth

import (
	"bufio"
	"encoding/json"
	"fmt"
	"math"
	"os"
	"path/filepath"
	"strconv"

	"spallscope/dic/frames"
	"spallscope/dic/runfolder"
	"spallscope/subset"
)

// Generator names what wrote a truth file, with the version of the
// rendering model: it changes whenever the same scenario would render
// differently, so a cached sequence is reused only when it matches.
const Generator = "spallscope synth, model 3"

// FrameTruth is what is known exactly about one rendered frame.
type FrameTruth struct {
	Index  int     `json:"index"`
	Name   string  `json:"name"`
	File   string  `json:"file"`
	Time   float64 `json:"time_s"`
	Stress float64 `json:"stress_MPa"`
	Force  float64 `json:"force_kN"`
	// Factors are the magnitude fractions of the scenario's fields.
	Factors []float64 `json:"factors"`
	// Grid is the dense truth grid file of this frame.
	Grid string `json:"truth_grid"`
}

// Truth is the content of truth.json: the scenario and every frame's facts.
type Truth struct {
	Generator string       `json:"generator"`
	Scenario  Scenario     `json:"scenario"`
	Frames    []FrameTruth `json:"frames"`
	LoadLog   string       `json:"load_log"`
	// Detection and Features are the truth of every damage feature (band,
	// crack, notch, spalled patch): hidden start, detectable frame at
	// Detection's VSG and limit, place (opening, sector) and the
	// feature's own γmax per frame, pointwise and over the VSG (see
	// FeatureTruth; FirstAbove gives the detectable frame for another
	// limit).
	Detection Detection      `json:"detection"`
	Features  []FeatureTruth `json:"features,omitempty"`
	// Targets lists the chessboard photos, when the scenario asks for them.
	Targets []TargetTruth `json:"targets,omitempty"`
}

// Layout of a synthetic sequence folder.
const (
	FramesDir  = "frames"
	TruthDir   = "truth"
	TruthFile  = "truth.json"
	LoadLogCSV = "loadlog.csv"
)

// Write renders every frame of the scenario into dir and writes the truth
// file, a dense truth grid per frame and the load log:
//
//	dir/frames/<name>.png       the frames (frame 0 is the reference)
//	dir/truth/<name>.csv        x,y,u,v,dudx,dudy,dvdx,dvdy,material
//	dir/truth.json              scenario, per-frame time, stress, force, and the
//	                            damage features' truth (Truth.Features)
//	dir/loadlog.csv             time_s,force_kN,stroke_mm on the log's clock
//	dir/targets/target_NN.png   chessboard photos through the lens (Targets)
//	dir/lens_truth.json         the lens as a lens file, with the targets' poses
//
// progress, if not nil, is called after each frame. Every file is written
// atomically.
func Write(sc *Scenario, dir string, progress func(done, total int)) (*Truth, error) {
	if err := sc.Validate(); err != nil {
		return nil, fmt.Errorf("scenario %q: %w", sc.Name, err)
	}
	for _, d := range []string{dir, filepath.Join(dir, FramesDir), filepath.Join(dir, TruthDir)} {
		if err := os.MkdirAll(d, 0o755); err != nil {
			return nil, err
		}
	}
	speckles, err := NewSpeckles(sc.Pattern, sc.Width, sc.Height)
	if err != nil {
		return nil, fmt.Errorf("pattern: %w", err)
	}
	var fresh *Speckles
	if len(sc.Spalls) > 0 {
		p := sc.Pattern
		p.Seed ^= 0x9e3779b97f4a7c15
		if fresh, err = NewSpeckles(p, sc.Width, sc.Height); err != nil {
			return nil, err
		}
	}
	ext := sc.Format
	if ext == "" {
		ext = "png"
	}
	truth := &Truth{Generator: Generator, Scenario: *sc, LoadLog: LoadLogCSV, Detection: sc.DetectionOrDefault()}
	if truth.Features, err = sc.FeatureTruth(truth.Detection.VSG, truth.Detection.Limit); err != nil {
		return nil, fmt.Errorf("scenario %q: %w", sc.Name, err)
	}
	var reference *subset.Image // unrecorded exposure of frame 0, for Fourier translation
	for f := 0; f < sc.Frames; f++ {
		field := sc.FieldAt(f)
		scene := Scene{Speckles: speckles, Field: field, Openings: sc.Openings, Fresh: fresh, Lens: sc.LensModel()}
		for _, s := range sc.Spalls {
			if f >= s.Frame {
				scene.Spalled = append(scene.Spalled, s.Region)
			}
		}
		var img *subset.Image
		if tr, ok := field.(Translation); ok && sc.FourierTranslation && len(scene.Spalled) == 0 {
			if reference == nil {
				if reference, err = Expose(Scene{Speckles: speckles, Openings: sc.Openings}, sc.Camera, sc.Width, sc.Height); err != nil {
					return nil, err
				}
			}
			img = FourierShift(reference, tr.U, tr.V)
		} else if img, err = Expose(scene, sc.Camera, sc.Width, sc.Height); err != nil {
			return nil, err
		}
		Record(img, sc.Camera, f)
		name := sc.FrameName(f)
		ft := FrameTruth{
			Index: f, Name: name,
			File:   filepath.Join(FramesDir, name+"."+ext),
			Grid:   filepath.Join(TruthDir, name+".csv"),
			Time:   sc.Time(f),
			Stress: sc.Stress(f),
		}
		ft.Force = ft.Stress * sc.Specimen.LoadedArea() / 1000
		for i := range sc.Fields {
			ft.Factors = append(ft.Factors, sc.Factor(i, f))
		}
		if err := frames.WriteImage(filepath.Join(dir, ft.File), img, sc.Camera.withDefaults().Depth); err != nil {
			return nil, err
		}
		if err := writeTruthGrid(filepath.Join(dir, ft.Grid), sc, field, f); err != nil {
			return nil, err
		}
		truth.Frames = append(truth.Frames, ft)
		if progress != nil {
			progress(f+1, sc.Frames)
		}
	}
	if err := writeLoadLog(filepath.Join(dir, LoadLogCSV), sc); err != nil {
		return nil, err
	}
	if sc.Targets != nil {
		if truth.Targets, err = writeTargets(sc, dir); err != nil {
			return nil, err
		}
	}
	err = runfolder.WriteJSON(filepath.Join(dir, TruthFile), truth)
	if err != nil {
		return nil, err
	}
	return truth, nil
}

// writeTruthGrid writes the exact motion on a regular grid of material
// points (reference coordinates) for one frame.
func writeTruthGrid(path string, sc *Scenario, field Field, frame int) error {
	step := sc.TruthStep
	if step <= 0 {
		step = 8
	}
	return runfolder.WriteAtomic(path, func(w *bufio.Writer) error {
		w.WriteString("x,y,u,v,dudx,dudy,dvdx,dvdy,material\n")
		buf := make([]byte, 0, 128)
		for y := 0; y < sc.Height; y += step {
			for x := 0; x < sc.Width; x += step {
				var m Motion
				if field != nil {
					m = field.At(float64(x), float64(y))
				}
				buf = buf[:0]
				buf = strconv.AppendInt(buf, int64(x), 10)
				buf = append(buf, ',')
				buf = strconv.AppendInt(buf, int64(y), 10)
				for _, v := range [...]float64{m.U, m.V, m.UX, m.UY, m.VX, m.VY} {
					buf = append(buf, ',')
					buf = strconv.AppendFloat(buf, v, 'g', 9, 64)
				}
				if sc.Material(float64(x), float64(y), frame) {
					buf = append(buf, ",1\n"...)
				} else {
					buf = append(buf, ",0\n"...)
				}
				if _, err := w.Write(buf); err != nil {
					return err
				}
			}
		}
		return nil
	})
}

// writeLoadLog writes the test frame's log as the frame's own computer
// would: a few comment lines, a header, then time_s,force_kN,stroke_mm at
// the log rate on the log's clock, from one second before the first frame
// to one second after the last. Force is compressive-positive.
func writeLoadLog(path string, sc *Scenario) error {
	rate := sc.Load.LogRate
	if rate <= 0 {
		rate = 10
	}
	area := sc.Specimen.LoadedArea()
	t0, t1 := -1.0, sc.Time(sc.Frames-1)+1
	return runfolder.WriteAtomic(path, func(w *bufio.Writer) error {
		fmt.Fprintf(w, "# synthetic load log for scenario %q, written by %s\n", sc.Name, Generator)
		fmt.Fprintf(w, "# loaded area %.6g mm2; log clock = camera clock %+.6g s\n", area, sc.Load.ClockOffset)
		w.WriteString("time_s,force_kN,stroke_mm\n")
		n := int(math.Floor((t1-t0)*rate)) + 1
		for i := 0; i < n; i++ {
			t := t0 + float64(i)/rate
			force := sc.StressAt(t) * area / 1000
			stroke := sc.Load.StrokeRate * math.Max(0, t)
			fmt.Fprintf(w, "%.4f,%.6g,%.6g\n", t+sc.Load.ClockOffset, force, stroke)
		}
		return nil
	})
}

// ReadTruth reads a truth.json written by Write.
func ReadTruth(path string) (*Truth, error) {
	data, err := os.ReadFile(path)
	if err != nil {
		return nil, fmt.Errorf("truth: %w", err)
	}
	var t Truth
	if err := json.Unmarshal(data, &t); err != nil {
		return nil, fmt.Errorf("truth %s: %w", path, err)
	}
	if err := t.Scenario.Validate(); err != nil {
		return nil, fmt.Errorf("truth %s: scenario: %w", path, err)
	}
	return &t, nil
}
