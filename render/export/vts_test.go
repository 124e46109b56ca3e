package export

import (
	"bufio"
	"bytes"
	"encoding/base64"
	"encoding/binary"
	"encoding/xml"
	"math"
	"os"
	"strconv"
	"strings"
	"testing"
)

// vtsDoc is the part of a VTK XML StructuredGrid file the tests read, by
// the element and attribute names of the VTK XML file formats.
type vtsDoc struct {
	XMLName   xml.Name `xml:"VTKFile"`
	Type      string   `xml:"type,attr"`
	ByteOrder string   `xml:"byte_order,attr"`
	Header    string   `xml:"header_type,attr"`
	Grid      struct {
		WholeExtent string         `xml:"WholeExtent,attr"`
		FieldData   []vtsDataArray `xml:"FieldData>DataArray"`
		Piece       struct {
			Extent    string `xml:"Extent,attr"`
			PointData struct {
				Scalars string         `xml:"Scalars,attr"`
				Vectors string         `xml:"Vectors,attr"`
				Arrays  []vtsDataArray `xml:"DataArray"`
			} `xml:"PointData"`
			Points []vtsDataArray `xml:"Points>DataArray"`
		} `xml:"Piece"`
	} `xml:"StructuredGrid"`
}

type vtsDataArray struct {
	Type   string `xml:"type,attr"`
	Name   string `xml:"Name,attr"`
	Comps  int    `xml:"NumberOfComponents,attr"`
	Format string `xml:"format,attr"`
	Text   string `xml:",chardata"`
}

// values decodes a DataArray: "binary" is base64 of a UInt32 byte count
// and the little-endian values in one stream; "ascii" is whitespace
// separated numbers. The byte count must match the data.
func (a vtsDataArray) values(t *testing.T) []float64 {
	t.Helper()
	if a.Format == "ascii" {
		var vs []float64
		for _, s := range strings.Fields(a.Text) {
			v, err := strconv.ParseFloat(s, 64)
			if err != nil {
				t.Fatalf("array %s: %v", a.Name, err)
			}
			vs = append(vs, v)
		}
		return vs
	}
	if a.Format != "binary" {
		t.Fatalf("array %s: format %q", a.Name, a.Format)
	}
	raw, err := base64.StdEncoding.DecodeString(strings.Join(strings.Fields(a.Text), ""))
	if err != nil {
		t.Fatalf("array %s: base64: %v", a.Name, err)
	}
	if len(raw) < 4 {
		t.Fatalf("array %s: %d bytes, no header", a.Name, len(raw))
	}
	n := int(binary.LittleEndian.Uint32(raw))
	data := raw[4:]
	if n != len(data) {
		t.Fatalf("array %s: header says %d bytes, %d follow", a.Name, n, len(data))
	}
	var vs []float64
	switch a.Type {
	case "Float64":
		for i := 0; i+8 <= len(data); i += 8 {
			vs = append(vs, math.Float64frombits(binary.LittleEndian.Uint64(data[i:])))
		}
	case "UInt8":
		for _, b := range data {
			vs = append(vs, float64(b))
		}
	default:
		t.Fatalf("array %s: type %s", a.Name, a.Type)
	}
	return vs
}

func parseVTS(t *testing.T, b []byte) *vtsDoc {
	t.Helper()
	var d vtsDoc
	if err := xml.Unmarshal(b, &d); err != nil {
		t.Fatalf("vts does not parse as XML: %v", err)
	}
	return &d
}

func readVTS(t *testing.T, path string) *vtsDoc {
	t.Helper()
	b, err := os.ReadFile(path)
	if err != nil {
		t.Fatal(err)
	}
	return parseVTS(t, b)
}

// array returns the named point-data array's values and checks its type
// and component count.
func (d *vtsDoc) array(t *testing.T, name, typ string, comps int) []float64 {
	t.Helper()
	for _, a := range d.Grid.Piece.PointData.Arrays {
		if a.Name == name {
			if a.Type != typ || a.Comps != comps {
				t.Fatalf("array %s: %s × %d, want %s × %d", name, a.Type, a.Comps, typ, comps)
			}
			return a.values(t)
		}
	}
	t.Fatalf("no point-data array %s", name)
	return nil
}

// A StructuredGrid written for 3×2 points reads back by the VTK XML
// format's structure: extents, coordinates x fastest, arrays with their
// types and NaN bit for bit, the time and the active arrays.
func TestVTSReadBack(t *testing.T) {
	g := &vtsGrid{cols: 3, rows: 2, time: 0.25, scalars: "u", vectors: "displacement"}
	for r := 0; r < 2; r++ {
		for c := 0; c < 3; c++ {
			g.points = append(g.points, 0.5*float64(c), 0.5*float64(r), 0)
		}
	}
	u := []float64{0.1, math.NaN(), 0.3, -0.4, 1e-9, 6}
	d := make([]float64, 18)
	for i := range u {
		d[3*i] = u[i]
	}
	g.arrays = []vtsArray{
		{name: "displacement", comps: 3, vals: d},
		{name: "u", comps: 1, vals: u},
		{name: "status", comps: 1, uint8: true, vals: []float64{1, 6, 1, 1, 0, 1}},
	}
	var buf bytes.Buffer
	bw := bufio.NewWriter(&buf)
	if err := writeVTS(bw, g); err != nil {
		t.Fatal(err)
	}
	bw.Flush()
	doc := parseVTS(t, buf.Bytes())

	if doc.Type != "StructuredGrid" || doc.ByteOrder != "LittleEndian" || doc.Header != "UInt32" {
		t.Errorf("VTKFile type %q byte_order %q header_type %q", doc.Type, doc.ByteOrder, doc.Header)
	}
	if doc.Grid.WholeExtent != "0 2 0 1 0 0" || doc.Grid.Piece.Extent != "0 2 0 1 0 0" {
		t.Errorf("extents %q, %q; want 0 2 0 1 0 0", doc.Grid.WholeExtent, doc.Grid.Piece.Extent)
	}
	if len(doc.Grid.Piece.Points) != 1 || doc.Grid.Piece.Points[0].Comps != 3 {
		t.Fatalf("points: %+v", doc.Grid.Piece.Points)
	}
	pts := doc.Grid.Piece.Points[0].values(t)
	if len(pts) != 18 || pts[3] != 0.5 || pts[4] != 0 || pts[9] != 0 || pts[10] != 0.5 || pts[17] != 0 {
		t.Errorf("point coordinates %v: point 1 should be (0.5, 0, 0), point 3 (0, 0.5, 0)", pts)
	}
	got := doc.array(t, "u", "Float64", 1)
	for i := range u {
		if math.Float64bits(got[i]) != math.Float64bits(u[i]) {
			t.Errorf("u[%d] = %v, want %v", i, got[i], u[i])
		}
	}
	if v := doc.array(t, "displacement", "Float64", 3); len(v) != 18 || v[9] != -0.4 || !math.IsNaN(v[3]) {
		t.Errorf("displacement %v", v)
	}
	if s := doc.array(t, "status", "UInt8", 1); len(s) != 6 || s[1] != 6 || s[4] != 0 {
		t.Errorf("status %v", s)
	}
	if pd := doc.Grid.Piece.PointData; pd.Scalars != "u" || pd.Vectors != "displacement" {
		t.Errorf("active arrays %q, %q", pd.Scalars, pd.Vectors)
	}
	if fd := doc.Grid.FieldData; len(fd) != 1 || fd[0].Name != "TimeValue" || fd[0].values(t)[0] != 0.25 {
		t.Errorf("field data %+v, want TimeValue 0.25", fd)
	}

	g.arrays[1].vals = u[:5]
	if err := writeVTS(bufio.NewWriter(&bytes.Buffer{}), g); err == nil {
		t.Error("an array of 5 values for 6 points must be refused")
	}
}
