package config

import (
	"path/filepath"
	"testing"
)

// The commented example in testdata parses with every key (it is the
// documentation of the format, so it must stay valid).
func TestExampleConfigParses(t *testing.T) {
	c, err := Read(filepath.Join("..", "..", "..", "..", "testdata", "example_test.yaml"))
	if err != nil {
		t.Fatal(err)
	}
	if c.Name != "B-07" || c.Lens != "cam1_lens.json" || c.CompensationPlate != "rect:2640,300,2960,2700" || c.StandoffMM != 520 || len(c.Openings) != 2 || c.Correlation.Subset != 31 || c.Load.AreaMM2 != 11250 || !c.Outputs.WantReport() || c.Outputs.WantVTK() || !c.Outputs.WantVideo() {
		t.Errorf("parsed %+v", c)
	}
}
