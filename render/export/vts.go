package export

import (
	"bufio"
	"encoding/base64"
	"encoding/binary"
	"fmt"
	"math"
	"strconv"
)

// vtsArray is one point-data array of a StructuredGrid: comps values per
// point, point-major, written as Float64, or as UInt8 for codes and flags.
type vtsArray struct {
	name  string
	comps int
	uint8 bool
	vals  []float64
}

// vtsGrid is one frame as a VTK StructuredGrid: cols×rows points in
// row-major order (x fastest, as VTK orders structured points), their
// coordinates (x, y, z per point) and the point data.
type vtsGrid struct {
	cols, rows int
	points     []float64
	time       float64
	arrays     []vtsArray
	// scalars and vectors name the active arrays ("" for none).
	scalars, vectors string
}

// writeVTS writes g as a serial VTK XML StructuredGrid file (.vts): the
// whole extent and the single piece's extent are 0..cols−1 × 0..rows−1 ×
// 0..0, the frame time is the field-data array TimeValue, and every
// DataArray is inline "binary": base64 of a UInt32 byte count followed by
// the little-endian values, encoded as one stream (the uncompressed form).
// NaN passes through bit for bit, which the "ascii" form does not promise
// for every reader (see the package documentation).
func writeVTS(w *bufio.Writer, g *vtsGrid) error {
	n := g.cols * g.rows
	if len(g.points) != 3*n {
		return fmt.Errorf("vts: %d coordinates for %d points", len(g.points), n)
	}
	extent := fmt.Sprintf("0 %d 0 %d 0 0", g.cols-1, g.rows-1)
	w.WriteString("<?xml version=\"1.0\"?>\n")
	w.WriteString("<VTKFile type=\"StructuredGrid\" version=\"1.0\" byte_order=\"LittleEndian\" header_type=\"UInt32\">\n")
	fmt.Fprintf(w, "  <StructuredGrid WholeExtent=\"%s\">\n", extent)
	if !math.IsNaN(g.time) && !math.IsInf(g.time, 0) {
		w.WriteString("    <FieldData>\n")
		fmt.Fprintf(w, "      <DataArray type=\"Float64\" Name=\"TimeValue\" NumberOfTuples=\"1\" format=\"ascii\">%s</DataArray>\n",
			strconv.FormatFloat(g.time, 'g', -1, 64))
		w.WriteString("    </FieldData>\n")
	}
	fmt.Fprintf(w, "    <Piece Extent=\"%s\">\n", extent)
	w.WriteString("      <PointData")
	if g.scalars != "" {
		fmt.Fprintf(w, " Scalars=\"%s\"", g.scalars)
	}
	if g.vectors != "" {
		fmt.Fprintf(w, " Vectors=\"%s\"", g.vectors)
	}
	w.WriteString(">\n")
	for i := range g.arrays {
		a := &g.arrays[i]
		if len(a.vals) != a.comps*n {
			return fmt.Errorf("vts: array %s has %d values for %d points of %d components", a.name, len(a.vals), n, a.comps)
		}
		if err := writeDataArray(w, "        ", a); err != nil {
			return err
		}
	}
	w.WriteString("      </PointData>\n")
	w.WriteString("      <CellData>\n      </CellData>\n")
	w.WriteString("      <Points>\n")
	if err := writeDataArray(w, "        ", &vtsArray{comps: 3, vals: g.points}); err != nil {
		return err
	}
	w.WriteString("      </Points>\n")
	w.WriteString("    </Piece>\n  </StructuredGrid>\n</VTKFile>\n")
	return nil
}

// writeDataArray writes one DataArray element in the binary encoding; an
// empty name is left out (the Points array has none).
func writeDataArray(w *bufio.Writer, indent string, a *vtsArray) error {
	typ, size, dtype := "Float64", 8, dtypeFloat64
	if a.uint8 {
		typ, size, dtype = "UInt8", 1, dtypeUint8
	}
	w.WriteString(indent)
	fmt.Fprintf(w, "<DataArray type=\"%s\"", typ)
	if a.name != "" {
		fmt.Fprintf(w, " Name=\"%s\"", a.name)
	}
	fmt.Fprintf(w, " NumberOfComponents=\"%d\" format=\"binary\">\n%s  ", a.comps, indent)
	nbytes := len(a.vals) * size
	if nbytes > math.MaxUint32 {
		return fmt.Errorf("vts: array %s of %d bytes exceeds the UInt32 header", a.name, nbytes)
	}
	enc := base64.NewEncoder(base64.StdEncoding, w)
	buf := binary.LittleEndian.AppendUint32(make([]byte, 0, 4+8*1024), uint32(nbytes))
	for i := 0; i < len(a.vals); i += 1024 {
		buf = appendValues(buf, dtype, a.vals[i:min(i+1024, len(a.vals))])
		if _, err := enc.Write(buf); err != nil {
			return err
		}
		buf = buf[:0]
	}
	if len(a.vals) == 0 {
		if _, err := enc.Write(buf); err != nil {
			return err
		}
	}
	if err := enc.Close(); err != nil {
		return err
	}
	w.WriteString("\n")
	w.WriteString(indent)
	_, err := w.WriteString("</DataArray>\n")
	return err
}
