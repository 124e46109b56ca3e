// Package model brings a numerical model's prediction of a test into the
// measurement's frame and holds the two side by side: it reads the model's
// field from a CSV file of points, maps the model's coordinates,
// displacements and strains onto reference-image pixels, interpolates the
// model at the points of the DIC grid and reports the difference field
// (measured − model) with summary statistics per quantity.
//
// Inside the package everything is in the measurement's frame: reference
// pixels with the origin at the centre of the top-left pixel, x right and
// y down; displacements in px along those axes; strain tension positive
// with exy the tensor shear (half the engineering shear), as in package
// strain. Format says how a model file departs from that frame.
//
// Only the CSV layout described at Read is read; model fields in VTK XML
// (StructuredGrid or UnstructuredGrid) are not read yet.
package model
