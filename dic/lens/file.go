package lens

import (
	"bytes"
	"encoding/json"
	"errors"
	"fmt"
	"math"
	"os"
)

// FileKind marks a lens file; a file of another kind is refused.
const FileKind = "spallscope lens file, version 1"

// File is a lens file: what `spallscope calibrate` writes and `track
// --lens` reads. Its layout is the project's own.
type File struct {
	Kind string `json:"kind"`
	// ImageSize is the photos' width and height in px.
	ImageSize [2]int `json:"image_size_px"`
	// CameraMatrix is [[fx, 0, cx], [0, fy, cy], [0, 0, 1]] in px.
	CameraMatrix [3][3]float64 `json:"camera_matrix_px"`
	Distortion   Distortion    `json:"distortion"`
	// RMS is the root-mean-square reprojection error of the calibration
	// over every corner of every pose, in px.
	RMS      float64   `json:"rms_px"`
	Board    Board     `json:"board"`
	Coverage *Coverage `json:"coverage,omitempty"`
	// Poses are the calibration photos whose board was found, with the
	// board's pose and the photo's own reprojection error.
	Poses []PoseRecord `json:"poses"`
	// Skipped lists the photos in which no board was found.
	Skipped []string `json:"skipped,omitempty"`
	// Calibrated is when the calibration ran (RFC 3339, UTC).
	Calibrated string `json:"calibrated"`
	// Tool is the program and version that calibrated.
	Tool string `json:"tool,omitempty"`
}

// Distortion holds the Brown–Conrady coefficients.
type Distortion struct {
	K1 float64 `json:"k1"`
	K2 float64 `json:"k2"`
	K3 float64 `json:"k3"`
	P1 float64 `json:"p1"`
	P2 float64 `json:"p2"`
}

// Board is a chessboard target: its inner corners per row and per column,
// and the side of one square in mm.
type Board struct {
	Cols     int     `json:"cols"`
	Rows     int     `json:"rows"`
	SquareMM float64 `json:"square_mm"`
}

// Corners returns the board's inner corners in mm on the board's plane,
// row by row (the order in which OpenCV's corner finder returns them).
func (b Board) Corners() [][2]float64 {
	pts := make([][2]float64, 0, b.Cols*b.Rows)
	for r := 0; r < b.Rows; r++ {
		for c := 0; c < b.Cols; c++ {
			pts = append(pts, [2]float64{float64(c) * b.SquareMM, float64(r) * b.SquareMM})
		}
	}
	return pts
}

// Validate reports a board that cannot be calibrated with.
func (b Board) Validate() error {
	if b.Cols < 3 || b.Rows < 3 || b.Cols > 100 || b.Rows > 100 {
		return fmt.Errorf("board %dx%d inner corners, expected 3 to 100 per side", b.Cols, b.Rows)
	}
	if !(b.SquareMM > 0) || math.IsInf(b.SquareMM, 0) {
		return fmt.Errorf("square size %g mm, expected a positive number of mm", b.SquareMM)
	}
	return nil
}

// Coverage says how much of the frame the detected corners of all poses
// reach (see package calibrate for how it is measured).
type Coverage struct {
	// Cells is the number of cells per side the frame is divided into.
	Cells int `json:"cells_per_side"`
	// Covered is the fraction of the cells that hold a detected corner.
	Covered float64 `json:"covered_fraction"`
	// EmptyCorners names the frame's corner cells that hold none
	// (top-left, top-right, bottom-left, bottom-right).
	EmptyCorners []string `json:"empty_corner_cells,omitempty"`
}

// PoseRecord is one calibration photo's pose.
type PoseRecord struct {
	Image string `json:"image"`
	Pose
	// RMS is this photo's reprojection error in px.
	RMS float64 `json:"rms_px"`
}

// FileOf returns the lens file of model m.
func FileOf(m Model) File {
	return File{Kind: FileKind, ImageSize: [2]int{m.Width, m.Height},
		CameraMatrix: [3][3]float64{{m.Fx, 0, m.Cx}, {0, m.Fy, m.Cy}, {0, 0, 1}},
		Distortion:   Distortion{K1: m.K1, K2: m.K2, K3: m.K3, P1: m.P1, P2: m.P2}}
}

// Model returns the lens model the file holds.
func (f *File) Model() Model {
	k, d := f.CameraMatrix, f.Distortion
	return Model{Width: f.ImageSize[0], Height: f.ImageSize[1], Fx: k[0][0], Fy: k[1][1], Cx: k[0][2], Cy: k[1][2],
		K1: d.K1, K2: d.K2, K3: d.K3, P1: d.P1, P2: d.P2}
}

// ReadFile reads and checks a lens file. Errors name the file and say
// what was expected: a JSON object of this kind with every key known, a
// camera matrix without skew whose last row is 0 0 1, and a model that
// inverts over the frame (Model.Validate).
func ReadFile(path string) (*File, error) {
	data, err := os.ReadFile(path)
	if err != nil {
		return nil, fmt.Errorf("lens file: %w", err)
	}
	var f File
	dec := json.NewDecoder(bytes.NewReader(data))
	dec.DisallowUnknownFields()
	if err := dec.Decode(&f); err != nil {
		var se *json.SyntaxError
		if errors.As(err, &se) {
			line := bytes.Count(data[:min(int(se.Offset), len(data))], []byte("\n")) + 1
			return nil, fmt.Errorf("lens file %s line %d: %v (expected the JSON that spallscope calibrate writes)", path, line, se)
		}
		return nil, fmt.Errorf("lens file %s: %w (expected the JSON that spallscope calibrate writes)", path, err)
	}
	if f.Kind != FileKind {
		return nil, fmt.Errorf("lens file %s: kind %q, expected %q (a file written by spallscope calibrate)", path, f.Kind, FileKind)
	}
	k := f.CameraMatrix
	if k[0][1] != 0 || k[1][0] != 0 || k[2] != [3]float64{0, 0, 1} {
		return nil, fmt.Errorf("lens file %s: camera_matrix_px %v, expected [[fx, 0, cx], [0, fy, cy], [0, 0, 1]]", path, k)
	}
	m := f.Model()
	if err := m.Validate(); err != nil {
		return nil, fmt.Errorf("lens file %s: %w", path, err)
	}
	return &f, nil
}

// Read reads the lens model of a lens file.
func Read(path string) (Model, error) {
	f, err := ReadFile(path)
	if err != nil {
		return Model{}, err
	}
	return f.Model(), nil
}
