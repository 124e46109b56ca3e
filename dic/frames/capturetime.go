package frames

import (
	"bytes"
	"encoding/binary"
	"errors"
	"fmt"
	"io"
	"os"
	"strconv"
	"strings"
	"time"

	exif "github.com/dsoprea/go-exif/v3"
	exifcommon "github.com/dsoprea/go-exif/v3/common"
)

// CaptureTime is when a photo was taken, from its EXIF tags
// DateTimeOriginal, SubSecTimeOriginal and OffsetTimeOriginal (EXIF 2.31,
// CIPA DC-008; the tags are read with github.com/dsoprea/go-exif).
type CaptureTime struct {
	// Time is the capture time. Without an offset tag the camera's clock
	// reading is taken as UTC: differences between photos are right as
	// long as the clock did not change zone in between.
	Time time.Time
	// SubSecDigits is the number of digits of SubSecTimeOriginal (0: the
	// tag is missing and Time has 1 s resolution).
	SubSecDigits int
	// HasOffset reports an OffsetTimeOriginal tag.
	HasOffset bool
	// Tags are the three tags as written, for messages.
	Tags string
}

// Resolution is the step of the capture time in s: 1 without subseconds,
// 10^−digits with them.
func (c CaptureTime) Resolution() float64 {
	r := 1.0
	for i := 0; i < c.SubSecDigits; i++ {
		r /= 10
	}
	return r
}

// exifDateLayout is the layout of DateTimeOriginal ("YYYY:MM:DD HH:MM:SS").
const exifDateLayout = "2006:01:02 15:04:05"

// jpegSegmentLimit bounds how far into a JPEG the EXIF segment is looked
// for: APP1 comes right after the start of image in every camera file.
const jpegSegmentLimit = 1 << 20

// ReadCaptureTime reads a photo's capture time from its EXIF tags. JPEG
// and TIFF files are read; only the EXIF segment of a JPEG and the tag
// directories of a TIFF are read, not the pixels. Errors name the file
// and say what is missing or malformed.
func ReadCaptureTime(path string) (ct CaptureTime, err error) {
	defer func() { // the EXIF library reports some malformed data by panicking
		if r := recover(); r != nil {
			err = fmt.Errorf("EXIF of %s: malformed tags (%v)", path, r)
		}
	}()
	f, err := os.Open(path)
	if err != nil {
		return ct, fmt.Errorf("EXIF: %w", err)
	}
	defer f.Close()
	var head [8]byte
	if _, err := io.ReadFull(f, head[:]); err != nil {
		return ct, fmt.Errorf("EXIF of %s: %w (expected a JPEG or TIFF photo)", path, err)
	}
	var tiff io.ReadSeeker
	switch {
	case head[0] == 0xFF && head[1] == 0xD8:
		seg, err := jpegExif(f)
		if err != nil {
			return ct, fmt.Errorf("EXIF of %s: %w", path, err)
		}
		tiff = bytes.NewReader(seg)
	case bytes.Equal(head[:4], []byte("II*\x00")) || bytes.Equal(head[:4], []byte("MM\x00*")):
		if _, err := f.Seek(0, io.SeekStart); err != nil {
			return ct, fmt.Errorf("EXIF of %s: %w", path, err)
		}
		tiff = f
	default:
		return ct, fmt.Errorf("EXIF of %s: not a JPEG or TIFF file (EXIF capture times are read from JPEG and TIFF photos)", path)
	}
	tags, err := exifTimeTags(tiff)
	if err != nil {
		return ct, fmt.Errorf("EXIF of %s: %w", path, err)
	}
	return parseCaptureTime(path, tags)
}

// jpegExif returns the TIFF structure of a JPEG's APP1 "Exif" segment,
// reading segment headers from just after the start-of-image marker.
func jpegExif(r io.ReadSeeker) ([]byte, error) {
	if _, err := r.Seek(2, io.SeekStart); err != nil {
		return nil, err
	}
	pos := int64(2)
	for pos < jpegSegmentLimit {
		var m [4]byte
		if _, err := io.ReadFull(r, m[:2]); err != nil {
			return nil, fmt.Errorf("no EXIF segment before the end of the file")
		}
		if m[0] != 0xFF {
			return nil, fmt.Errorf("malformed JPEG: byte %#x where a marker was expected at offset %d", m[0], pos)
		}
		pos += 2
		switch marker := m[1]; {
		case marker == 0xFF: // fill byte
			r.Seek(-1, io.SeekCurrent)
			pos--
			continue
		case marker == 0x01 || (marker >= 0xD0 && marker <= 0xD7):
			continue // markers without a length
		case marker == 0xDA || marker == 0xD9:
			return nil, errors.New("no EXIF segment (DateTimeOriginal is needed: was the photo saved without its metadata?)")
		}
		if _, err := io.ReadFull(r, m[2:4]); err != nil {
			return nil, fmt.Errorf("malformed JPEG: truncated segment at offset %d", pos)
		}
		n := int64(binary.BigEndian.Uint16(m[2:4])) - 2
		if n < 0 {
			return nil, fmt.Errorf("malformed JPEG: segment length %d at offset %d", n+2, pos)
		}
		if m[1] == 0xE1 && n >= 6 {
			seg := make([]byte, n)
			if _, err := io.ReadFull(r, seg); err != nil {
				return nil, fmt.Errorf("malformed JPEG: truncated APP1 segment at offset %d", pos)
			}
			if bytes.HasPrefix(seg, []byte("Exif\x00\x00")) {
				return seg[6:], nil
			}
		} else if _, err := r.Seek(n, io.SeekCurrent); err != nil {
			return nil, err
		}
		pos += 2 + n
	}
	return nil, errors.New("no EXIF segment in the first MB of the file")
}

// exifTimeTags reads the capture-time tags of the EXIF sub-directory of a
// TIFF structure.
func exifTimeTags(tiff io.ReadSeeker) (map[string]string, error) {
	var head [exif.ExifSignatureLength]byte
	if _, err := io.ReadFull(tiff, head[:]); err != nil {
		return nil, errors.New("truncated EXIF header")
	}
	eh, err := exif.ParseExifHeader(head[:])
	if err != nil {
		return nil, fmt.Errorf("malformed EXIF header: %v", err)
	}
	im, err := exifcommon.NewIfdMappingWithStandard()
	if err != nil {
		return nil, err
	}
	tags := map[string]string{}
	visit := func(ite *exif.IfdTagEntry) error {
		if ite.IfdPath() != exifcommon.IfdExifStandardIfdIdentity.UnindexedString() {
			return nil
		}
		switch name := ite.TagName(); name {
		case "DateTimeOriginal", "SubSecTimeOriginal", "OffsetTimeOriginal":
			v, err := ite.Value()
			if err != nil {
				return fmt.Errorf("tag %s: %v", name, err)
			}
			s, ok := v.(string)
			if !ok {
				return fmt.Errorf("tag %s holds %T, expected text", name, v)
			}
			tags[name] = strings.TrimSpace(strings.TrimRight(s, "\x00"))
		}
		return nil
	}
	ie := exif.NewIfdEnumerate(im, exif.NewTagIndex(), exif.NewExifReadSeeker(tiff), eh.ByteOrder)
	if _, err := ie.Scan(exifcommon.IfdStandardIfdIdentity, eh.FirstIfdOffset, visit, nil); err != nil {
		return nil, fmt.Errorf("reading the EXIF tags: %v (a truncated or malformed file)", err)
	}
	return tags, nil
}

// parseCaptureTime turns the three tags into a capture time.
func parseCaptureTime(path string, tags map[string]string) (CaptureTime, error) {
	var ct CaptureTime
	date, ok := tags["DateTimeOriginal"]
	if !ok || date == "" {
		return ct, fmt.Errorf("EXIF of %s: no DateTimeOriginal tag (the capture time); give times as a frame rate or a CSV instead", path)
	}
	ct.Tags = "DateTimeOriginal " + strconv.Quote(date)
	zone := time.UTC
	if off, ok := tags["OffsetTimeOriginal"]; ok && off != "" {
		ct.Tags += ", OffsetTimeOriginal " + strconv.Quote(off)
		z, err := time.Parse("-07:00", off)
		if err != nil {
			return ct, fmt.Errorf("EXIF of %s: OffsetTimeOriginal %q, expected ±HH:MM", path, off)
		}
		_, secs := z.Zone()
		zone, ct.HasOffset = time.FixedZone(off, secs), true
	}
	t, err := time.ParseInLocation(exifDateLayout, date, zone)
	if err != nil {
		return ct, fmt.Errorf("EXIF of %s: DateTimeOriginal %q, expected YYYY:MM:DD HH:MM:SS", path, date)
	}
	if sub, ok := tags["SubSecTimeOriginal"]; ok && sub != "" {
		ct.Tags += ", SubSecTimeOriginal " + strconv.Quote(sub)
		n, err := strconv.ParseUint(sub, 10, 64)
		if err != nil || len(sub) > 9 {
			return ct, fmt.Errorf("EXIF of %s: SubSecTimeOriginal %q, expected 1 to 9 decimal digits (the fraction of the second)", path, sub)
		}
		ns := int64(n)
		for i := len(sub); i < 9; i++ {
			ns *= 10
		}
		t = t.Add(time.Duration(ns))
		ct.SubSecDigits = len(sub)
	}
	ct.Time = t
	return ct, nil
}
