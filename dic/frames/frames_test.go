package frames

import (
	"fmt"
	"image"
	"image/color"
	"image/png"
	"math"
	"os"
	"path/filepath"
	"slices"
	"strings"
	"testing"
	"time"
	"unsafe"

	"gocv.io/x/gocv"
	"golang.org/x/image/bmp"
	"golang.org/x/image/tiff"

	"spallscope/subset"
)

func TestNaturalLess(t *testing.T) {
	// Expected order: numeric runs compare by value (common practice for
	// camera file names, no source).
	want := []string{"f_1.tif", "f_2.tif", "f_02.tif", "f_10.tif", "f_10b.tif", "f_100.tif", "g_1.tif"}
	got := []string{"f_100.tif", "g_1.tif", "f_10b.tif", "f_2.tif", "f_10.tif", "f_1.tif", "f_02.tif"}
	SortNatural(got)
	if strings.Join(got, " ") != strings.Join(want, " ") {
		t.Fatalf("natural order\n got %v\nwant %v", got, want)
	}
	if !NaturalLess("img_99999999999999999999", "img_100000000000000000000") {
		t.Error("digit runs longer than int64 must still compare by value")
	}
}

func writePNG(t *testing.T, path string, m image.Image) {
	t.Helper()
	f, err := os.Create(path)
	if err != nil {
		t.Fatal(err)
	}
	if err := png.Encode(f, m); err != nil {
		t.Fatal(err)
	}
	f.Close()
}

func gray16(w, h int, level func(x, y int) uint16) *image.Gray16 {
	m := image.NewGray16(image.Rect(0, 0, w, h))
	for y := 0; y < h; y++ {
		for x := 0; x < w; x++ {
			m.SetGray16(x, y, color.Gray16{Y: level(x, y)})
		}
	}
	return m
}

// The 16-bit files are encoded by Go's image/png and x/image/tiff, encoders
// independent of OpenCV; every level must come back unchanged.
func TestRead16BitKeepsDepth(t *testing.T) {
	dir := t.TempDir()
	level := func(x, y int) uint16 { return uint16(x*1031 + y*4099 + 7) }
	src := gray16(37, 23, level)
	writePNG(t, filepath.Join(dir, "a.png"), src)
	tf, _ := os.Create(filepath.Join(dir, "a.tif"))
	if err := tiff.Encode(tf, src, nil); err != nil {
		t.Fatal(err)
	}
	tf.Close()
	for _, name := range []string{"a.png", "a.tif"} {
		img, err := ReadImage(filepath.Join(dir, name))
		if err != nil {
			t.Fatal(err)
		}
		if img.Depth != 16 || img.Width != 37 || img.Height != 23 {
			t.Fatalf("%s: depth %d size %dx%d, want 16-bit 37x23", name, img.Depth, img.Width, img.Height)
		}
		for y := 0; y < 23; y++ {
			for x := 0; x < 37; x++ {
				if got, want := img.At(x, y), float32(level(x, y)); got != want {
					t.Fatalf("%s pixel (%d,%d) = %v, want %v", name, x, y, got, want)
				}
			}
		}
	}
}

// Colour is reduced to gray with the ITU-R BT.601 luma weights
// 0.299 R + 0.587 G + 0.114 B (the weights OpenCV documents for BGR2GRAY).
func TestReadColourToGray(t *testing.T) {
	dir := t.TempDir()
	m := image.NewRGBA(image.Rect(0, 0, 4, 1))
	cols := []color.RGBA{{255, 0, 0, 255}, {0, 255, 0, 255}, {0, 0, 255, 255}, {200, 100, 50, 255}}
	for i, c := range cols {
		m.SetRGBA(i, 0, c)
	}
	path := filepath.Join(dir, "c.bmp")
	f, _ := os.Create(path)
	if err := bmp.Encode(f, m); err != nil {
		t.Fatal(err)
	}
	f.Close()
	img, err := ReadImage(path)
	if err != nil {
		t.Fatal(err)
	}
	for i, c := range cols {
		want := 0.299*float64(c.R) + 0.587*float64(c.G) + 0.114*float64(c.B)
		if got := float64(img.At(i, 0)); math.Abs(got-want) > 1 { // 8-bit rounding: ±1 level
			t.Errorf("pixel %d: gray %v, want %.2f ± 1", i, got, want)
		}
	}
	if img.Depth != 8 {
		t.Errorf("depth %d, want 8", img.Depth)
	}
}

func TestWriteImageRoundTrip(t *testing.T) {
	dir := t.TempDir()
	img := subset.NewImage(9, 5, 16)
	for i := range img.Pix {
		img.Pix[i] = float32(i*977) + 0.4
	}
	img.Pix[0] = -5  // clamps to 0
	img.Pix[1] = 1e6 // clamps to 65535
	for _, name := range []string{"w.png", "w.tif"} {
		p := filepath.Join(dir, name)
		if err := WriteImage(p, img, 16); err != nil {
			t.Fatal(err)
		}
		back, err := ReadImage(p)
		if err != nil {
			t.Fatal(err)
		}
		for i, v := range img.Pix {
			want := float32(clampRound(v, 65535))
			if back.Pix[i] != want {
				t.Fatalf("%s pixel %d = %v, want %v", name, i, back.Pix[i], want)
			}
		}
	}
	if matches, _ := filepath.Glob(filepath.Join(dir, "*.partial*")); len(matches) != 0 {
		t.Errorf("temporary files left behind: %v", matches)
	}
}

func TestSequenceSourcesAndErrors(t *testing.T) {
	dir := t.TempDir()
	for _, n := range []string{"s_10", "s_2", "s_1"} {
		writePNG(t, filepath.Join(dir, n+".png"), gray16(8, 6, func(x, y int) uint16 { return uint16(x + y) }))
	}
	os.WriteFile(filepath.Join(dir, "notes.txt"), []byte("not an image"), 0o644)
	for _, spec := range []string{dir, filepath.Join(dir, "s_*.png")} {
		seq, err := Open(spec)
		if err != nil {
			t.Fatal(err)
		}
		if seq.Len() != 3 || seq.Name(0) != "s_1" || seq.Name(1) != "s_2" || seq.Name(2) != "s_10" {
			t.Errorf("%s: frames %d %q %q %q, want s_1 s_2 s_10", spec, seq.Len(), seq.Name(0), seq.Name(1), seq.Name(2))
		}
	}
	list := filepath.Join(dir, "order.lst")
	os.WriteFile(list, []byte("# my order\ns_10.png\n\ns_1.png\n"), 0o644)
	seq, err := Open(list)
	if err != nil || seq.Len() != 2 || seq.Name(0) != "s_10" {
		t.Fatalf("list file: %v %v", seq, err)
	}

	// A glob that matches nothing shows the pattern.
	pat := filepath.Join(dir, "cam9_*.tif")
	if _, err := Open(pat); err == nil || !strings.Contains(err.Error(), pat) {
		t.Errorf("empty glob: error %v should show the pattern", err)
	}
	// A missing file named in a list gives the line.
	os.WriteFile(list, []byte("s_1.png\nmissing.png\n"), 0o644)
	if _, err := Open(list); err == nil || !strings.Contains(err.Error(), "line 2") {
		t.Errorf("list with missing file: %v should name line 2", err)
	}

	// A corrupt file: error names the file and the frame index; no panic.
	good, _ := os.ReadFile(filepath.Join(dir, "s_2.png"))
	os.WriteFile(filepath.Join(dir, "s_2.png"), good[:len(good)/3], 0o644)
	seq, _ = Open(dir)
	_, err = seq.Read(1)
	if err == nil || !strings.Contains(err.Error(), "frame 1") || !strings.Contains(err.Error(), "s_2.png") {
		t.Errorf("corrupt file: error %v should name frame 1 and s_2.png", err)
	}
	os.WriteFile(filepath.Join(dir, "s_2.png"), good, 0o644)

	// A frame of another size than the reference.
	writePNG(t, filepath.Join(dir, "s_3.png"), gray16(9, 6, func(x, y int) uint16 { return 0 }))
	seq, _ = Open(dir)
	seq.ExpectSize(8, 6)
	if _, err := seq.Read(0); err != nil {
		t.Fatal(err)
	}
	_, err = seq.Read(2)
	if err == nil || !strings.Contains(err.Error(), "frame 2") || !strings.Contains(err.Error(), "9x6") || !strings.Contains(err.Error(), "8x6") {
		t.Errorf("size mismatch: error %v should name frame 2, 9x6 and 8x6", err)
	}
}

func TestVideoSequence(t *testing.T) {
	dir := t.TempDir()
	path := filepath.Join(dir, "clip.avi")
	const n, w, h = 7, 64, 48
	vw, err := gocv.VideoWriterFile(path, "MJPG", 10, w, h, false)
	if err != nil || !vw.IsOpened() {
		t.Skipf("OpenCV here cannot write MJPG AVI: %v", err)
	}
	for i := 0; i < n; i++ {
		img := subset.NewImage(w, h, 8)
		for p := range img.Pix {
			img.Pix[p] = float32(20 + 30*i) // flat level that identifies the frame
		}
		m, _ := ToMat(img, 8)
		vw.Write(m)
		m.Close()
	}
	vw.Close()
	seq, err := Open(path)
	if err != nil {
		t.Fatal(err)
	}
	defer seq.Close()
	if seq.Len() != n || seq.Name(3) != "0003" {
		t.Fatalf("video: %d frames name %q, want %d and 0003", seq.Len(), seq.Name(3), n)
	}
	if fps, ok := VideoFPS(seq); !ok || math.Abs(fps-10) > 0.01 {
		t.Errorf("video fps %v %v, want 10", fps, ok)
	}
	// Read out of order: forward skip, then backwards (reopen).
	for _, i := range []int{4, 1, 6, 0} {
		img, err := seq.Read(i)
		if err != nil {
			t.Fatal(err)
		}
		want := float32(20 + 30*i)
		if got := img.At(w/2, h/2); math.Abs(float64(got-want)) > 3 { // MJPG is lossy: ±3 levels
			t.Errorf("frame %d level %v, want %v ± 3", i, got, want)
		}
	}
	if _, err := seq.Read(n); err == nil {
		t.Error("reading past the end must fail")
	}
}

func TestFrameTimes(t *testing.T) {
	dir := t.TempDir()
	for _, n := range []string{"a_1", "a_2", "a_3"} {
		writePNG(t, filepath.Join(dir, n+".png"), gray16(4, 4, func(x, y int) uint16 { return 0 }))
	}
	seq, _ := Open(dir)
	tr, err := FixedRate(3, 4, 10)
	if err != nil || tr[2] != 10.5 {
		t.Errorf("fixed rate: %v %v, want last 10.5 s", tr, err)
	}
	csvPath := filepath.Join(dir, "times.csv")
	os.WriteFile(csvPath, []byte("# camera log\nframe,time_s\na_1,0\n1,0.5\na_3,1.25\n"), 0o644)
	times, err := ReadTimes(csvPath, seq)
	if err != nil || times[0] != 0 || times[1] != 0.5 || times[2] != 1.25 {
		t.Fatalf("times CSV: %v %v", times, err)
	}
	os.WriteFile(csvPath, []byte("frame,time_s\na_1,0\na_2,zero\na_3,1\n"), 0o644)
	if _, err := ReadTimes(csvPath, seq); err == nil || !strings.Contains(err.Error(), "line 3") {
		t.Errorf("bad cell: %v should name line 3", err)
	}
	os.WriteFile(csvPath, []byte("frame,time_s\na_1,0\na_2,2\na_3,1\n"), 0o644)
	if _, err := ReadTimes(csvPath, seq); err == nil || !strings.Contains(err.Error(), "a_3") {
		t.Errorf("decreasing time: %v should name a_3", err)
	}
	os.WriteFile(csvPath, []byte("frame,time_s\na_1,0\na_3,1\n"), 0o644)
	if _, err := ReadTimes(csvPath, seq); err == nil || !strings.Contains(err.Error(), "a_2") {
		t.Errorf("missing frame: %v should name a_2", err)
	}
	base := time.Date(2024, 5, 6, 7, 8, 9, 0, time.UTC)
	for i, n := range []string{"a_1", "a_2", "a_3"} {
		at := base.Add(time.Duration(i) * 1500 * time.Millisecond)
		os.Chtimes(filepath.Join(dir, n+".png"), at, at)
	}
	mt, err := ModTimes(seq)
	if err != nil || len(mt) != 3 || mt[0] != 0 || mt[1] != 1.5 || mt[2] != 3 {
		t.Errorf("mod times: %v %v, want 0 1.5 3", mt, err)
	}
}

// Careless time lists: non-finite rates and starts, non-finite or huge
// cells, repeated and backward times. Each is refused with the line or
// option and what was expected; before, an infinite rate gave every frame
// the start time, and NaN, repeated times and equal file times passed.
func TestFrameTimesRefused(t *testing.T) {
	for _, c := range []struct {
		n          int
		fps, start float64
		want       string
	}{
		{3, math.Inf(1), 0, "frame rate +Inf, expected a finite positive number of frames per second"},
		{3, math.NaN(), 0, "frame rate NaN"},
		{3, -2, 0, "frame rate -2"},
		{3, 0, 0, "frame rate 0"},
		{3, 4, math.NaN(), "start NaN s, expected a finite number of seconds"},
		{3, 4, math.Inf(-1), "start -Inf s"},
		{-1, 4, 0, "-1 frames, expected zero or more"},
		{3, 1e9, 1e9, "frames 0 and 1 get the same time 1e+09 s"},
	} {
		_, err := FixedRate(c.n, c.fps, c.start)
		if err == nil || !strings.Contains(err.Error(), c.want) {
			t.Errorf("FixedRate(%d, %g, %g): error %v, want %q", c.n, c.fps, c.start, err, c.want)
		}
	}
	if _, err := FixedRate(3, 1e-308, 1e308); err == nil || !strings.Contains(err.Error(), "frames 0 and 1") {
		t.Errorf("FixedRate past float64's range: error %v, want frames 0 and 1 named", err)
	}

	dir := t.TempDir()
	for _, n := range []string{"a_1", "a_2", "a_3"} {
		writePNG(t, filepath.Join(dir, n+".png"), gray16(4, 4, func(x, y int) uint16 { return 0 }))
	}
	seq, _ := Open(dir)
	csvPath := filepath.Join(dir, "times.csv")
	huge := strings.Repeat("7", 100_000)
	for _, c := range []struct {
		name, text string
		want       []string
	}{
		{"nan", "frame,time_s\na_1,0\na_2,NaN\na_3,1\n", []string{"line 3", "frame a_2", `"NaN" is not a finite number`}},
		{"inf", "frame,time_s\na_1,-Inf\na_2,0\na_3,1\n", []string{"line 2", "frame a_1", `"-Inf" is not a finite number`}},
		{"overflow", "frame,time_s\na_1,0\na_2,1e400\na_3,1\n", []string{"line 3", "out of range"}},
		{"repeat", "frame,time_s\na_1,0\na_2,0.5\na_3,0.5\n", []string{"line 4", "frame 2 (a_3) is 0.5 s, the same as the previous frame's 0.5 s (a_2, line 3)"}},
		{"backwards", "# log\nframe,time_s\na_3,1\na_1,0\na_2,2\n", []string{"line 3", "frame 2 (a_3) is 1 s, before the previous frame's 2 s (a_2, line 5)"}},
		{"twice", "frame,time_s\na_1,0\na_2,1\n1,2\n", []string{"line 4", "a_2 listed twice (first on line 3)"}},
		{"huge frame", "frame,time_s\n" + huge + ",0\n", []string{"line 2", `"` + strings.Repeat("7", 60) + `"… (100000 bytes) is neither`}},
		{"huge time", "frame,time_s\na_1," + huge + "x\n", []string{"line 2", "(100001 bytes) is not a number"}},
		{"long line", "frame,time_s\na_1," + strings.Repeat("1", 2<<20) + "\n", []string{"line 2 is longer than 1048576 bytes"}},
	} {
		os.WriteFile(csvPath, []byte(c.text), 0o644)
		_, err := ReadTimes(csvPath, seq)
		if err == nil {
			t.Errorf("%s: accepted", c.name)
			continue
		}
		for _, w := range append(c.want, csvPath) {
			if !strings.Contains(err.Error(), w) {
				t.Errorf("%s: error %q lacks %q", c.name, err, w)
			}
		}
		if len(err.Error()) > 400 {
			t.Errorf("%s: error of %d bytes, want an excerpt", c.name, len(err.Error()))
		}
	}

	// File times: equal (a copy that did not keep them) or backwards.
	at := time.Date(2024, 5, 6, 7, 8, 9, 0, time.UTC)
	for _, n := range []string{"a_1", "a_2", "a_3"} {
		os.Chtimes(filepath.Join(dir, n+".png"), at, at)
	}
	if _, err := ModTimes(seq); err == nil || !strings.Contains(err.Error(), "a_2.png is not modified after") || !strings.Contains(err.Error(), "a_1.png") {
		t.Errorf("equal file times: error %v, want a_2 and a_1 named", err)
	}
	os.Chtimes(filepath.Join(dir, "a_2.png"), at.Add(time.Second), at.Add(time.Second))
	if _, err := ModTimes(seq); err == nil || !strings.Contains(err.Error(), "a_3.png is not modified after") || !strings.Contains(err.Error(), "(-1.000 s)") {
		t.Errorf("backward file times: error %v, want a_3 named, 1 s back", err)
	}
}

// A sequence read into one image fills that image's storage frame after
// frame, with every level as Go's image/png encoded it (an encoder
// independent of OpenCV): 8-bit and 16-bit frames, and a 32-bit float
// Mat through FromMatInto. A frame of another size gets a new image.
func TestReadIntoReusesStorage(t *testing.T) {
	dir := t.TempDir()
	level8 := func(k int) func(x, y int) uint8 { return func(x, y int) uint8 { return uint8(x*7 + y*13 + k*29) } }
	for k := range 3 {
		m := image.NewGray(image.Rect(0, 0, 31, 17))
		for y := 0; y < 17; y++ {
			for x := 0; x < 31; x++ {
				m.SetGray(x, y, color.Gray{Y: level8(k)(x, y)})
			}
		}
		writePNG(t, filepath.Join(dir, fmt.Sprintf("f%d.png", k)), m)
	}
	seq, err := Open(dir)
	if err != nil {
		t.Fatal(err)
	}
	var img *subset.Image
	var first *float32
	for k := range 3 {
		if img, err = seq.ReadInto(k, img); err != nil {
			t.Fatal(err)
		}
		if k == 0 {
			first = &img.Pix[0]
		} else if &img.Pix[0] != first {
			t.Fatalf("frame %d: decoded into new storage, want the image passed in", k)
		}
		for y := 0; y < 17; y++ {
			for x := 0; x < 31; x++ {
				if got, want := img.At(x, y), float32(level8(k)(x, y)); got != want {
					t.Fatalf("frame %d pixel (%d,%d) = %v, want %v", k, x, y, got, want)
				}
			}
		}
		if img.Depth != 8 {
			t.Fatalf("frame %d: depth %d, want 8", k, img.Depth)
		}
	}

	level16 := func(x, y int) uint16 { return uint16(x*1031 + y*4099 + 7) }
	path := filepath.Join(dir, "g.png")
	writePNG(t, path, gray16(31, 17, level16))
	back, err := ReadImageInto(path, img)
	if err != nil {
		t.Fatal(err)
	}
	if back != img || back.Depth != 16 || back.At(30, 16) != float32(level16(30, 16)) {
		t.Errorf("16-bit frame into the 8-bit frame's image: same image %v, depth %d, last pixel %v, want true, 16, %v",
			back == img, back.Depth, back.At(30, 16), level16(30, 16))
	}
	small := filepath.Join(dir, "s.png")
	writePNG(t, small, gray16(5, 4, level16))
	if back, err = ReadImageInto(small, img); err != nil || back == img || back.Width != 5 || back.At(4, 3) != float32(level16(4, 3)) {
		t.Errorf("5x4 frame into a 31x17 image: error %v, same image %v, want a new 5x4 image", err, back == img)
	}

	f := subset.NewImage(6, 2, 0)
	for i := range f.Pix {
		f.Pix[i] = float32(i)*0.37 - 1
	}
	mat, err := gocv.NewMatFromBytes(2, 6, gocv.MatTypeCV32F, unsafe.Slice((*byte)(unsafe.Pointer(&f.Pix[0])), 4*len(f.Pix)))
	if err != nil {
		t.Fatal(err)
	}
	defer mat.Close()
	dst := subset.NewImage(6, 2, 8)
	got, err := FromMatInto(mat, dst)
	if err != nil || got != dst || got.Depth != 0 || !slices.Equal(got.Pix, f.Pix) {
		t.Errorf("float Mat into a 6x2 image: error %v, same image %v, depth %d, levels %v, want %v", err, got == dst, got.Depth, got.Pix, f.Pix)
	}
}
