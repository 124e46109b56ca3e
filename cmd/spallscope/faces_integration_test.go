package main

import (
	"encoding/json"
	"math"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"spallscope/cmd/spallscope/internal/job"
)

// Two faces of one test (the same synthetic photos seen by two cameras
// whose clocks differ: the front camera runs 2 s behind the load log, the
// back one 0 s): each face is analysed on its own, and the combined onsets
// sit on the load log's clock, so the back face's band onset (frame 7 at
// its camera time 7 s = log time 7 s) comes before the front's (log time
// 9 s) and is the first over all faces.
func TestTwoFacesOnOneClock(t *testing.T) {
	cfg := bandTest(t, "faces:\n  - {name: front}\n  - {name: back, clock_offset_s: 0}\n")
	out := filepath.Join(t.TempDir(), "run")
	msg, err := run(t, "run", cfg, "--out", out)
	if err != nil {
		t.Fatal(err)
	}
	for _, f := range []string{"front", "back"} {
		if _, err := os.Stat(filepath.Join(out, job.FacesDir, f, "onset.json")); err != nil {
			t.Errorf("face %s: %v", f, err)
		}
	}
	data, err := os.ReadFile(filepath.Join(out, "faces.json"))
	if err != nil {
		t.Fatal(err)
	}
	var rep job.FacesReport
	json.Unmarshal(data, &rep)
	if rep.First == nil || rep.First.Face != "back" || math.Abs(rep.First.LogTime-7) > 1 {
		t.Fatalf("first onset %+v, want the back face at log time 7 ± 1 s\n%s", rep.First, msg)
	}
	var front *job.FaceOnset
	for i, o := range rep.Onsets {
		if o.Face == "front" && o.Sector == "right-sidewall" {
			front = &rep.Onsets[i]
			break
		}
	}
	if front == nil || math.Abs(front.LogTime-front.Time-2) > 1e-9 {
		t.Errorf("front onset %+v: log time must be camera time + 2 s", front)
	}
	page, _ := os.ReadFile(filepath.Join(out, "report.html"))
	if strings.Count(string(page), "<iframe") != 2 || !strings.Contains(string(page), `id="first"`) {
		t.Error("the faces page lacks the two face reports or the first onset")
	}
}

// A face whose photo folder holds no frames stops the run with an error
// that names the face and the folder, never a silent skip.
func TestFaceWithoutFrames(t *testing.T) {
	cfg := bandTest(t, "faces:\n  - {name: front}\n  - {name: side, images: empty/}\n")
	os.MkdirAll(filepath.Join(filepath.Dir(cfg), "empty"), 0o755)
	_, err := run(t, "run", cfg, "--out", filepath.Join(t.TempDir(), "run"))
	if err == nil || !strings.Contains(err.Error(), "face side") || !strings.Contains(err.Error(), "empty") {
		t.Errorf("error %v, want it to name the face and its folder", err)
	}
}
