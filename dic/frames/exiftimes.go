package frames

import (
	"errors"
	"fmt"
	"math"
	"slices"
	"strings"
)

// IrregularFraction is how far an interval between photos may stray from
// the sequence's median interval, as a fraction of it, before ExifTimes
// calls the camera's interval irregular (a rule of our own; no source).
const IrregularFraction = 0.1

// ExifTimes returns each frame's capture time from its EXIF tags, in
// seconds after the first frame's, with notes for the user:
//
//   - frames without SubSecTimeOriginal: their times have 1 s resolution;
//   - frames without OffsetTimeOriginal: clock readings are compared as
//     they are (a clock change between photos would go unseen);
//   - an irregular interval: intervals that differ from the median by
//     more than IrregularFraction of it and more than the times'
//     resolution, with the worst one named.
//
// A frame whose time repeats or goes back is an error naming both frames
// and their tags. So is a video (its frames have no EXIF) and a photo
// without a readable DateTimeOriginal.
func ExifTimes(seq Sequence) (times []float64, notes []string, err error) {
	fs, ok := seq.(*fileSequence)
	if !ok {
		return nil, nil, errors.New("frame times from EXIF need image files, not a video")
	}
	cts := make([]CaptureTime, len(fs.paths))
	for i, p := range fs.paths {
		if cts[i], err = ReadCaptureTime(p); err != nil {
			return nil, nil, fmt.Errorf("frame times: frame %d: %w", i, err)
		}
	}
	return captureSeconds(fs.names, cts)
}

// captureSeconds applies ExifTimes' rules to the capture times of the
// named frames.
func captureSeconds(names []string, cts []CaptureTime) ([]float64, []string, error) {
	var notes []string
	times := make([]float64, len(cts))
	var noSub, noOffset []string
	for i, c := range cts {
		times[i] = c.Time.Sub(cts[0].Time).Seconds()
		if c.SubSecDigits == 0 {
			noSub = append(noSub, names[i])
		}
		if !c.HasOffset {
			noOffset = append(noOffset, names[i])
		}
		if i > 0 && !(times[i] > times[i-1]) {
			how, hint := "the same as", ""
			if times[i] < times[i-1] {
				how = "before"
			}
			if c.SubSecDigits == 0 || cts[i-1].SubSecDigits == 0 {
				hint = " (without SubSecTimeOriginal the camera records whole seconds: at more than one photo a second, give the frame rate or a times CSV instead)"
			}
			return nil, nil, fmt.Errorf("frame times from EXIF: frame %d (%s, %s) was taken %s frame %d (%s, %s); expected times that increase along the sequence%s",
				i, names[i], c.Tags, how, i-1, names[i-1], cts[i-1].Tags, hint)
		}
	}
	if len(cts) > 0 {
		notes = append(notes, fmt.Sprintf("frame times from EXIF: the first frame was taken %s", cts[0].Time.Format("2006-01-02 15:04:05.999999999 -07:00")))
	}
	if len(noSub) > 0 {
		notes = append(notes, fmt.Sprintf("frame times from EXIF: %d of %d frames have no SubSecTimeOriginal (%s): their times have 1 s resolution", len(noSub), len(cts), listOf(noSub)))
	}
	if len(noOffset) > 0 && len(noOffset) < len(cts) {
		notes = append(notes, fmt.Sprintf("frame times from EXIF: %d of %d frames have no OffsetTimeOriginal (%s) while others have: their clock readings are taken as UTC", len(noOffset), len(cts), listOf(noOffset)))
	}
	if n := irregular(times, cts); n != "" {
		notes = append(notes, n)
	}
	return times, notes, nil
}

// irregular describes the intervals that stray from the median one, or
// returns "".
func irregular(times []float64, cts []CaptureTime) string {
	if len(times) < 3 {
		return ""
	}
	iv := make([]float64, len(times)-1)
	for i := range iv {
		iv[i] = times[i+1] - times[i]
	}
	sorted := slices.Clone(iv)
	slices.Sort(sorted)
	med := sorted[len(sorted)/2]
	if len(sorted)%2 == 0 {
		med = (sorted[len(sorted)/2-1] + sorted[len(sorted)/2]) / 2
	}
	count, worst, at := 0, 0.0, 0
	for i, d := range iv {
		res := math.Max(cts[i].Resolution(), cts[i+1].Resolution())
		dev := math.Abs(d - med)
		if dev > IrregularFraction*med && dev > res {
			count++
			if dev > worst {
				worst, at = dev, i
			}
		}
	}
	if count == 0 {
		return ""
	}
	return fmt.Sprintf("frame times from EXIF: the camera's interval is irregular: %d of %d intervals differ from the median %.4g s by more than %.0f %%; the largest, %.4g s, is between frames %d and %d",
		count, len(iv), med, 100*IrregularFraction, iv[at], at, at+1)
}

// listOf names up to five items, then how many more.
func listOf(names []string) string {
	if len(names) <= 5 {
		return strings.Join(names, ", ")
	}
	return fmt.Sprintf("%s and %d more", strings.Join(names[:5], ", "), len(names)-5)
}
