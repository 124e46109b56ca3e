package calibrate

import (
	"fmt"
	"image"
	"math"
	"unsafe"

	"gocv.io/x/gocv"

	"spallscope/dic/lens"
	"spallscope/subset"
)

// FindCorners finds the inner corners of chessboard b in a photo: found is
// false when the board is not seen whole. Corners come row by row in
// photo pixels (origin at the centre of the top-left pixel), refined to
// subpixel positions by cornerSubPix on the photo's own gray levels with a
// search window of 0.4 of the corner spacing a side, at most 11 px.
func FindCorners(img *subset.Image, b lens.Board) (corners [][2]float64, found bool, err error) {
	if err := b.Validate(); err != nil {
		return nil, false, err
	}
	if img.Width < 16 || img.Height < 16 {
		return nil, false, fmt.Errorf("photo %dx%d px, too small for a board", img.Width, img.Height)
	}
	full := 255.0
	if img.Depth == 16 {
		full = 65535
	}
	gray8 := make([]byte, len(img.Pix))
	gray := make([]float32, len(img.Pix))
	for i, v := range img.Pix {
		g := float64(v) / full * 255
		if !(g >= 0) { // NaN too
			g = 0
		}
		g = math.Min(g, 255)
		gray[i], gray8[i] = float32(g), byte(math.Round(g))
	}
	m8, err := gocv.NewMatFromBytes(img.Height, img.Width, gocv.MatTypeCV8U, gray8)
	if err != nil {
		return nil, false, err
	}
	defer m8.Close()
	pts := gocv.NewMat()
	defer pts.Close()
	if !gocv.FindChessboardCorners(m8, image.Pt(b.Cols, b.Rows), &pts, gocv.CalibCBAdaptiveThresh|gocv.CalibCBNormalizeImage) {
		return nil, false, nil
	}
	rough, err := pointsOf(pts, b.Cols*b.Rows)
	if err != nil {
		return nil, false, err
	}
	half := int(math.Min(11, math.Max(2, math.Round(0.4*spacing(rough, b.Cols)))))
	mf, err := gocv.NewMatFromBytes(img.Height, img.Width, gocv.MatTypeCV32F, unsafe.Slice((*byte)(unsafe.Pointer(&gray[0])), 4*len(gray)))
	if err != nil {
		return nil, false, err
	}
	defer mf.Close()
	gocv.CornerSubPix(mf, &pts, image.Pt(half, half), image.Pt(-1, -1), gocv.NewTermCriteria(gocv.Count|gocv.EPS, 100, 1e-4))
	corners, err = pointsOf(pts, b.Cols*b.Rows)
	return corners, err == nil, err
}

// pointsOf reads n float32 point pairs out of an OpenCV point list.
func pointsOf(m gocv.Mat, n int) ([][2]float64, error) {
	data, err := m.DataPtrFloat32()
	if err != nil {
		return nil, err
	}
	if len(data) != 2*n {
		return nil, fmt.Errorf("corner finder returned %d numbers for %d corners", len(data), n)
	}
	out := make([][2]float64, n)
	for i := range out {
		out[i] = [2]float64{float64(data[2*i]), float64(data[2*i+1])}
	}
	return out, nil
}

// spacing is the smallest distance between neighbouring corners along a
// row or a column, in px.
func spacing(c [][2]float64, cols int) float64 {
	best := math.Inf(1)
	for i := range c {
		if (i+1)%cols != 0 && i+1 < len(c) {
			best = math.Min(best, math.Hypot(c[i+1][0]-c[i][0], c[i+1][1]-c[i][1]))
		}
		if i+cols < len(c) {
			best = math.Min(best, math.Hypot(c[i+cols][0]-c[i][0], c[i+cols][1]-c[i][1]))
		}
	}
	return best
}
