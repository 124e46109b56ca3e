package job

import (
	"fmt"
	"strconv"

	"spallscope/cmd/spallscope/internal/config"
	"spallscope/dic/frames"
	"spallscope/dic/region"
	"spallscope/subset"
)

// photos are a test's opened photos: the sequence, the reference image and
// its index (−1 for a separate file), and the measured-pixel mask. Width
// and Height are the reference's size, kept when Ref and Mask are let go
// (release).
type photos struct {
	Seq           frames.Sequence
	Ref           *subset.Image
	RefIndex      int
	Mask          *region.Mask
	Width, Height int
}

// release lets go of the reference and the mask, which only tracking
// needs: at 20 MP they are 100 MB that the later stages would otherwise
// hold beside their own (the outputs stage reads the reference again).
func (in *photos) release() {
	in.Ref, in.Mask = nil, nil
}

// Open opens the photo sequence images and the reference (a frame index,
// an image file, or "" for frame 0), and rasterises the region of interest
// roi (a shape, or "" for the whole image), the excluded shapes and the
// mask image (nonzero = measured) into one mask.
func openPhotos(images, reference, roi string, exclude []string, maskFile string) (*photos, error) {
	if images == "" {
		return nil, fmt.Errorf("no images given (a folder, glob, list file or video)")
	}
	seq, err := frames.Open(images)
	if err != nil {
		return nil, err
	}
	in := &photos{Seq: seq}
	fail := func(err error) (*photos, error) {
		seq.Close()
		return nil, err
	}
	if n, err := strconv.Atoi(reference); err == nil || reference == "" {
		if n < 0 || n >= seq.Len() {
			return fail(fmt.Errorf("reference %d: the sequence has frames 0..%d", n, seq.Len()-1))
		}
		in.RefIndex = n
		if in.Ref, err = seq.Read(n); err != nil {
			return fail(fmt.Errorf("reference: %w", err))
		}
	} else {
		if in.Ref, err = frames.ReadImage(reference); err != nil {
			return fail(fmt.Errorf("reference: %w", err))
		}
		in.RefIndex = -1
	}
	in.Width, in.Height = in.Ref.Width, in.Ref.Height
	seq.ExpectSize(in.Ref.Width, in.Ref.Height)
	var layout region.Layout
	if roi != "" {
		shape, err := config.ParseROI(roi)
		if err != nil {
			return fail(err)
		}
		x0, y0, x1, y1 := shape.Bounds()
		if x1 < 0 || y1 < 0 || x0 > float64(in.Ref.Width-1) || y0 > float64(in.Ref.Height-1) {
			return fail(fmt.Errorf("roi %q lies outside the %dx%d reference", roi, in.Ref.Width, in.Ref.Height))
		}
		layout.ROI = []region.Shape{shape}
	}
	for _, e := range exclude {
		shape, err := region.ParseShape(e)
		if err != nil {
			return fail(fmt.Errorf("exclude: %w", err))
		}
		layout.Exclude = append(layout.Exclude, shape)
	}
	if in.Mask, err = layout.Rasterise(in.Ref.Width, in.Ref.Height); err != nil {
		return fail(err)
	}
	if maskFile != "" {
		img, err := frames.ReadImage(maskFile)
		if err != nil {
			return fail(fmt.Errorf("mask: %w", err))
		}
		if in.Mask, err = in.Mask.Intersect(region.FromImage(img.Width, img.Height, img.Pix)); err != nil {
			return fail(fmt.Errorf("mask %s: %w", maskFile, err))
		}
	}
	return in, nil
}

// Times returns the frame times from one rule of section t: a CSV
// (resolved by resolve), a fixed rate, file modification times, EXIF
// capture times, or (none given) a video's own rate; nil if unknown.
// notes are what the user should know of the times (EXIF's warnings).
func Times(seq frames.Sequence, t config.Times, resolve func(string) string) (times []float64, notes []string, err error) {
	n := 0
	for _, set := range []bool{t.CSV != "", t.FPS != 0, t.MTime, t.EXIF} {
		if set {
			n++
		}
	}
	switch {
	case n > 1:
		return nil, nil, fmt.Errorf("frame times: give one of a times CSV, a frame rate, file times and EXIF times")
	case t.FPS < 0:
		return nil, nil, fmt.Errorf("frame rate %g, expected a positive number of frames per second", t.FPS)
	case t.CSV != "":
		times, err = frames.ReadTimes(resolve(t.CSV), seq)
	case t.FPS > 0:
		times, err = frames.FixedRate(seq.Len(), t.FPS, 0)
	case t.MTime:
		times, err = frames.ModTimes(seq)
	case t.EXIF:
		return frames.ExifTimes(seq)
	default:
		if r, ok := frames.VideoFPS(seq); ok {
			times, err = frames.FixedRate(seq.Len(), r, 0)
		}
	}
	return times, nil, err
}
