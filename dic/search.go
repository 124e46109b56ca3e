package dic

import (
	"fmt"
	"unsafe"

	"gocv.io/x/gocv"

	"spallscope/subset"
)

// Match is the result of an integer-pixel search: the displacement of the
// best match and its ZNCC.
type Match struct {
	U, V int
	ZNCC float64
}

// SearchInteger finds the integer displacement of the (2r+1)² subset
// centred on reference pixel (x, y) within ±radius px of the guess
// (gu, gv), by the ZNCC over all candidate positions. The whole search
// window is correlated in one OpenCV matchTemplate call
// (TM_CCOEFF_NORMED, which is the ZNCC); the window is clipped to the
// image. It is the initial guess for seed points, good for rigid jumps as
// large as the radius.
func SearchInteger(ref, def *subset.Image, x, y, r int, gu, gv, radius int) (Match, error) {
	if x-r < 0 || y-r < 0 || x+r >= ref.Width || y+r >= ref.Height {
		return Match{}, fmt.Errorf("search: subset at (%d,%d) with half-size %d leaves the reference", x, y, r)
	}
	// Candidate centres in the deformed image, clipped so every candidate
	// subset lies inside it.
	cx0, cy0 := max(x+gu-radius, r), max(y+gv-radius, r)
	cx1, cy1 := min(x+gu+radius, def.Width-1-r), min(y+gv+radius, def.Height-1-r)
	if cx1 < cx0 || cy1 < cy0 {
		return Match{}, fmt.Errorf("search: window around (%d,%d) lies outside the deformed image", x+gu, y+gv)
	}
	templ, err := matOf(ref, x-r, y-r, 2*r+1, 2*r+1)
	if err != nil {
		return Match{}, err
	}
	defer templ.Close()
	win, err := matOf(def, cx0-r, cy0-r, cx1-cx0+2*r+1, cy1-cy0+2*r+1)
	if err != nil {
		return Match{}, err
	}
	defer win.Close()
	res := gocv.NewMat()
	defer res.Close()
	noMask := gocv.NewMat()
	defer noMask.Close()
	gocv.MatchTemplate(win, templ, &res, gocv.TmCcoeffNormed, noMask)
	_, maxVal, _, maxLoc := gocv.MinMaxLoc(res)
	return Match{U: cx0 + maxLoc.X - x, V: cy0 + maxLoc.Y - y, ZNCC: float64(maxVal)}, nil
}

// matOf copies a w×h window of img at (x0, y0) into a float32 Mat.
func matOf(img *subset.Image, x0, y0, w, h int) (gocv.Mat, error) {
	buf := make([]float32, w*h)
	for j := 0; j < h; j++ {
		copy(buf[j*w:(j+1)*w], img.Pix[(y0+j)*img.Width+x0:(y0+j)*img.Width+x0+w])
	}
	bytes := unsafe.Slice((*byte)(unsafe.Pointer(&buf[0])), 4*len(buf))
	m, err := gocv.NewMatFromBytes(h, w, gocv.MatTypeCV32F, bytes)
	if err != nil {
		return gocv.Mat{}, fmt.Errorf("search: %w", err)
	}
	return m, nil
}
