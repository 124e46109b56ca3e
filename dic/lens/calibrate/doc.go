// Package calibrate calibrates a camera's lens from photos of a chessboard
// target held at several poses: it finds the board's inner corners with
// OpenCV (findChessboardCorners, refined by cornerSubPix), estimates the
// camera matrix and the Brown–Conrady distortion with OpenCV's
// calibrateCamera (Zhang 2000, IEEE TPAMI 22(11); Brown 1966), and
// describes how well the photos cover the frame.
//
// OpenCV is called once per photo (corners) and once per calibration,
// never per point; the results come back as Go values of package lens.
package calibrate
