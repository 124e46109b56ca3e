package demo

import (
	"fmt"
	"os"
	"path/filepath"
	"reflect"

	"spallscope/cmd/spallscope/internal/config"
	"spallscope/dic/runfolder"
	"spallscope/dic/synth"
)

// Demo is a demo folder made ready to run: its scenarios, the faces'
// truth and its test config.
type Demo struct {
	Dir         string
	Front, Twin *synth.Scenario
	Truth       *synth.Truth // the front face's
	TwinTruth   *synth.Truth
	Config      string // the test config file
	// Notes say what was reused.
	Notes []string
}

// Prepare renders the demo's two faces into dir (unless complete ones
// with the same scenario and rendering model are there already), writes
// the AE hits, the model file and the test config, and returns the demo.
// render gives the progress reporter of a face's rendering.
func Prepare(dir string, render func(face string) func(done, total int)) (*Demo, error) {
	d := &Demo{Dir: dir, Front: synth.DemoBlock(), Twin: synth.DemoTwin()}
	front := filepath.Join(dir, FrontDir)
	var err error
	if d.Truth, err = d.renderFace(d.Front, front, render); err != nil {
		return nil, err
	}
	if d.TwinTruth, err = d.renderFace(d.Twin, filepath.Join(dir, TwinDir), render); err != nil {
		return nil, err
	}
	if err := synth.WriteDemoAE(filepath.Join(front, AEFile), d.Front); err != nil {
		return nil, err
	}
	k := *d.Front.Fields[0].Kirsch
	k.Stress = ModelMPa
	if err := synth.WriteKirschModel(filepath.Join(front, ModelFile), k, d.Front.Specimen.MMPerPx, 48, 1); err != nil {
		return nil, err
	}
	data, err := config.Marshal(Config(d.Front, d.Twin))
	if err != nil {
		return nil, err
	}
	head := []byte("# spallscope demo test: a synthetic mortar-analogue block (our own invention)\n")
	d.Config = filepath.Join(dir, ConfigFile)
	if err := os.WriteFile(d.Config, append(head, data...), 0o644); err != nil {
		return nil, err
	}
	return d, nil
}

// renderFace writes a synthetic face into dir unless a complete one with
// the same scenario and rendering model is there already.
func (d *Demo) renderFace(sc *synth.Scenario, dir string, render func(string) func(int, int)) (*synth.Truth, error) {
	truth, err := synth.ReadTruth(filepath.Join(dir, synth.TruthFile))
	if err == nil && truth.Generator == synth.Generator && reflect.DeepEqual(truth.Scenario, *sc) {
		d.Notes = append(d.Notes, fmt.Sprintf("reusing the synthetic face in %s", dir))
		return truth, nil
	}
	var progress func(int, int)
	if render != nil {
		progress = render(sc.Name)
	}
	return synth.Write(sc, dir, progress)
}

// Check holds the front face's measured displacements against the exact
// field at the last frame before damage.
type Check struct {
	Frame    string  // the frame compared
	Stress   float64 // its nominal stress, MPa
	Accuracy synth.Accuracy
	Track    runfolder.TrackRecord // the face's tracking: grid and settings
}

// CheckFront compares the front face's field in run folder faceDir with
// the exact field at the last frame before damage.
func (d *Demo) CheckFront(faceDir string) (*Check, error) {
	check := d.Front.Fields[1].StartFrame
	f, err := runfolder.ReadField(runfolder.FieldPath(faceDir, d.Front.FrameName(check)))
	if err != nil {
		return nil, err
	}
	c := &Check{Frame: d.Truth.Frames[check].Name, Stress: d.Truth.Frames[check].Stress, Accuracy: d.Front.Compare(f, check)}
	if err := runfolder.Section(faceDir, "track", &c.Track); err != nil {
		return nil, err
	}
	return c, nil
}
