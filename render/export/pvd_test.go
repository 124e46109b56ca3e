package export

import (
	"bufio"
	"bytes"
	"encoding/xml"
	"os"
	"strconv"
	"testing"
)

// pvdDoc is a PVD collection as the tests read it: the ParaView data
// format's VTKFile type="Collection" with DataSet timestep and file.
type pvdDoc struct {
	XMLName  xml.Name `xml:"VTKFile"`
	Type     string   `xml:"type,attr"`
	DataSets []struct {
		Timestep string `xml:"timestep,attr"`
		Part     string `xml:"part,attr"`
		File     string `xml:"file,attr"`
	} `xml:"Collection>DataSet"`
}

func readPVD(t *testing.T, path string) *pvdDoc {
	t.Helper()
	b, err := os.ReadFile(path)
	if err != nil {
		t.Fatal(err)
	}
	var d pvdDoc
	if err := xml.Unmarshal(b, &d); err != nil {
		t.Fatalf("%s: %v", path, err)
	}
	return &d
}

// Every frame is listed in order with its time, read back exactly, and
// names that need XML escaping survive.
func TestPVDListsFrames(t *testing.T) {
	files := []string{"a.vts", "b&c.vts", "d\"e<f>.vts"}
	times := []float64{0, 1.0 / 3, 1234.5678e-3}
	var buf bytes.Buffer
	bw := bufio.NewWriter(&buf)
	if err := writePVD(bw, files, times); err != nil {
		t.Fatal(err)
	}
	bw.Flush()
	var d pvdDoc
	if err := xml.Unmarshal(buf.Bytes(), &d); err != nil {
		t.Fatalf("pvd does not parse: %v\n%s", err, buf.Bytes())
	}
	if d.Type != "Collection" || len(d.DataSets) != len(files) {
		t.Fatalf("type %q with %d data sets, want Collection with %d", d.Type, len(d.DataSets), len(files))
	}
	for i, ds := range d.DataSets {
		ts, err := strconv.ParseFloat(ds.Timestep, 64)
		if err != nil || ts != times[i] || ds.File != files[i] || ds.Part != "0" {
			t.Errorf("data set %d: %+v, want file %q at %v", i, ds, files[i], times[i])
		}
	}
}
