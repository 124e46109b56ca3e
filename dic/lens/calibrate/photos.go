package calibrate

import (
	"fmt"
	"path/filepath"

	"spallscope/dic/frames"
	"spallscope/dic/lens"
)

// FromPhotos calibrates from chessboard photos: it reads every file's
// header first and refuses one whose size differs from the first's,
// naming it, before any photo is decoded; then it finds the board in each
// (any format frames.ReadImage reads), lists the photos without a board in
// Skipped, and calibrates on the rest (Calibrate). progress, if not nil,
// is called after each photo.
func FromPhotos(paths []string, b lens.Board, progress func(done, total int)) (*lens.File, error) {
	if err := b.Validate(); err != nil {
		return nil, err
	}
	if len(paths) == 0 {
		return nil, fmt.Errorf("no calibration photos given")
	}
	var w, h int
	for i, p := range paths {
		pw, ph, _, err := frames.ImageSize(p)
		switch {
		case err != nil:
			return nil, fmt.Errorf("calibration photo %s: %w", p, err)
		case i == 0:
			w, h = pw, ph
		case pw != w || ph != h:
			return nil, fmt.Errorf("calibration photo %s is %dx%d px, the first (%s) %dx%d px: all photos must come from the same camera at the same resolution",
				p, pw, ph, paths[0], w, h)
		}
	}
	var views []View
	var skipped []string
	for i, p := range paths {
		img, err := frames.ReadImage(p)
		if err != nil {
			return nil, fmt.Errorf("calibration photo %d: %w", i+1, err)
		}
		if img.Width != w || img.Height != h {
			return nil, fmt.Errorf("calibration photo %s decodes to %dx%d px, its header says %dx%d px", p, img.Width, img.Height, w, h)
		}
		corners, found, err := FindCorners(img, b)
		if err != nil {
			return nil, fmt.Errorf("calibration photo %s: %w", p, err)
		}
		if found {
			views = append(views, View{Image: filepath.Base(p), Corners: corners})
		} else {
			skipped = append(skipped, filepath.Base(p))
		}
		if progress != nil {
			progress(i+1, len(paths))
		}
	}
	if len(views) < MinViews {
		return nil, fmt.Errorf("the %dx%d board (inner corners) was found in %d of %d photos, at least %d are needed: check --board counts inner corners (squares minus one per side) and that the whole board, with a white margin, is in each photo",
			b.Cols, b.Rows, len(views), len(paths), MinViews)
	}
	f, err := Calibrate(b, w, h, views)
	if err != nil {
		return nil, err
	}
	f.Skipped = skipped
	return f, nil
}
