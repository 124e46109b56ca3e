// Package frames reads and writes the photos of a test: single images, image
// sequences from a directory, a glob or a list file, and video files, all
// delivered as float32 gray images (package subset) with 16-bit depth kept.
//
// Decoding and encoding go through OpenCV (gocv) in bulk, one call per image;
// the conversion to float32 is plain Go. Frames are decoded on demand, so
// memory does not grow with the length of a sequence.
package frames
