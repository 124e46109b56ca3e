package job

import (
	"fmt"

	"spallscope/dic/runfolder"
)

// sameLens checks that the lens file a track stage corrected for still
// holds the lens it held then. The zones stage takes the openings through
// that lens into the fields' undistorted pixels; a lens file edited or
// replaced since tracking (a recalibration, say) would place them through
// another lens than the one the fields were corrected with, off by up to
// the change in distortion, with nothing to show it. A record without a
// hash (an older run folder) is taken as it is.
func sameLens(rec *runfolder.LensRecord) error {
	if rec == nil || rec.SHA256 == "" {
		return nil
	}
	now, err := fileHash(rec.File)
	if err != nil {
		return fmt.Errorf("lens file %s the fields were corrected with: %w", rec.File, err)
	}
	if now != rec.SHA256 {
		return fmt.Errorf("lens file %s has changed since tracking (SHA-256 %.12s… then, %.12s… now): the fields are corrected for the lens it held then; restore that file or track again with the new one", rec.File, rec.SHA256, now)
	}
	return nil
}
