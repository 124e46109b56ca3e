package frames

import (
	"fmt"
	"math"

	"gocv.io/x/gocv"

	"spallscope/subset"
)

// videoSequence reads frames of a video file through OpenCV. Reading is
// sequential; asking for an earlier frame reopens the file, a later one
// skips ahead, so in-order streaming is fast and random access works.
type videoSequence struct {
	path     string
	n        int
	declared int // frame count the container states; 0 if it states none
	fps      float64
	cap      *gocv.VideoCapture
	next     int // index of the frame the next Read of cap returns
	mat      gocv.Mat
	size     frameSize
	digits   int
}

func openVideo(path string) (Sequence, error) {
	v := &videoSequence{path: path, mat: gocv.NewMat()}
	// The container's frame count is not always right, so count by grabbing.
	if err := v.reopen(); err != nil {
		v.mat.Close()
		return nil, err
	}
	v.fps = v.cap.Get(gocv.VideoCaptureFPS)
	v.declared = declaredCount(v.cap.Get(gocv.VideoCaptureFrameCount))
	for v.cap.Read(&v.mat) && !v.mat.Empty() {
		v.n++
	}
	if v.n == 0 {
		v.Close()
		return nil, fmt.Errorf("open sequence: video %s has no decodable frames", path)
	}
	v.digits = len(fmt.Sprint(v.n - 1))
	if v.digits < 4 {
		v.digits = 4
	}
	if err := v.reopen(); err != nil {
		v.mat.Close()
		return nil, err
	}
	return v, nil
}

// declaredCount turns the frame count OpenCV reports for a container into
// a whole number, 0 when it states none (OpenCV gives 0, −1 or NaN then).
func declaredCount(c float64) int {
	if !(c >= 1) || c > math.MaxInt32 {
		return 0
	}
	return int(math.Round(c))
}

// shortfall describes a video that decoded fewer frames than its container
// declares, or "" when it did not.
func shortfall(path string, declared, decoded int) string {
	if declared <= decoded {
		return ""
	}
	return fmt.Sprintf("video %s: the container declares %d frames but only %d decode (frames %d to %d are missing: the file is truncated or damaged); the sequence holds the %d that decode",
		path, declared, decoded, decoded, declared-1, decoded)
}

func (v *videoSequence) reopen() error {
	if v.cap != nil {
		v.cap.Close()
	}
	c, err := gocv.VideoCaptureFile(v.path)
	if err != nil || !c.IsOpened() {
		return fmt.Errorf("open sequence: cannot open video %s (corrupt file or no decoder for its codec)", v.path)
	}
	v.cap, v.next = c, 0
	return nil
}

// FPS is the frame rate the video container states (0 if it states none).
func (v *videoSequence) FPS() float64      { return v.fps }
func (v *videoSequence) Len() int          { return v.n }
func (v *videoSequence) Name(i int) string { return fmt.Sprintf("%0*d", v.digits, i) }
func (v *videoSequence) Source(i int) string {
	return fmt.Sprintf("%s#%d", v.path, i)
}
func (v *videoSequence) ExpectSize(w, h int) { v.size.set(w, h) }

func (v *videoSequence) Read(i int) (*subset.Image, error) { return v.ReadInto(i, nil) }
func (v *videoSequence) ReadInto(i int, dst *subset.Image) (*subset.Image, error) {
	if err := v.advance(i); err != nil {
		return nil, err
	}
	return v.decoded(i, v.mat).Into(dst) // v.mat stays the sequence's: not closed
}

// advance decodes the video up to frame i, which is then in v.mat.
func (v *videoSequence) advance(i int) error {
	if i < 0 || i >= v.n {
		return fmt.Errorf("frame %d: out of range (video %s has %d frames)", i, v.path, v.n)
	}
	if i < v.next {
		if err := v.reopen(); err != nil {
			return fmt.Errorf("frame %d: %w", i, err)
		}
	}
	for v.next <= i {
		if !v.cap.Read(&v.mat) || v.mat.Empty() {
			return fmt.Errorf("frame %d (%s): cannot decode video frame", i, v.Source(i))
		}
		v.next++
	}
	return nil
}

func (v *videoSequence) Close() error {
	if v.cap != nil {
		v.cap.Close()
		v.cap = nil
	}
	v.mat.Close()
	return nil
}

// VideoFrameCounts returns the frame count a video sequence's container
// declares (0 if it declares none) and the number of frames that decode,
// which is the sequence's Len; ok is false for sequences that are not
// video.
func VideoFrameCounts(s Sequence) (declared, decoded int, ok bool) {
	v, ok := s.(*videoSequence)
	if !ok {
		return 0, 0, false
	}
	return v.declared, v.n, true
}

// Notes returns remarks on a sequence that are not errors but that the
// user must see, such as a video that decodes fewer frames than its
// container declares (a truncated or damaged file: the sequence then holds
// only the frames that decode). It returns nil when there are none.
func Notes(s Sequence) []string {
	v, ok := s.(*videoSequence)
	if !ok {
		return nil
	}
	if n := shortfall(v.path, v.declared, v.n); n != "" {
		return []string{n}
	}
	return nil
}

// VideoFPS returns the frame rate stated by a video sequence's container,
// and false for sequences that are not video or state no rate.
func VideoFPS(s Sequence) (float64, bool) {
	v, ok := s.(*videoSequence)
	if !ok || v.fps <= 0 {
		return 0, false
	}
	return v.fps, true
}
