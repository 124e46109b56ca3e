package render

import (
	"bufio"
	"encoding/json"
	"fmt"
	"image"
	"image/color"
	"image/png"
	"math"
	"os"
	"path/filepath"
	"testing"

	"spallscope/dic"
	"spallscope/dic/runfolder"
	"spallscope/dic/speckle"
	"spallscope/strain"
	"spallscope/strain/strainfile"
	"spallscope/subset"
)

// The fixture run: a block with a circular opening under a uniaxial
// vertical load, measured on a 14 × 12 grid every 8 px. Every frame's
// displacement field is affine (a uniform strain and a rigid shift), so
// every strain the tools derive from it is known exactly: eyy = −σ/E and
// exx = ν·σ/E. Invented numbers, for tests only.
const (
	fixtureE  = 20000.0 // MPa
	fixtureNu = 0.25
	fixtureCx = 72.0 // opening centre and radius, px
	fixtureCy = 60.0
	fixtureR  = 18.0
)

var (
	fixtureGrid   = dic.Grid{X0: 20, Y0: 16, Step: 8, Cols: 14, Rows: 12}
	fixtureNames  = []string{"blk_0000", "blk_0001", "blk_0002", "blk_0003", "blk_0004", "blk_0005"}
	fixtureTimes  = []float64{0, 2, 4, 6, 8, 10}
	fixtureStress = []float64{0, 6, 12, 18, 24, 21}
)

// fixtureStrain returns frame k's uniform strains (exx, eyy).
func fixtureStrain(k int) (exx, eyy float64) {
	return fixtureNu * fixtureStress[k] / fixtureE, -fixtureStress[k] / fixtureE
}

// fixtureField returns frame k's displacement field: the opening's points
// are masked, and in the last frame one point beside the opening is lost.
func fixtureField(k int) *dic.Field {
	g := fixtureGrid
	f := &dic.Field{Index: k, Name: fixtureNames[k], Grid: g, Points: make([]dic.Point, g.Len())}
	exx, eyy := fixtureStrain(k)
	for i := range f.Points {
		x, y := g.Pos(i)
		p := dic.Point{X: x, Y: y, Iterations: 3, ZNCC: 0.985, Status: subset.Converged}
		switch {
		case math.Hypot(float64(x)-fixtureCx, float64(y)-fixtureCy) < fixtureR+4:
			p = dic.Point{X: x, Y: y, Status: subset.Masked}
		case k == 5 && x == 100 && y == 56:
			p.Status, p.ZNCC = subset.Lost, 0.41
		default:
			p.P[subset.PU] = 0.3*float64(k) + exx*(float64(x)-fixtureCx)
			p.P[subset.PV] = -0.2*float64(k) + eyy*(float64(y)-fixtureCy)
			p.P[subset.PUx], p.P[subset.PVy] = exx, eyy
		}
		f.Points[i] = p
	}
	return f
}

// writeFixtureRun writes the fixture's run folder in dir: run.json (track,
// strain, resolution, timeline and load sections), the fields and strain
// files (as the strain stage writes them), onset.json, zones.csv and
// zone_cells.csv, overlays/*.png and a speckle pattern assessment with its
// map (a stand-in image).
func writeFixtureRun(t testing.TB, dir string) {
	t.Helper()
	scale := dic.Scale(0.1)
	settings := dic.DefaultSettings()
	settings.Subset, settings.Step = 15, 8
	track := runfolder.TrackRecord{Tool: "spallscope test", Images: "frames", Reference: fixtureNames[0],
		Settings: settings, Grid: fixtureGrid, Frames: fixtureNames, Times: fixtureTimes, MMPerPx: scale,
		Exclude: []string{fmt.Sprintf("circle:%g,%g,%g", fixtureCx, fixtureCy, fixtureR)}}
	for k := range fixtureNames {
		if err := runfolder.WriteField(runfolder.FieldPath(dir, fixtureNames[k]), fixtureField(k), scale); err != nil {
			t.Fatal(err)
		}
	}
	fixtureMust(t, runfolder.SetSection(dir, "track", track))
	// The strain files as the strain stage writes them: from the fields
	// read back, over a 3-point window.
	win := strain.Window{Size: 3}
	for k, name := range fixtureNames {
		f, err := runfolder.ReadField(runfolder.FieldPath(dir, name))
		fixtureMust(t, err)
		f.Index = k
		sf, err := win.Strain(f)
		fixtureMust(t, err)
		fixtureMust(t, strainfile.WriteStrain(strainfile.StrainPath(dir, name), sf, scale))
	}
	vsg := win.VSG(settings.Step, settings.Subset)
	fixtureMust(t, runfolder.SetSection(dir, "strain", strainfile.StrainRecord{Window: 3, Order: 1, Measure: strain.Engineering,
		Step: settings.Step, Subset: settings.Subset, VSG: vsg, VSGmm: scale.MM(float64(vsg)), MMPerPx: scale, Frames: fixtureNames}))
	res := strainfile.ResolutionRecord{
		Resolution:   strain.Resolution{Frames: 2, U: 0.004, V: 0.005, Exx: 60e-6, Eyy: 70e-6, Exy: 40e-6, E1: 65e-6, E2: 62e-6, GammaMax: 75e-6, Eeq: 58e-6},
		StaticFrames: fixtureNames[:2], Subset: 15, Step: 8, Window: 3, VSG: 31, VSGmm: 3.1, UMM: 0.0004,
		Interpolation: "bicubic", ShapeFunction: "affine", Measure: "engineering",
	}
	fixtureMust(t, runfolder.SetSection(dir, "resolution", res))
	tl := strainfile.TimelineRecord{Frames: fixtureNames, Times: fixtureTimes, Stress: fixtureStress,
		InSpan: []bool{true, true, true, true, true, false}}
	fixtureMust(t, runfolder.SetSection(dir, "timeline", tl))
	ld := runfolder.LoadRecord{Path: "load.csv", AreaMM2: 480, Peak: 24, PeakAt: 8}
	for s := 0.0; s <= 9.0001; s += 0.25 {
		ld.Times = append(ld.Times, s)
		ld.Stress = append(ld.Stress, fixtureLoad(s))
	}
	fixtureMust(t, runfolder.SetSection(dir, "load", ld))
	writeFixtureOnsets(t, dir)
	writeFixtureOverlays(t, dir)
	pat := &speckle.Report{Width: 144, Height: 120, Depth: 8, Mean: 121, Contrast: 48, Max: 250, MIG: 21.5, Textured: true,
		CorrelationRadius: 1.6, SpeckleSize: 3.2, Noise: 1.4, NoiseSource: speckle.NoiseGiven, Interpolation: "bicubic",
		Target: 0.01, SmallestSubset: 15, SmallestSubsetText: "15 px", Notes: []string{"fixture note: speckles are small"}}
	fixtureMust(t, os.MkdirAll(filepath.Join(dir, "pattern"), 0o755))
	fixtureMust(t, speckle.WriteJSON(filepath.Join(dir, "pattern", "pattern.json"), pat))
	mapImg, err := os.ReadFile(filepath.Join(dir, OverlaysDir, fixtureNames[0]+".png"))
	fixtureMust(t, err)
	fixtureMust(t, os.WriteFile(filepath.Join(dir, "pattern", "pattern_map.png"), mapImg, 0o644))
}

// fixtureLoad is the load log's stress at time s: linear between the
// frames' stresses (the log ends at 9 s, before the last frame).
func fixtureLoad(s float64) float64 {
	for k := 1; k < len(fixtureTimes); k++ {
		if s <= fixtureTimes[k] {
			a := (s - fixtureTimes[k-1]) / (fixtureTimes[k] - fixtureTimes[k-1])
			return fixtureStress[k-1] + a*(fixtureStress[k]-fixtureStress[k-1])
		}
	}
	return fixtureStress[len(fixtureStress)-1]
}

// fixtureOnsetCount is the number of onsets in the fixture's onset.json;
// fixtureLeftOnset is the frame of the first (back-dated) onset.
const (
	fixtureOnsetCount = 3
	fixtureLeftOnset  = 2
)

// writeFixtureOnsets writes onset.json and the zones behind it. The
// left-sidewall localization was triggered at frame 3 and back-dated to
// frame 2 (interval frames 1 to 3); the right-sidewall localization was
// not back-dated (onset, trigger and a one-frame interval at frame 3); the
// crown decorrelation at frame 5, outside the load log, is a record from
// before back-dating (no trigger, interval or history). Invented numbers,
// for tests only.
func writeFixtureOnsets(t testing.TB, dir string) {
	t.Helper()
	const k, ucs = 0.0, 60.0
	onset := func(sec strain.Sector, class string, ind strain.Indicator, frame, zone int, area, peak, cx, cy float64) strainfile.OnsetRecord {
		o := strainfile.OnsetRecord{OpeningName: "A", Onset: strain.Onset{Opening: 0, Sector: sec, Class: class, Indicator: ind,
			Frame: frame, Name: fixtureNames[frame], Time: fixtureTimes[frame], Stress: fixtureStress[frame],
			Percent: 100 * fixtureStress[frame] / 24, InSpan: frame < 5, Zone: zone, AreaMM2: area, AreaPx2: area / 0.01,
			Peak: peak, Cx: cx, Cy: cy, ByIndicator: map[strain.Indicator]int{ind: frame}, Touches: []int{0}}}
		o.Context, _ = strain.NewContext(sec, o.Stress, k, ucs)
		return o
	}
	dated := func(o strainfile.OnsetRecord, trigger, first, last int, mean, threshold []float64) strainfile.OnsetRecord {
		o.TriggerFrame, o.TriggerName = trigger, fixtureNames[trigger]
		o.Interval = &strain.OnsetInterval{Confidence: 0.95, Method: "fixture", Model: "slope",
			FirstFrame: first, LastFrame: last, First: fixtureNames[first], Last: fixtureNames[last],
			TimeLo: fixtureTimes[first], TimeHi: fixtureTimes[last], StressLo: fixtureStress[first], StressHi: fixtureStress[last], LogLik: 42.5}
		h := &strain.OnsetHistory{}
		for f := range mean {
			h.Frames = append(h.Frames, f)
			h.ZoneMean = append(h.ZoneMean, mean[f])
			h.Threshold = append(h.Threshold, threshold[f])
			h.Signal = append(h.Signal, mean[f]/threshold[0])
		}
		o.History = h
		return o
	}
	left := dated(onset(strain.LeftSidewall, strain.Localization, strain.MaxPrincipal, fixtureLeftOnset, 1, 1.92, 2.1e-3, 48, 60),
		3, 1, 3, []float64{20e-6, 25e-6, 90e-6, 2.1e-3, 3.0e-3, 4.2e-3}, []float64{390e-6, 390e-6, 400e-6, 420e-6, 450e-6, 480e-6})
	// The left sidewall's event grew into the crown, and γmax confirmed a
	// zone of it a frame after e1.
	left.Reached = []strain.Reach{{Opening: 0, Sector: strain.Crown}}
	left.ByIndicator[strain.MaxShear] = 3
	right := dated(onset(strain.RightSidewall, strain.Localization, strain.MaxShear, 3, 2, 1.28, 1.7e-3, 96, 60),
		3, 3, 3, []float64{30e-6, 20e-6, 35e-6, 1.7e-3, 2.2e-3, 2.9e-3}, []float64{480e-6, 480e-6, 490e-6, 500e-6, 520e-6, 540e-6})
	rep := strainfile.OnsetReport{Tool: "spallscope test", Peak: strainfile.PeakRecord{Stress: 24, Time: 8, Frame: fixtureNames[4]},
		Openings: []strainfile.OpeningRecord{{Index: 0, Name: "A"}},
		Onsets: []strainfile.OnsetRecord{
			left, right,
			onset(strain.Crown, strain.Decorrelated, strain.Decorrelation, 5, 3, 0.64, 1, 72, 36),
		},
		Settings: strainfile.ZoneSettings{Indicators: []strain.Indicator{strain.MaxPrincipal, strain.MaxShear, strain.Decorrelation},
			Persistence: 3, CalibrateBelow: 0.2, CalibFrames: 2, K: k, UCS: ucs},
		// Limits as the zones stage defines them: strain = K × noise,
		// opening = strain × VSG (31 px at 0.1 mm/px).
		DetectionLimits: []strainfile.DetectionLimit{
			{Indicator: strain.MaxPrincipal, Noise: 65e-6, K: 6, Strain: 390e-6, VSG: 31, OpeningPx: 390e-6 * 31, OpeningMM: 390e-6 * 31 * 0.1},
			{Indicator: strain.MaxShear, Noise: 80e-6, K: 6, Strain: 480e-6, VSG: 31, OpeningPx: 480e-6 * 31, OpeningMM: 480e-6 * 31 * 0.1},
		},
		Cautions: strainfile.Cautions,
	}
	fixtureMust(t, runfolder.WriteAtomic(filepath.Join(dir, strainfile.OnsetJSON), func(w *bufio.Writer) error {
		return json.NewEncoder(w).Encode(rep)
	}))
	type zrow struct {
		frame, zone int
		sector, ind string
		area, peak  float64
		cells       string
	}
	rows := []zrow{
		{3, 1, "left-sidewall", "e1", 1.92, 2.1e-3, "43;44;57;58"},
		{4, 1, "left-sidewall", "e1", 2.56, 3.0e-3, "43;44;57;58;71"},
		{5, 1, "left-sidewall", "e1", 3.20, 4.2e-3, "43;44;57;58;71;72"},
		{3, 2, "right-sidewall", "gamma_max", 1.28, 1.7e-3, "53;54;67;68"},
		{4, 2, "right-sidewall", "gamma_max", 1.92, 2.2e-3, "53;54;67;68"},
		{5, 2, "right-sidewall", "gamma_max", 2.56, 2.9e-3, "53;54;67;68;81"},
		{5, 3, "crown", "decorrelation", 0.64, 1, "34;35;36;37"},
	}
	fixtureMust(t, runfolder.WriteAtomic(filepath.Join(dir, strainfile.ZonesCSV), func(w *bufio.Writer) error {
		w.WriteString(strainfile.ZonesHeader + "\n")
		for _, z := range rows {
			class := "localization"
			if z.ind == "decorrelation" {
				class = "decorrelation"
			}
			fmt.Fprintf(w, "%s,%.3f,%d,%s,A,%.4g,%.6g,60.0,60.0,%s,%s,%.0f,0.0,false\n",
				fixtureNames[z.frame], fixtureTimes[z.frame], z.zone, z.sector, z.area, z.peak, z.ind, class, z.area/0.01)
		}
		return nil
	}))
	fixtureMust(t, runfolder.WriteAtomic(filepath.Join(dir, strainfile.ZoneCellsCSV), func(w *bufio.Writer) error {
		w.WriteString("frame,zone,indicator,cells\n")
		for _, z := range rows {
			fmt.Fprintf(w, "%s,%d,%s,%s\n", fixtureNames[z.frame], z.zone, z.ind, z.cells)
		}
		return nil
	}))
}

// writeFixtureOverlays writes one small overlay PNG per frame, each a
// different shade with a bar as long as the frame's stress, so frames can
// be told apart by eye and by size.
func writeFixtureOverlays(t testing.TB, dir string) {
	t.Helper()
	fixtureMust(t, os.MkdirAll(filepath.Join(dir, OverlaysDir), 0o755))
	for k, name := range fixtureNames {
		img := image.NewRGBA(image.Rect(0, 0, 144+4*k, 120))
		for y := range 120 {
			for x := range img.Bounds().Dx() {
				c := color.RGBA{uint8(40 + 30*k), 90, 140, 255}
				if y > 100 && x < int(5*fixtureStress[k]) {
					c = color.RGBA{230, 80, 40, 255}
				}
				img.SetRGBA(x, y, c)
			}
		}
		f, err := os.Create(filepath.Join(dir, OverlaysDir, name+".png"))
		fixtureMust(t, err)
		fixtureMust(t, png.Encode(f, img))
		fixtureMust(t, f.Close())
	}
}

func fixtureMust(t testing.TB, err error) {
	t.Helper()
	if err != nil {
		t.Fatal(err)
	}
}
