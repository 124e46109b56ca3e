package synth

import (
	"bufio"
	"fmt"

	"spallscope/dic/frames"
	"spallscope/dic/runfolder"
	"spallscope/subset"
)

// validateCameraEffects checks the scenario's out-of-plane motion,
// lighting and EXIF clock.
func (sc *Scenario) validateCameraEffects() []error {
	var errs []error
	if o := sc.OutOfPlane; o != nil {
		if err := o.Validate(sc); err != nil {
			errs = append(errs, fmt.Errorf("out_of_plane: %w", err))
		}
	}
	if l := sc.Lighting; l != nil {
		if err := l.Validate(sc.Frames); err != nil {
			errs = append(errs, fmt.Errorf("lighting: %w", err))
		}
	}
	if c := sc.Exif; c != nil {
		if sc.Format != "jpg" {
			errs = append(errs, fmt.Errorf("exif: needs format jpg (EXIF capture times are stamped into JPEGs), not %q", sc.Format))
		}
		if err := c.Validate(); err != nil {
			errs = append(errs, fmt.Errorf("exif: %w", err))
		}
	}
	return errs
}

// cameraEffects puts a frame's out-of-plane motion and plate into its
// scene.
func (sc *Scenario) cameraEffects(scene *Scene, frame int) {
	_, scene.Magnification = sc.OutOfPlaneAt(frame)
	scene.MagCx, scene.MagCy = sc.PrincipalPoint()
	scene.Plate = sc.Plate()
}

// JPEGQuality is the quality the lab writes JPEG frames at: the highest,
// so that compression moves gray levels by well under a level.
const JPEGQuality = 100

// writeFrame writes a recorded frame in the scenario's format: a JPEG
// with the frame's EXIF capture time when the scenario has a clock.
func (sc *Scenario) writeFrame(path string, img *subset.Image, frame int) error {
	if sc.Format == "jpg" {
		var tags frames.CaptureTags
		if sc.Exif != nil {
			tags = sc.Exif.Tags(sc.Time(frame))
		}
		data, err := frames.GrayJPEG(img, tags, JPEGQuality)
		if err != nil {
			return fmt.Errorf("write image %s: %w", path, err)
		}
		return runfolder.WriteAtomic(path, func(w *bufio.Writer) error {
			_, err := w.Write(data)
			return err
		})
	}
	return frames.WriteImage(path, img, sc.Camera.withDefaults().Depth)
}
