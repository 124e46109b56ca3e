package runfolder

import "path/filepath"

// PhotoFieldsDir is the run folder's subfolder of the tracker's own
// displacement fields, in photo pixels, kept when a lens correction is
// applied (fields/ then holds the corrected fields, in undistorted
// pixels). A resumed run continues from them.
const PhotoFieldsDir = "photo_fields"

// PhotoFieldPath returns the path of a frame's photo-pixel field.
func PhotoFieldPath(dir, frame string) string {
	return filepath.Join(dir, PhotoFieldsDir, frame+".csv")
}

// LensRecord is the lens a track stage corrected for: the lens file and
// its SHA-256. Fields are then in undistorted pixels.
type LensRecord struct {
	File   string `json:"file"`
	SHA256 string `json:"sha256"`
}
