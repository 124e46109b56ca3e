package render

import (
	"image"
	"image/color"
	"sync"

	"golang.org/x/image/font"
	"golang.org/x/image/font/gofont/gobold"
	"golang.org/x/image/font/gofont/goregular"
	"golang.org/x/image/font/opentype"
	"golang.org/x/image/math/fixed"
)

// The overlay's lettering is the Go font family (Bigelow & Holmes, BSD
// licence, shipped with golang.org/x/image): antialiased, with the Greek
// and micro signs that strain labels need (OpenCV's Hershey fonts are ASCII
// only).
var annotateFonts = sync.OnceValues(func() ([2]*opentype.Font, error) {
	var fs [2]*opentype.Font
	var err error
	if fs[0], err = opentype.Parse(goregular.TTF); err != nil {
		return fs, err
	}
	fs[1], err = opentype.Parse(gobold.TTF)
	return fs, err
})

// annotateFace returns a face of the Go font, px pixels high (em size);
// faces are not safe for concurrent use, so each drawing makes its own.
func annotateFace(px float64, bold bool) (font.Face, error) {
	fs, err := annotateFonts()
	if err != nil {
		return nil, err
	}
	f := fs[0]
	if bold {
		f = fs[1]
	}
	return opentype.NewFace(f, &opentype.FaceOptions{Size: px, DPI: 72, Hinting: font.HintingFull})
}

// annotateText draws s with its baseline's left end at (x, y).
func annotateText(dst *image.RGBA, face font.Face, x, y int, c color.RGBA, s string) {
	d := font.Drawer{Dst: dst, Src: image.NewUniform(c), Face: face, Dot: fixed.P(x, y)}
	d.DrawString(s)
}

// annotateWidth is the advance width of s in px.
func annotateWidth(face font.Face, s string) int { return font.MeasureString(face, s).Ceil() }

// annotateFit shortens s with an ellipsis until it fits in width px.
func annotateFit(face font.Face, s string, width int) string {
	if annotateWidth(face, s) <= width {
		return s
	}
	r := []rune(s)
	for len(r) > 1 {
		r = r[:len(r)-1]
		if t := string(r) + "…"; annotateWidth(face, t) <= width {
			return t
		}
	}
	return s
}
