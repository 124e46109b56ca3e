package region

import (
	"math"
	"strings"
	"testing"
	"unicode/utf8"

	"spallscope/dic/logtable"
)

// maxShapeErrorRunes bounds a ParseShape error: the shape text, the kind
// and one number, each at most an excerpt (logtable.ExcerptRunes
// characters, quoted: up to 10 bytes a character for \U escapes), and
// the words around them.
const maxShapeErrorRunes = 3*(10*logtable.ExcerptRunes+40) + 200

// FuzzParseShape checks that no text makes ParseShape panic, that an
// error quotes excerpts only (never a long text whole: an earlier version
// echoed all of an unknown kind), and that every shape it accepts
// validates, has a box that is not NaN and in order, and rasterises.
// `go test` runs the seeds; `go test -fuzz FuzzParseShape` explores
// further.
func FuzzParseShape(f *testing.F) {
	for _, s := range []string{
		"rect:0,0,10,10", "circle:100,100,40", "ellipse:50,50,30,10,15", "ellipse:50,50,30,10",
		"polygon:0,0,10,0,10,10,0,10", "polygon:0,0,5,5,2,2,9,9", "RECT: 1, 2, 3, 4",
		"circle:100,100,NaN", "circle:1,2,Inf", "rect:5,5,1,1", "polygon:", "circle:1,2,1e999",
		"blob:1,2,3", "circle", ":", "circle:1e308,1e308,1e308", "polygon:0,0,1e308,0,0,1e308",
		"circle:0x10,0x1p4,1_0", "ellipse:1,2,3,4,5,6", strings.Repeat("x", 500) + ":1",
	} {
		f.Add(s)
	}
	f.Fuzz(func(t *testing.T, s string) {
		shape, err := ParseShape(s)
		if err != nil {
			msg := err.Error()
			if n := utf8.RuneCountInString(msg); n > maxShapeErrorRunes {
				t.Fatalf("error of %d characters for a text of %d bytes: %.200s…", n, len(s), msg)
			}
			if len(s) > 3*logtable.ExcerptRunes && strings.Contains(msg, s) {
				t.Fatalf("error echoes the whole %d-byte text", len(s))
			}
			return
		}
		if err := shape.Validate(); err != nil {
			t.Fatalf("accepted %q, which does not validate: %v", s, err)
		}
		x0, y0, x1, y1 := shape.Bounds()
		if math.IsNaN(x0) || math.IsNaN(y0) || math.IsNaN(x1) || math.IsNaN(y1) || x1 < x0 || y1 < y0 {
			t.Fatalf("accepted %q with the box (%g, %g)–(%g, %g)", s, x0, y0, x1, y1)
		}
		// Excluding it may leave no pixel (a huge shape): that is the one
		// error a valid shape may give.
		_, err = (Layout{Exclude: []Shape{shape}}).Rasterise(16, 16)
		if err != nil && !strings.Contains(err.Error(), "leaves no pixel") {
			t.Fatalf("accepted %q, which does not rasterise: %v", s, err)
		}
	})
}
