package main

import (
	"errors"
	"fmt"
	"io/fs"
	"os"
	"strconv"
	"strings"
	"time"

	"github.com/spf13/cobra"

	"spallscope/cmd/spallscope/internal/progress"
	"spallscope/dic/lens"
	"spallscope/dic/lens/calibrate"
	"spallscope/dic/runfolder"
)

func newCalibrateCmd() *cobra.Command {
	var (
		board, out string
		square     float64
		force      bool
	)
	cmd := &cobra.Command{
		Use:   "calibrate --board COLSxROWS --square MM --out LENS.json IMAGES...",
		Short: "Calibrate the camera's lens from photos of a chessboard target, for track --lens",
		Long: `calibrate measures the camera's lens from photos of a flat, printed chessboard
held at several poses in front of the camera, with the same lens, focus and
resolution as the test photos.

--board is the number of inner corners per row and per column (a board of
10 × 7 squares has 9x6 inner corners); --square is the side of one square in
mm. In each photo the board's corners are found and refined to subpixel
positions (OpenCV findChessboardCorners and cornerSubPix); the camera matrix
(fx, fy, cx, cy) and the Brown–Conrady distortion (radial k1, k2, k3,
tangential p1, p2) are then estimated from all photos together (Zhang's
method, OpenCV calibrateCamera).

The lens file (JSON) holds the image size, the camera matrix, the
coefficients, the reprojection error, each photo's board pose and error,
the frame coverage and the date. Give it to track or run (lens: in the test
config) to take the distortion out of the measured displacements.

Checks printed as warnings:
  - a reprojection error above 0.3 px (blur, a board that is not flat, or a
    wrong --board);
  - photos whose own error is over twice the whole calibration's;
  - coverage: the frame is divided into 5 × 5 cells; each of the four corner
    cells must hold a detected corner of some photo, since the distortion is
    largest there and is only extrapolated where no corner reaches.
All photos must have the size of the first; photos in which no board is
found are listed and left out.`,
		Example: `  spallscope calibrate --board 9x6 --square 20 --out cam1_lens.json cal/*.jpg`,
		Args:    cobra.MinimumNArgs(1),
		RunE: func(cmd *cobra.Command, paths []string) error {
			b, err := parseBoard(board, square)
			if err != nil {
				return err
			}
			if out == "" {
				return errors.New("calibrate: --out LENS.json is required")
			}
			if _, err := os.Stat(out); err == nil && !force {
				return fmt.Errorf("calibrate: %s exists; give another --out, or --force to replace it", out)
			} else if err != nil && !errors.Is(err, fs.ErrNotExist) {
				return fmt.Errorf("calibrate: --out %s: %w", out, err)
			}
			r := reporter(cmd)
			f, err := calibrate.FromPhotos(paths, b, progress.Task(r, "calibrate: corners"))
			r.Wait()
			if err != nil {
				return err
			}
			calibrate.Stamp(f, "spallscope "+version, time.Now())
			if err := runfolder.WriteJSON(out, f); err != nil {
				return err
			}
			printCalibration(cmd, f, out)
			return nil
		},
	}
	fl := cmd.Flags()
	fl.StringVar(&board, "board", "", "inner corners of the chessboard per row and per column, COLSxROWS (e.g. 9x6)")
	fl.Float64Var(&square, "square", 0, "side of one chessboard square in mm")
	fl.StringVar(&out, "out", "", "lens file to write (JSON)")
	fl.BoolVar(&force, "force", false, "replace an existing lens file")
	return cmd
}

// parseBoard reads --board COLSxROWS and --square MM.
func parseBoard(s string, square float64) (lens.Board, error) {
	c, r, ok := strings.Cut(strings.ToLower(strings.TrimSpace(s)), "x")
	cols, err1 := strconv.Atoi(c)
	rows, err2 := strconv.Atoi(r)
	if !ok || err1 != nil || err2 != nil {
		return lens.Board{}, fmt.Errorf("--board %q, expected the inner corners per row and per column as COLSxROWS, such as 9x6", s)
	}
	b := lens.Board{Cols: cols, Rows: rows, SquareMM: square}
	if err := b.Validate(); err != nil {
		return b, fmt.Errorf("--board %s --square %g: %w", s, square, err)
	}
	return b, nil
}

// printCalibration prints the lens, each photo's error and the warnings.
func printCalibration(cmd *cobra.Command, f *lens.File, out string) {
	w := cmd.OutOrStdout()
	m := f.Model()
	fmt.Fprintf(w, "calibrated from %d photos of the %dx%d board: RMS reprojection error %.3f px\n", len(f.Poses), f.Board.Cols, f.Board.Rows, f.RMS)
	fmt.Fprintf(w, "  fx %.2f px  fy %.2f px  cx %.2f px  cy %.2f px\n", m.Fx, m.Fy, m.Cx, m.Cy)
	fmt.Fprintf(w, "  k1 %.6g  k2 %.6g  k3 %.6g  p1 %.6g  p2 %.6g\n", m.K1, m.K2, m.K3, m.P1, m.P2)
	for _, p := range f.Poses {
		fmt.Fprintf(w, "  %s: %.3f px\n", p.Image, p.RMS)
	}
	if len(f.Skipped) > 0 {
		fmt.Fprintf(w, "no board found in %d photos, left out: %s\n", len(f.Skipped), strings.Join(f.Skipped, ", "))
	}
	if c := f.Coverage; c != nil {
		fmt.Fprintf(w, "coverage: %.0f %% of the frame's %d × %d cells hold a corner\n", 100*c.Covered, c.Cells, c.Cells)
	}
	for _, warn := range calibrate.Warnings(f) {
		fmt.Fprintln(w, "WARNING:", warn)
	}
	fmt.Fprintf(w, "lens file: %s\n", out)
}
