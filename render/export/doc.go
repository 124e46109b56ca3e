// Package export writes the fields of a run folder to open formats that
// other programs read: VTK XML StructuredGrid files with a ParaView PVD
// time series, and NumPy NPY arrays.
//
// # Layout
//
//	RUN/vtk/<frame>.vts   one StructuredGrid per frame
//	RUN/vtk/series.pvd    the frames as a time series (timestep = frame time, s)
//	RUN/npy/x.npy, y.npy  reference positions, shape (rows, cols), float64
//	RUN/npy/<q>.npy       quantity q over the run, shape (frames, rows, cols)
//	RUN/npy/times.npy     frame times, shape (frames,), float64
//	RUN/npy/index.json    the arrays, their shapes, dtypes and units, the frames
//
// Every file is written atomically (runfolder.WriteAtomic), and the file
// that lists the others, series.pvd or index.json, is written last, so a
// listing that exists describes complete files. Files of an earlier export
// that the new one does not list are left in place.
//
// # Coordinates, units and time
//
// Points sit at their reference positions, x right and y down as in the
// images (z = 0), in mm when the image scale is known and in px otherwise;
// u and v are in the same unit, so the displacement vector can warp the
// grid directly. In ParaView, viewing along −Z shows the grid the way the
// camera saw it. Gradients and strains are dimensionless, angle_deg in
// degrees. Frame times are the camera times of the track record (s); with
// none recorded, the frame index stands in and the listing says so.
//
// # Missing values
//
// A point without a measurement holds NaN in every float64 array, in both
// formats. VTK XML DataArrays are written in the "binary" encoding (base64
// of a UInt32 byte count followed by the little-endian values, the inline
// uncompressed form of the VTK XML formats), which carries the IEEE NaN
// bit pattern exactly. The "ascii" encoding is not used because whether
// "nan" in ASCII reads back depends on the reader's version: VTK's XML
// reader long parsed ASCII numbers by C++ stream extraction, which stops
// at the first "nan" and leaves the array short (the file then fails to
// load); VTK 9.1 and 9.2 read it. The binary form reads the same in all.
// As a second channel that needs no NaN at all, every VTS file holds a
// valid array (1 measured, 0 not) and, with strain, strain_valid.
//
// The status array (UInt8 in VTS, uint8 "|u1" in NPY) holds the outcome of
// each subset, the codes of subset.Status: 0 unsolved, 1 converged,
// 2 diverged, 3 out-of-image, 4 low-texture, 5 masked, 6 lost. Only
// converged points carry values. The zncc array keeps the correlation of
// points that were solved but rejected (lost), since it tells how badly
// they matched; it is NaN where no correlation was computed.
//
// # Memory
//
// Frames are read one at a time. Each NPY stack is written as its header,
// which already states the final shape, followed by one (rows, cols) plane
// per frame, so memory holds one frame's values, not the run: 2000 frames
// of 40 000 points need a few MB, not the 640 MB per quantity of the whole
// stack.
//
// # Specifications
//
// VTK XML formats: "VTK File Formats", VTK User's Guide (Kitware), section
// XML File Formats: serial StructuredGrid (.vts) with WholeExtent, Piece
// Extent, PointData and Points, and DataArray encodings; the ParaView data
// (PVD) collection file (VTKFile type="Collection", DataSet elements with
// timestep and file).
//
// NPY: NumPy Enhancement Proposal 1, "A Simple File Format for NumPy
// Arrays", format version 1.0: the magic string "\x93NUMPY", version bytes
// 1 and 0, a little-endian uint16 header length, and an ASCII Python dict
// literal with keys descr, fortran_order and shape, padded with spaces and
// ended by a newline so that the data start on a 64-byte boundary (which
// is also the 16-byte one the proposal asks for).
package export
