package runfolder

import (
	"encoding/csv"
	"errors"
	"fmt"
	"io"
	"os"
	"strings"
)

// CSVRow is one data row of a CSV file with its line number.
type CSVRow struct {
	Line  int
	Cells []string
}

// ReadCSV reads a CSV file whose header is header or, with extra, starts
// with it (optional columns may follow); every row must hold at least the
// header's cells. Errors name the file and line.
func ReadCSV(path, header string, extra bool) ([]CSVRow, error) {
	f, err := os.Open(path)
	if err != nil {
		return nil, err
	}
	defer f.Close()
	r := csv.NewReader(f)
	r.FieldsPerRecord = -1
	head, err := r.Read()
	if err != nil {
		return nil, fmt.Errorf("%s: reading header: %w", path, err)
	}
	got := strings.Join(head, ",")
	if got != header && !(extra && strings.HasPrefix(got, header+",")) {
		return nil, fmt.Errorf("%s: header %q, expected %q", path, got, header)
	}
	want := len(strings.Split(header, ","))
	var out []CSVRow
	for {
		rec, err := r.Read()
		if errors.Is(err, io.EOF) {
			return out, nil
		}
		if err != nil { // before FieldPos, which has no position after an error
			return nil, fmt.Errorf("%s: %w", path, err)
		}
		line, _ := r.FieldPos(0)
		if len(rec) < want {
			return nil, fmt.Errorf("%s line %d: %d columns, expected %d", path, line, len(rec), want)
		}
		out = append(out, CSVRow{line, rec})
	}
}
