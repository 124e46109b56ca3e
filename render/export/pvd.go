package export

import (
	"bufio"
	"encoding/xml"
	"strconv"
)

// pvdFile is a ParaView data (PVD) collection: a VTKFile of type
// Collection whose DataSet elements name each frame's file, relative to
// the PVD file's folder, with its time.
type pvdFile struct {
	XMLName   xml.Name     `xml:"VTKFile"`
	Type      string       `xml:"type,attr"`
	Version   string       `xml:"version,attr"`
	ByteOrder string       `xml:"byte_order,attr"`
	DataSets  []pvdDataSet `xml:"Collection>DataSet"`
}

type pvdDataSet struct {
	Timestep string `xml:"timestep,attr"`
	Group    string `xml:"group,attr"`
	Part     string `xml:"part,attr"`
	File     string `xml:"file,attr"`
}

// writePVD writes the collection of files with their times (s, or frame
// indices when no times are known), one part, in frame order. Times are
// written in the shortest form that reads back exactly.
func writePVD(w *bufio.Writer, files []string, times []float64) error {
	c := pvdFile{Type: "Collection", Version: "0.1", ByteOrder: "LittleEndian"}
	for i, f := range files {
		c.DataSets = append(c.DataSets, pvdDataSet{Timestep: strconv.FormatFloat(times[i], 'g', -1, 64), Part: "0", File: f})
	}
	out, err := xml.MarshalIndent(c, "", "  ")
	if err != nil {
		return err
	}
	w.WriteString(xml.Header)
	w.Write(out)
	_, err = w.WriteString("\n")
	return err
}
