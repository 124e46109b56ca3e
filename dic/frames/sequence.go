package frames

import (
	"fmt"
	"os"
	"path/filepath"
	"strings"

	"spallscope/subset"
)

// Sequence is an ordered set of frames of one camera. Frames are decoded when
// asked for, so a sequence of any length costs the memory of one frame.
//
// Every frame must have the size of the first frame read (or the size set
// with ExpectSize); a frame of another size is an error naming the frame.
type Sequence interface {
	// Len is the number of frames.
	Len() int
	// Name is frame i's name in outputs: the file stem for image files,
	// a zero-padded index for video.
	Name(i int) string
	// Source is where frame i comes from: its file path, or "video#i".
	Source(i int) string
	// Read decodes frame i into a new image.
	Read(i int) (*subset.Image, error)
	// ReadInto decodes frame i into dst's storage when dst (nil: none)
	// has the frame's size, else into a new image, and returns the
	// image: a run reads its frames one after the other into one image.
	ReadInto(i int, dst *subset.Image) (*subset.Image, error)
	// ExpectSize sets the frame size every frame must have.
	ExpectSize(width, height int)
	// Close releases the decoder (video files keep one open).
	Close() error
}

// VideoExtensions lists the file endings opened as video through OpenCV.
var VideoExtensions = []string{".mp4", ".avi", ".mov", ".mkv", ".m4v"}

// ListExtensions lists the file endings read as list files: one image path
// per line, relative to the list file's folder; blank lines and lines
// starting with '#' are skipped.
var ListExtensions = []string{".txt", ".lst", ".list"}

func hasExt(name string, exts []string) bool {
	ext := strings.ToLower(filepath.Ext(name))
	for _, e := range exts {
		if ext == e {
			return true
		}
	}
	return false
}

// Open opens a sequence described by spec, which is one of
//   - a directory: all image files in it (see ImageExtensions), natural order;
//   - a glob pattern such as "photos/cam1_*.tif": the matches, natural order;
//   - a list file (.txt, .lst, .list): the paths it lists, in its order;
//   - a video file (.mp4, .avi, .mov, .mkv, .m4v), decoded by OpenCV;
//   - a single image file: a sequence of one frame.
func Open(spec string) (Sequence, error) {
	if strings.ContainsAny(spec, "*?[") {
		return openGlob(spec)
	}
	st, err := os.Stat(spec)
	if err != nil {
		return nil, fmt.Errorf("open sequence: %w", err)
	}
	switch {
	case st.IsDir():
		return openDir(spec)
	case hasExt(spec, VideoExtensions):
		return openVideo(spec)
	case hasExt(spec, ListExtensions):
		return openList(spec)
	case IsImageFile(spec):
		return checkedFileSequence([]string{spec})
	}
	return nil, fmt.Errorf("open sequence %s: not a folder, glob, list file (%s), video (%s) or image (%s)",
		spec, strings.Join(ListExtensions, " "), strings.Join(VideoExtensions, " "), strings.Join(ImageExtensions, " "))
}

func openGlob(pattern string) (Sequence, error) {
	matches, err := filepath.Glob(pattern)
	if err != nil {
		return nil, fmt.Errorf("open sequence: bad glob pattern %q: %w", pattern, err)
	}
	var paths []string
	for _, m := range matches {
		if st, err := os.Stat(m); err == nil && !st.IsDir() {
			paths = append(paths, m)
		}
	}
	if len(paths) == 0 {
		return nil, fmt.Errorf("open sequence: glob pattern %q matches no files", pattern)
	}
	SortNatural(paths)
	return checkedFileSequence(paths)
}

func openDir(dir string) (Sequence, error) {
	entries, err := os.ReadDir(dir)
	if err != nil {
		return nil, fmt.Errorf("open sequence: %w", err)
	}
	var paths []string
	for _, e := range entries {
		if !e.IsDir() && IsImageFile(e.Name()) && !strings.Contains(e.Name(), ".partial.") {
			paths = append(paths, filepath.Join(dir, e.Name()))
		}
	}
	if len(paths) == 0 {
		return nil, fmt.Errorf("open sequence: folder %s holds no image files (expected %s)", dir, strings.Join(ImageExtensions, " "))
	}
	SortNatural(paths)
	return checkedFileSequence(paths)
}

func openList(list string) (Sequence, error) {
	data, err := os.ReadFile(list)
	if err != nil {
		return nil, fmt.Errorf("open sequence: %w", err)
	}
	base := filepath.Dir(list)
	var paths []string
	for n, line := range strings.Split(string(data), "\n") {
		line = strings.TrimSpace(line)
		if line == "" || strings.HasPrefix(line, "#") {
			continue
		}
		p := line
		if !filepath.IsAbs(p) {
			p = filepath.Join(base, p)
		}
		if _, err := os.Stat(p); err != nil {
			return nil, fmt.Errorf("open sequence: list %s line %d: %w", list, n+1, err)
		}
		paths = append(paths, p)
	}
	if len(paths) == 0 {
		return nil, fmt.Errorf("open sequence: list %s names no files", list)
	}
	return checkedFileSequence(paths)
}

// fileSequence is a sequence of still-image files.
type fileSequence struct {
	paths []string
	names []string
	size  frameSize
}

func newFileSequence(paths []string) *fileSequence {
	s := &fileSequence{paths: paths, names: make([]string, len(paths))}
	for i, p := range paths {
		s.names[i] = strings.TrimSuffix(filepath.Base(p), filepath.Ext(p))
	}
	return s
}

func (s *fileSequence) Len() int                          { return len(s.paths) }
func (s *fileSequence) Name(i int) string                 { return s.names[i] }
func (s *fileSequence) Source(i int) string               { return s.paths[i] }
func (s *fileSequence) ExpectSize(w, h int)               { s.size.set(w, h) }
func (s *fileSequence) Close() error                      { return nil }
func (s *fileSequence) Read(i int) (*subset.Image, error) { return s.ReadInto(i, nil) }
func (s *fileSequence) ReadInto(i int, dst *subset.Image) (*subset.Image, error) {
	d, err := s.Decode(i)
	if err != nil {
		return nil, err
	}
	defer d.Close()
	return d.Into(dst)
}

// frameSize holds the size every frame of a sequence must have.
type frameSize struct{ w, h int }

func (f *frameSize) set(w, h int) { f.w, f.h = w, h }

func (f *frameSize) check(img *subset.Image, i int, source string) error {
	if f.w == 0 && f.h == 0 {
		f.w, f.h = img.Width, img.Height
		return nil
	}
	if img.Width != f.w || img.Height != f.h {
		return fmt.Errorf("frame %d (%s): size %dx%d, expected %dx%d like the reference", i, source, img.Width, img.Height, f.w, f.h)
	}
	return nil
}
