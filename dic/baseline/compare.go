package baseline

import (
	"fmt"
	"math"
	"time"
)

// Repeats is the number of timed runs of each method on each case; the
// fastest is kept, the usual way to read a time off a machine that other
// work shares. The runs of the methods on a case are interleaved (one run
// of each method, then the next round), so that a spell of load from
// elsewhere falls on all of them rather than on one.
const Repeats = 5

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
	// per-image preparation (splines, pyramids, dense fields) but not the
	// conversion of the frames to OpenCV's 8-bit images, done once before
	// the runs (a run with OpenCV decodes its photos into them).
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
		caseRows, err := scoreCase(c, Methods(), window)
		if err != nil {
			return nil, err
		}
		ratios(caseRows)
		rows = append(rows, caseRows...)
	}
	return rows, nil
}

// scoreCase runs every method on c Repeats times, interleaved, and returns
// their rows, ratios unset.
func scoreCase(c *Case, methods []Method, window int) ([]Row, error) {
	release, err := c.holdMats()
	if err != nil {
		return nil, err
	}
	defer release()
	best := make([]float64, len(methods))
	us, vs := make([][]float64, len(methods)), make([][]float64, len(methods))
	for k := range best {
		best[k] = math.Inf(1)
	}
	for range Repeats {
		for k, m := range methods {
			start := time.Now()
			u, v, err := m.Measure(c, window)
			if err != nil {
				return nil, fmt.Errorf("case %s: %w", c.Name, err)
			}
			best[k] = math.Min(best[k], time.Since(start).Seconds())
			us[k], vs[k] = u, v
		}
	}
	rows := make([]Row, len(methods))
	for k, m := range methods {
		row, err := score(c, m.Name, us[k], vs[k])
		if err != nil {
			return nil, err
		}
		row.TimePerPoint = best[k] / float64(len(c.Points))
		rows[k] = row
	}
	return rows, nil
}

// score compares a method's measurement (u, v) of c with the truth and
// returns its row, time and ratios unset.
func score(c *Case, method string, u, v []float64) (Row, error) {
	if len(u) != len(c.Points) || len(v) != len(c.Points) {
		return Row{}, fmt.Errorf("case %s: %s returned %d, %d values for %d points", c.Name, method, len(u), len(v), len(c.Points))
	}
	row := Row{Case: c.Name, Method: method}
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
