package frames_test

import (
	"os"
	"path/filepath"
	"strings"
	"testing"
	"time"

	"spallscope/dic/frames"
	"spallscope/dic/frames/exiftest"
)

// writeSequence writes one JPEG per tag set into a fresh folder (frames
// f_00, f_01, ...) and opens it.
func writeSequence(t *testing.T, tags ...exiftest.Tags) frames.Sequence {
	t.Helper()
	dir := t.TempDir()
	for i, tg := range tags {
		if err := exiftest.WriteJPEG(filepath.Join(dir, "f_"+string(rune('0'+i/10))+string(rune('0'+i%10))+".jpg"), tg); err != nil {
			t.Fatal(err)
		}
	}
	seq, err := frames.Open(dir)
	if err != nil {
		t.Fatal(err)
	}
	return seq
}

// A JPEG's capture time reads back exactly as written: DateTimeOriginal
// at the clock's zone given by OffsetTimeOriginal, plus the fraction of
// SubSecTimeOriginal (the tags' meaning in EXIF 2.31, CIPA DC-008-2016:
// "2024:03:05 14:07:09", "250", "+01:00" is 13:07:09.25 UTC).
func TestCaptureTimeReadsBack(t *testing.T) {
	path := filepath.Join(t.TempDir(), "a.jpg")
	if err := exiftest.WriteJPEG(path, exiftest.Tags{DateTimeOriginal: "2024:03:05 14:07:09", SubSecTimeOriginal: "250", OffsetTimeOriginal: "+01:00"}); err != nil {
		t.Fatal(err)
	}
	ct, err := frames.ReadCaptureTime(path)
	if err != nil {
		t.Fatal(err)
	}
	want := time.Date(2024, 3, 5, 13, 7, 9, 250_000_000, time.UTC)
	if !ct.Time.Equal(want) || ct.SubSecDigits != 3 || !ct.HasOffset || ct.Resolution() != 1e-3 {
		t.Errorf("read %v (%d subsecond digits, offset %v), want %v", ct.Time, ct.SubSecDigits, ct.HasOffset, want)
	}
	// The same tags in a TIFF's directories (the EXIF block is a TIFF
	// structure of its own).
	block, err := exiftest.Block(exiftest.Tags{DateTimeOriginal: "2024:03:05 14:07:09", SubSecTimeOriginal: "5"})
	if err != nil {
		t.Fatal(err)
	}
	tif := filepath.Join(t.TempDir(), "b.tif")
	os.WriteFile(tif, block, 0o644)
	ct, err = frames.ReadCaptureTime(tif)
	if want := time.Date(2024, 3, 5, 14, 7, 9, 500_000_000, time.UTC); err != nil || !ct.Time.Equal(want) || ct.HasOffset {
		t.Errorf("TIFF: read %v, %v (offset %v), want %v without offset", ct.Time, err, ct.HasOffset, want)
	}
}

// Times are seconds after the first frame, exact to the nanoseconds the
// tags hold; across a change of the clock's offset (a daylight-saving
// change: 02:59:59.5 at +02:00, then 02:00:00.5 at +01:00) the interval
// is the true 1 s, not the clock's −59 min 59 s.
func TestExifTimesAreExact(t *testing.T) {
	seq := writeSequence(t,
		exiftest.Tags{DateTimeOriginal: "2024:10:27 02:59:58", SubSecTimeOriginal: "5", OffsetTimeOriginal: "+02:00"},
		exiftest.Tags{DateTimeOriginal: "2024:10:27 02:59:59", SubSecTimeOriginal: "5", OffsetTimeOriginal: "+02:00"},
		exiftest.Tags{DateTimeOriginal: "2024:10:27 02:00:00", SubSecTimeOriginal: "5", OffsetTimeOriginal: "+01:00"},
		exiftest.Tags{DateTimeOriginal: "2024:10:27 02:00:01", SubSecTimeOriginal: "50", OffsetTimeOriginal: "+01:00"},
	)
	times, notes, err := frames.ExifTimes(seq)
	if err != nil {
		t.Fatal(err)
	}
	want := []float64{0, 1, 2, 3}
	for i := range want {
		if times[i] != want[i] {
			t.Errorf("frame %d: %v s, want %v s exactly", i, times[i], want[i])
		}
	}
	if j := strings.Join(notes, "\n"); strings.Contains(j, "irregular") || strings.Contains(j, "resolution") {
		t.Errorf("notes for a regular sequence with subseconds: %q", notes)
	}
}

// Missing subseconds are noted (1 s resolution), an irregular interval
// is noted with the worst one named, and a repeated or backward time is
// an error naming both frames (the rules of ExifTimes).
func TestExifTimesWarnings(t *testing.T) {
	seq := writeSequence(t,
		exiftest.Tags{DateTimeOriginal: "2024:03:05 14:00:00"},
		exiftest.Tags{DateTimeOriginal: "2024:03:05 14:00:02"},
		exiftest.Tags{DateTimeOriginal: "2024:03:05 14:00:04"},
		exiftest.Tags{DateTimeOriginal: "2024:03:05 14:00:10"},
		exiftest.Tags{DateTimeOriginal: "2024:03:05 14:00:12"},
	)
	times, notes, err := frames.ExifTimes(seq)
	if err != nil {
		t.Fatal(err)
	}
	if times[3] != 10 {
		t.Errorf("frame 3 at %v s, want 10", times[3])
	}
	j := strings.Join(notes, "\n")
	for _, want := range []string{"5 of 5 frames have no SubSecTimeOriginal", "1 s resolution", "interval is irregular", "1 of 4 intervals", "median 2 s", "the largest, 6 s, is between frames 2 and 3"} {
		if !strings.Contains(j, want) {
			t.Errorf("notes %q do not say %q", j, want)
		}
	}
	// Within the 1 s resolution a jitter is no irregularity.
	seq = writeSequence(t,
		exiftest.Tags{DateTimeOriginal: "2024:03:05 14:00:00"},
		exiftest.Tags{DateTimeOriginal: "2024:03:05 14:00:05"},
		exiftest.Tags{DateTimeOriginal: "2024:03:05 14:00:09"},
		exiftest.Tags{DateTimeOriginal: "2024:03:05 14:00:14"},
	)
	if _, notes, _ = frames.ExifTimes(seq); strings.Contains(strings.Join(notes, "\n"), "irregular") {
		t.Errorf("a 5 s ± 1 s interval at 1 s resolution was called irregular: %q", notes)
	}
	for _, tc := range []struct {
		second string
		want   string
	}{{"14:00:00", "taken the same as frame 0"}, {"13:59:59", "taken before frame 0"}} {
		seq = writeSequence(t,
			exiftest.Tags{DateTimeOriginal: "2024:03:05 14:00:00"},
			exiftest.Tags{DateTimeOriginal: "2024:03:05 " + tc.second},
		)
		_, _, err := frames.ExifTimes(seq)
		if err == nil || !strings.Contains(err.Error(), "frame 1 (f_01") || !strings.Contains(err.Error(), tc.want) || !strings.Contains(err.Error(), "f_00") {
			t.Errorf("second frame at %s: error %v, want it to name frames 1 and 0 and say %q", tc.second, err, tc.want)
		}
	}
}

// Photos without the tag, malformed tags and files that are no JPEG or
// TIFF give errors naming the file, never a panic.
func TestExifTimesBadInput(t *testing.T) {
	dir := t.TempDir()
	noDate := filepath.Join(dir, "nodate.jpg")
	if err := exiftest.WriteJPEG(noDate, exiftest.Tags{SubSecTimeOriginal: "5"}); err != nil {
		t.Fatal(err)
	}
	badDate := filepath.Join(dir, "baddate.jpg")
	exiftest.WriteJPEG(badDate, exiftest.Tags{DateTimeOriginal: "yesterday noon"})
	badSub := filepath.Join(dir, "badsub.jpg")
	exiftest.WriteJPEG(badSub, exiftest.Tags{DateTimeOriginal: "2024:03:05 14:00:00", SubSecTimeOriginal: "5a"})
	good, _ := os.ReadFile(badSub)
	truncated := filepath.Join(dir, "truncated.jpg")
	os.WriteFile(truncated, good[:40], 0o644)
	garbage := filepath.Join(dir, "garbage.jpg")
	os.WriteFile(garbage, []byte("not an image at all, just text"), 0o644)
	corrupt := filepath.Join(dir, "corrupt.tif")
	os.WriteFile(corrupt, []byte("II*\x00\xff\xff\xff\x7f and then nothing"), 0o644)
	for path, want := range map[string]string{
		noDate: "no DateTimeOriginal", badDate: "expected YYYY:MM:DD HH:MM:SS", badSub: "expected 1 to 9 decimal digits",
		truncated: "EXIF of " + truncated, garbage: "not a JPEG or TIFF", corrupt: "EXIF of " + corrupt,
	} {
		_, err := frames.ReadCaptureTime(path)
		if err == nil || !strings.Contains(err.Error(), path) || !strings.Contains(err.Error(), want) {
			t.Errorf("%s: error %v, want it to name the file and say %q", filepath.Base(path), err, want)
		}
	}
}
