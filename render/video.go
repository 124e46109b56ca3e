package render

import (
	"fmt"
	"image/color"
	"os"
	"path/filepath"
	"strings"

	"gocv.io/x/gocv"

	"spallscope/subset"
)

// Video formats: MP4 with the MPEG-4 Part 2 encoder (fourcc mp4v) or AVI
// with Motion JPEG (MJPG), both written by OpenCV's VideoWriter.
const (
	VideoMP4 = "mp4"
	VideoAVI = "avi"
)

// VideoFile is the name of a run folder's video in format (VideoMP4 or
// VideoAVI).
func VideoFile(format string) string { return "video." + format }

// DefaultFPS is the default frame rate of rendered videos.
const DefaultFPS = 10

// DefaultVideoWidth is the default width of a run's video frames in px:
// overlays of larger photos are scaled down to it (OpenCV's area
// resampling). A 20 MP overlay is over 6,000 px wide, which an MPEG-4
// Part 2 video of the photo's own size makes slow to encode and that many
// players refuse; the PNGs keep every pixel.
const DefaultVideoWidth = 1920

// VideoWriter writes a sequence of equally sized BGR frames to a video file.
// It writes to a temporary name and renames on Close, so a video file that
// exists is complete.
type VideoWriter struct {
	w             *gocv.VideoWriter
	path, tmp     string
	format        string
	width, height int // frame size given
	padW, padH    int // encoded size (even)
	// Note says why the format differs from the one asked for (empty when
	// it does not).
	Note string
}

// CreateVideo opens a video for frames of width×height px at fps frames per
// second. path's extension is replaced by the format's. Format VideoMP4
// falls back to VideoAVI, with a Note, when this machine's OpenCV cannot
// open the mp4v encoder. Odd sizes are padded to even ones with white (many
// players and encoders need even sizes).
func CreateVideo(path, format string, fps float64, width, height int) (*VideoWriter, error) {
	if !(fps > 0) {
		return nil, fmt.Errorf("video %s: %g frames per second, expected a positive rate", path, fps)
	}
	if width <= 0 || height <= 0 {
		return nil, fmt.Errorf("video %s: frame size %dx%d", path, width, height)
	}
	if format == "" {
		format = VideoMP4
	}
	if format != VideoMP4 && format != VideoAVI {
		return nil, fmt.Errorf("video %s: format %q, expected %s or %s", path, format, VideoMP4, VideoAVI)
	}
	v := &VideoWriter{width: width, height: height, padW: width + width%2, padH: height + height%2}
	base := strings.TrimSuffix(path, filepath.Ext(path))
	open := func(format, fourcc string) bool {
		v.format, v.path, v.tmp = format, base+"."+format, base+".partial."+format
		w, err := gocv.VideoWriterFile(v.tmp, fourcc, fps, v.padW, v.padH, true)
		if err == nil && w.IsOpened() {
			v.w = w
			return true
		}
		if w != nil {
			w.Close()
		}
		os.Remove(v.tmp)
		return false
	}
	if format == VideoMP4 {
		if open(VideoMP4, "mp4v") {
			return v, nil
		}
		v.Note = "this OpenCV cannot write MP4 (mp4v); wrote AVI (Motion JPEG) instead"
	}
	if open(VideoAVI, "MJPG") {
		return v, nil
	}
	return nil, fmt.Errorf("video %s: OpenCV could not open a %s writer (mp4v or MJPG) for %dx%d frames; check the folder exists and OpenCV's video support",
		path, format, v.padW, v.padH)
}

// Path is the file the video is written to (after Close).
func (v *VideoWriter) Path() string { return v.path }

// Format is the format written (VideoMP4 or VideoAVI).
func (v *VideoWriter) Format() string { return v.format }

// Write appends frame (BGR, the size given at creation); name names it in
// errors.
func (v *VideoWriter) Write(frame gocv.Mat, name string) error {
	if frame.Cols() != v.width || frame.Rows() != v.height || frame.Channels() != 3 {
		return fmt.Errorf("video %s: frame %s is %dx%d with %d channels, expected %dx%d BGR",
			v.path, name, frame.Cols(), frame.Rows(), frame.Channels(), v.width, v.height)
	}
	out := frame
	if v.padW != v.width || v.padH != v.height {
		out = gocv.NewMat()
		defer out.Close()
		gocv.CopyMakeBorder(frame, &out, 0, v.padH-v.height, 0, v.padW-v.width, gocv.BorderConstant, color.RGBA{255, 255, 255, 255})
	}
	if err := v.w.Write(out); err != nil {
		return fmt.Errorf("video %s: frame %s: %w", v.path, name, err)
	}
	return nil
}

// Close finishes the file and gives it its name.
func (v *VideoWriter) Close() error {
	if err := v.w.Close(); err != nil {
		os.Remove(v.tmp)
		return fmt.Errorf("video %s: %w", v.path, err)
	}
	if err := os.Rename(v.tmp, v.path); err != nil {
		os.Remove(v.tmp)
		return fmt.Errorf("video %s: %w", v.path, err)
	}
	return nil
}

// Abort closes the writer and removes the partial file.
func (v *VideoWriter) Abort() {
	v.w.Close()
	os.Remove(v.tmp)
}

// SideBySide returns the raw frame (gray, as recorded) to the left of an
// overlay canvas, both at the top, on white: the photo as taken beside
// what was measured on it.
func SideBySide(raw *subset.Image, overlay gocv.Mat) (gocv.Mat, error) {
	g, err := gocv.NewMatFromBytes(raw.Height, raw.Width, gocv.MatTypeCV8U, photoGray(raw))
	if err != nil {
		return gocv.Mat{}, err
	}
	defer g.Close()
	left := gocv.NewMat()
	defer left.Close()
	gocv.CvtColor(g, &left, gocv.ColorGrayToBGR)
	h := max(raw.Height, overlay.Rows())
	white := color.RGBA{255, 255, 255, 255}
	lp, rp := gocv.NewMat(), gocv.NewMat()
	defer lp.Close()
	defer rp.Close()
	gap := max(4, raw.Height/100)
	gocv.CopyMakeBorder(left, &lp, 0, h-raw.Height, 0, gap, gocv.BorderConstant, white)
	gocv.CopyMakeBorder(overlay, &rp, 0, h-overlay.Rows(), 0, 0, gocv.BorderConstant, white)
	out := gocv.NewMat()
	gocv.Hconcat(lp, rp, &out)
	return out, nil
}
