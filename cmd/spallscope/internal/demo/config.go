package demo

import (
	"fmt"
	"path"

	"spallscope/cmd/spallscope/internal/config"
	"spallscope/dic/synth"
)

// Config is the demo test's config: two faces against one load log, an
// acoustic-emission record and a model file, with paths relative to the
// demo folder (written with forward slashes, as YAML configs are).
func Config(front, back *synth.Scenario) *config.Test {
	f, b := front.Openings[0], back.Openings[0]
	yes := true
	face := func(name, dir string, sc *synth.Scenario, o synth.Opening) config.Face {
		return config.Face{Name: name, Images: path.Join(dir, "frames"), Scale: config.Scale{MMPerPx: sc.Specimen.MMPerPx},
			Openings: []config.Opening{{Name: "A", Shape: circle(o)}}}
	}
	t := &config.Test{
		Name:  "demo",
		Times: config.Times{FPS: front.FPS},
		Faces: []config.Face{face("front", FrontDir, front, f), face("back", BackDir, back, b)},
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

// circle writes a circular opening in the config's shape syntax.
func circle(o synth.Opening) string { return fmt.Sprintf("circle:%g,%g,%g", o.Cx, o.Cy, o.Rx) }
