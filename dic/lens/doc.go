// Package lens models a camera's lens and takes its distortion out of
// measured coordinates.
//
// The model is the pinhole camera of Zhang 2000 ("A flexible new technique
// for camera calibration", IEEE TPAMI 22(11)) with the radial (k1, k2, k3)
// and tangential (p1, p2) terms of the Brown–Conrady distortion model
// (Brown 1966, "Decentering distortion of lenses", Photogrammetric
// Engineering 32(3)), in the coefficient order OpenCV's calibrateCamera
// estimates them. Ideal pixels are those of the same camera without
// distortion: the camera matrix is kept, so that at the principal point an
// ideal pixel is a photo pixel.
//
// Correction works on coordinates, never on photos: a measured point's
// reference position and its deformed position are each mapped to ideal
// pixels, and its displacement is their difference (Correction). The
// inverse of the distortion is solved here in Go by Newton's method.
//
// The package is pure Go; finding chessboard corners and calibrating with
// OpenCV lives in package calibrate below it.
package lens
