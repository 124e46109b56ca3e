package main

import (
	"bytes"
	"path/filepath"
	"strings"
	"testing"

	"github.com/spf13/cobra"

	"spallscope/cmd/spallscope/internal/job"
	"spallscope/dic/runfolder"
	"spallscope/strain"
	"spallscope/strain/strainfile"
)

// The demo's onset table prints each onset's interval, with its stresses,
// and its trigger frame beside the back-dated frame, as the zones
// command's table does.
func TestPrintFacesShowsIntervals(t *testing.T) {
	dir := t.TempDir()
	var on job.FaceOnset
	on.Face, on.Name, on.Stress, on.TriggerFrame = "front", "demo_0015", 11.99, 21
	on.Class, on.Sector, on.Indicator = "localization", "left-sidewall", "gamma_max"
	on.Interval = &strain.OnsetInterval{Confidence: 0.95, FirstFrame: 10, LastFrame: 19, StressLo: 7.1, StressHi: 15.71}
	rep := job.FacesReport{Faces: []string{"front"}, Onsets: []job.FaceOnset{on}, Cautions: strainfile.Cautions}
	if err := runfolder.WriteJSON(filepath.Join(dir, job.FacesFile), rep); err != nil {
		t.Fatal(err)
	}
	var buf bytes.Buffer
	cmd := &cobra.Command{}
	cmd.SetOut(&buf)
	printFaces(cmd, dir)
	got := buf.String()
	for _, want := range []string{"interval", "trigger", "10–19 (95 %)", "11.99 (7.10–15.71)", "  21  "} {
		if !strings.Contains(got, want) {
			t.Errorf("table %q lacks %q", got, want)
		}
	}
}
