package baseline

import (
	"fmt"
	"math"
	"time"
)

// Repeats is the number of timed runs of each method on each case; the
// fastest is kept, the usual way to read a time off a machine that other
// work shares.
const Repeats = 3

// Row is the score of one method on one case.
type Row struct {
	Case, Method string
	// RMSE is the root mean square length of the displacement error vector
	// (u − u_true, v − v_true) over the measured points, in px.
	RMSE float64
	// MaxErr is the largest error vector length, in px.
	MaxErr float64
	// Missing is the number of points the method reported as failed; they
	// are left out of RMSE and MaxErr.
	Missing int
	// TimePerPoint is the wall time of the fastest of Repeats runs divided
	// by the number of points, in seconds. It includes the method's
	// per-image preparation (image conversion, splines, dense fields).
	TimePerPoint float64
	// VsBest is RMSE divided by the smallest RMSE of the baselines (every
	// method but spallscope) on the same case.
	VsBest float64
	// VsLK is TimePerPoint divided by that of Lucas–Kanade on the same
	// case, measured in the same run.
	VsLK float64
}

// Compare runs every method of Methods on every case with the given
// window size and scores it against the case's truth.
func Compare(cases []*Case, window int) ([]Row, error) {
	var rows []Row
	for _, c := range cases {
		first := len(rows)
		for _, m := range Methods() {
			row, err := score(c, m, window)
			if err != nil {
				return nil, err
			}
			rows = append(rows, row)
		}
		ratios(rows[first:])
	}
	return rows, nil
}

// score runs m on c Repeats times and returns its row, ratios unset.
func score(c *Case, m Method, window int) (Row, error) {
	var u, v []float64
	best := math.Inf(1)
	for range Repeats {
		start := time.Now()
		var err error
		u, v, err = m.Measure(c, window)
		if err != nil {
			return Row{}, fmt.Errorf("case %s: %w", c.Name, err)
		}
		best = math.Min(best, time.Since(start).Seconds())
	}
	if len(u) != len(c.Points) || len(v) != len(c.Points) {
		return Row{}, fmt.Errorf("case %s: %s returned %d, %d values for %d points", c.Name, m.Name, len(u), len(v), len(c.Points))
	}
	row := Row{Case: c.Name, Method: m.Name, TimePerPoint: best / float64(len(c.Points))}
	var sum float64
	for i, t := range c.Truth {
		if math.IsNaN(u[i]) || math.IsNaN(v[i]) {
			row.Missing++
			continue
		}
		e2 := (u[i]-t.U)*(u[i]-t.U) + (v[i]-t.V)*(v[i]-t.V)
		sum += e2
		row.MaxErr = math.Max(row.MaxErr, math.Sqrt(e2))
	}
	if n := len(c.Points) - row.Missing; n > 0 {
		row.RMSE = math.Sqrt(sum / float64(n))
	} else {
		row.RMSE, row.MaxErr = math.NaN(), math.NaN()
	}
	return row, nil
}

// ratios fills VsBest and VsLK in the rows of one case.
func ratios(rows []Row) {
	bestRMSE, lkTime := math.Inf(1), math.NaN()
	for _, r := range rows {
		if r.Method != NameSpallscope && r.RMSE < bestRMSE {
			bestRMSE = r.RMSE
		}
		if r.Method == NameLucasKanade {
			lkTime = r.TimePerPoint
		}
	}
	for i := range rows {
		rows[i].VsBest = rows[i].RMSE / bestRMSE
		rows[i].VsLK = rows[i].TimePerPoint / lkTime
	}
}
