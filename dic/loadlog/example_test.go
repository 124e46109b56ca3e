package loadlog_test

import (
	"fmt"
	"os"
	"path/filepath"

	"spallscope/dic/loadlog"
)

// A load log with invented numbers, read with the default Format and
// turned into nominal stress at three camera times.
func Example() {
	dir, err := os.MkdirTemp("", "loadlog")
	if err != nil {
		fmt.Println(err)
		return
	}
	defer os.RemoveAll(dir)
	path := filepath.Join(dir, "log.csv")
	content := "# specimen B-12, 54 mm core; loaded area 2290 mm2\n" +
		"time_s,force_kN,stroke_mm\n" +
		"0.0,0.00,0.000\n" +
		"0.5,12.40,0.021\n" +
		"1.0,25.10,0.043\n"
	if err := os.WriteFile(path, []byte(content), 0o644); err != nil {
		fmt.Println(err)
		return
	}
	log, err := loadlog.Read(path, loadlog.Format{})
	if err != nil {
		fmt.Println(err)
		return
	}
	stress, err := loadlog.NewStress(log, 2290, loadlog.Clock{Offset: 3.5})
	if err != nil {
		fmt.Println(err)
		return
	}
	for _, f := range stress.Frames([]float64{-2.75, -2.5, -2}) {
		fmt.Printf("camera %5.2f s: %.2f MPa, %.1f %% of peak, in span %v\n", f.Time, f.Stress, f.Percent, f.InSpan)
	}
	// Output:
	// camera -2.75 s: 8.19 MPa, 74.7 % of peak, in span true
	// camera -2.50 s: 10.96 MPa, 100.0 % of peak, in span true
	// camera -2.00 s: 10.96 MPa, 100.0 % of peak, in span false
}
