package frames

import (
	"fmt"
	"math"
	"os"
	"path/filepath"
	"slices"
	"strings"
	"testing"

	"gocv.io/x/gocv"

	"spallscope/subset"
)

// writeMJPG writes an n-frame MJPG AVI with OpenCV's VideoWriter and
// returns its path, or skips the test where OpenCV cannot write one.
func writeMJPG(t *testing.T, dir string, n int) string {
	t.Helper()
	path := filepath.Join(dir, "clip.avi")
	vw, err := gocv.VideoWriterFile(path, "MJPG", 10, 64, 48, false)
	if err != nil || !vw.IsOpened() {
		t.Skipf("OpenCV here cannot write MJPG AVI: %v", err)
	}
	for i := 0; i < n; i++ {
		img := subset.NewImage(64, 48, 8)
		for p := range img.Pix {
			img.Pix[p] = float32((p*7 + i*13) % 255) // a texture per frame, so frames differ in size
		}
		m, _ := ToMat(img, 8)
		vw.Write(m)
		m.Close()
	}
	vw.Close()
	return path
}

// A video cut to 60 % of its bytes (its index at the end lost) still
// declares 20 frames in its header but decodes fewer: the sequence holds
// those that decode and Notes says how many were declared and read. Before,
// the sequence was silently shorter.
func TestVideoTruncatedIsNoted(t *testing.T) {
	dir := t.TempDir()
	path := writeMJPG(t, dir, 20)
	seq, err := Open(path)
	if err != nil {
		t.Fatal(err)
	}
	if d, n, ok := VideoFrameCounts(seq); !ok || d != 20 || n != 20 || Notes(seq) != nil {
		t.Errorf("whole video: declared %d, decoded %d, %v, notes %q; want 20, 20, no notes", d, n, ok, Notes(seq))
	}
	seq.Close()

	data, err := os.ReadFile(path)
	if err != nil {
		t.Fatal(err)
	}
	cut := filepath.Join(dir, "cut.avi")
	os.WriteFile(cut, data[:len(data)*6/10], 0o644)
	seq, err = Open(cut)
	if err != nil {
		t.Fatal(err)
	}
	defer seq.Close()
	d, n, ok := VideoFrameCounts(seq)
	if !ok || d != 20 || n >= 20 || n < 1 || seq.Len() != n {
		t.Fatalf("cut video: declared %d, decoded %d (Len %d), %v; want 20 declared and fewer decoded", d, n, seq.Len(), ok)
	}
	notes := Notes(seq)
	if len(notes) != 1 {
		t.Fatalf("cut video: notes %q, want one", notes)
	}
	for _, part := range []string{cut, "declares 20 frames", fmt.Sprintf("only %d decode", n), "truncated or damaged"} {
		if !strings.Contains(notes[0], part) {
			t.Errorf("note %q lacks %q", notes[0], part)
		}
	}
	if _, err := seq.Read(n - 1); err != nil {
		t.Errorf("last decodable frame %d: %v", n-1, err)
	}
}

// The counting rules on their own: what OpenCV reports as a frame count
// (0, −1 or NaN for "unknown") and when a shortfall is noted.
func TestVideoCounting(t *testing.T) {
	for _, c := range []struct {
		reported float64
		want     int
	}{{20, 20}, {19.6, 20}, {0, 0}, {-1, 0}, {math.NaN(), 0}, {math.Inf(1), 0}, {1e12, 0}} {
		if got := declaredCount(c.reported); got != c.want {
			t.Errorf("declaredCount(%g) = %d, want %d", c.reported, got, c.want)
		}
	}
	if s := shortfall("v.avi", 0, 7); s != "" {
		t.Errorf("no declared count: %q, want no note", s)
	}
	if s := shortfall("v.avi", 7, 9); s != "" {
		t.Errorf("more decoded than declared: %q, want no note", s)
	}
	want := "video v.avi: the container declares 20 frames but only 11 decode (frames 11 to 19 are missing: the file is truncated or damaged); the sequence holds the 11 that decode"
	if s := shortfall("v.avi", 20, 11); s != want {
		t.Errorf("shortfall:\n got %q\nwant %q", s, want)
	}
	if _, _, ok := VideoFrameCounts(newFileSequence([]string{"a.png"})); ok || Notes(newFileSequence([]string{"a.png"})) != nil {
		t.Error("an image sequence has no video counts and no notes")
	}
}

// Frames of a video decoded and widened (Decode, Into), in order and
// back to an earlier one, have the levels ReadInto gives.
func TestVideoDecodeMatchesReadInto(t *testing.T) {
	dir := t.TempDir()
	path := writeMJPG(t, dir, 4)
	seq, err := Open(path)
	if err != nil {
		t.Fatal(err)
	}
	defer seq.Close()
	ref, err := Open(path)
	if err != nil {
		t.Fatal(err)
	}
	defer ref.Close()
	for _, k := range []int{0, 1, 3, 2} {
		d, err := Decode(seq, k)
		if err != nil {
			t.Fatal(err)
		}
		img, err := d.Into(nil)
		d.Close()
		if err != nil {
			t.Fatal(err)
		}
		want, err := ref.Read(k)
		if err != nil {
			t.Fatal(err)
		}
		if !img.SameSize(want) || img.Depth != want.Depth || !slices.Equal(img.Pix, want.Pix) {
			t.Errorf("frame %d: decoded %dx%d depth %d, differs from ReadInto's %dx%d depth %d", k, img.Width, img.Height, img.Depth, want.Width, want.Height, want.Depth)
		}
	}
}
