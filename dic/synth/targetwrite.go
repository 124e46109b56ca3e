package synth

import (
	"fmt"
	"os"
	"path/filepath"

	"spallscope/dic/frames"
	"spallscope/dic/lens"
	"spallscope/dic/runfolder"
)

// Layout of a sequence folder's calibration targets.
const (
	TargetsDir    = "targets"
	LensTruthFile = "lens_truth.json"
)

// TargetTruth is one chessboard photo and the board's exact pose in it.
type TargetTruth struct {
	File string    `json:"file"`
	Pose lens.Pose `json:"pose"`
}

// writeTargets renders the scenario's chessboard photos into
// dir/targets and writes the true lens as a lens file (lens_truth.json,
// with the poses and no reprojection error: the lens calibrate should
// find).
func writeTargets(sc *Scenario, dir string) ([]TargetTruth, error) {
	m := *sc.LensModel()
	t := sc.Targets
	if err := os.MkdirAll(filepath.Join(dir, TargetsDir), 0o755); err != nil {
		return nil, err
	}
	f := lens.FileOf(m)
	f.Board = t.Board
	var out []TargetTruth
	for k, p := range TargetPoses(m, t.Board, t.Poses) {
		img, err := RenderTarget(m, t.Board, p, sc.Camera, sc.Frames+k)
		if err != nil {
			return nil, fmt.Errorf("target %d: %w", k, err)
		}
		tt := TargetTruth{File: filepath.Join(TargetsDir, fmt.Sprintf("target_%02d.png", k)), Pose: p}
		if err := frames.WriteImage(filepath.Join(dir, tt.File), img, sc.Camera.withDefaults().Depth); err != nil {
			return nil, err
		}
		out = append(out, tt)
		f.Poses = append(f.Poses, lens.PoseRecord{Image: filepath.Base(tt.File), Pose: p})
	}
	f.Calibrated, f.Tool = "", Generator
	return out, runfolder.WriteJSON(filepath.Join(dir, LensTruthFile), f)
}
