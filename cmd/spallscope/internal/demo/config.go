package demo

import (
	"fmt"
	"path"

	"spallscope/cmd/spallscope/internal/config"
	"spallscope/dic/synth"
)

// Config is the demo test's config: two faces against one load log, an
// acoustic-emission record and a model file, with paths relative to the
// demo folder (written with forward slashes, as YAML configs are). The
// openings of a face are named A, B, ... in the scenario's order (left to
// right).
func Config(front, twin *synth.Scenario) *config.Test {
	f := front.Openings[0]
	yes := true
	face := func(name, dir string, sc *synth.Scenario) config.Face {
		fc := config.Face{Name: name, Images: path.Join(dir, "frames"), Scale: config.Scale{MMPerPx: sc.Specimen.MMPerPx}}
		for i, o := range sc.Openings {
			fc.Openings = append(fc.Openings, config.Opening{Name: OpeningName(i), Shape: circle(o)})
		}
		return fc
	}
	t := &config.Test{
		Name:  "demo",
		Times: config.Times{FPS: front.FPS},
		Faces: []config.Face{face(FrontFace, FrontDir, front), face(TwinFace, TwinDir, twin)},
	}
	t.Correlation.Subset, t.Correlation.Step = 21, 8
	t.Strain.Window, t.Strain.StaticFrames = 7, front.Load.StartFrame+1
	t.Zones.K, t.Zones.UCS = K, UCS
	t.Load.File, t.Load.AreaMM2, t.Load.ClockOffset = path.Join(FrontDir, synth.LoadLogCSV), front.Specimen.LoadedArea(), front.Load.ClockOffset
	t.AE.File, t.AE.ClockOffset, t.AE.GapSeconds = path.Join(FrontDir, AEFile), synth.DemoAEOffset, 8
	t.Model = config.Model{File: path.Join(FrontDir, ModelFile), LoadMPa: ModelMPa, Units: "mm", Origin: []float64{f.Cx, f.Cy}, YUp: true, Face: "front"}
	t.Outputs = config.Outputs{Overlays: &yes, Video: &yes, Report: &yes, Field: "gamma_max"}
	return t
}

// OpeningName is the config's name of a face's opening i: A, B, ...
func OpeningName(i int) string {
	if i < 0 {
		return "-"
	}
	return string(rune('A' + i%26))
}

// circle writes a circular opening in the config's shape syntax.
func circle(o synth.Opening) string { return fmt.Sprintf("circle:%g,%g,%g", o.Cx, o.Cy, o.Rx) }
