package runfolder

import (
	"fmt"
)

// Unchanged checks that the lens file at path (the record's file, or where
// a reader found it) still holds the lens it held when the fields were
// corrected. Whoever draws or places anything through that lens — the
// openings of the zones stage, the overlays on the photos — would otherwise
// use another lens than the fields were corrected with (after a
// recalibration, say), off by the change in distortion with nothing to
// show it. A record without a hash (an older run folder) is taken as it is.
func (r *LensRecord) Unchanged(path string) error {
	if r == nil || r.SHA256 == "" {
		return nil
	}
	now, err := FileSHA256(path)
	if err != nil {
		return fmt.Errorf("lens file the fields were corrected with: %w", err)
	}
	if now != r.SHA256 {
		return fmt.Errorf("lens file %s has changed since tracking (SHA-256 %.12s… then, %.12s… now): the fields are corrected for the lens it held then; restore that file or track again with the new one", path, r.SHA256, now)
	}
	return nil
}
