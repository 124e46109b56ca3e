package speckle

import (
	"fmt"
	"io"
	"text/tabwriter"
)

// WriteSummary prints the report for a person: one line per finding, the
// table of subset sizes and the notes.
// It returns the first error of w.
func (r *Report) WriteSummary(out io.Writer) error {
	ew := &errWriter{w: out}
	var w io.Writer = ew
	tw := tabwriter.NewWriter(w, 2, 4, 2, ' ', 0)
	depth := "unknown depth"
	if r.Depth > 0 {
		depth = fmt.Sprintf("%d-bit", r.Depth)
	}
	fmt.Fprintf(tw, "image\t%dx%d px, %s\n", r.Width, r.Height, depth)
	fmt.Fprintf(tw, "gray levels\tmean %.1f, contrast (std) %.1f, min %.0f, max %.0f\n", r.Mean, r.Contrast, r.Min, r.Max)
	fmt.Fprintf(tw, "clipped\tsaturated %.2f %%, dark %.2f %%\n", 100*r.Saturated, 100*r.Dark)
	fmt.Fprintf(tw, "mean intensity gradient\t%.2f gray levels/px\n", r.MIG)
	if r.SpeckleSize > 0 {
		fmt.Fprintf(tw, "speckle size\t%.1f px (autocorrelation half at %.2f px along x, %.2f px along y)\n", r.SpeckleSize, r.CorrelationRadiusX, r.CorrelationRadiusY)
	} else {
		fmt.Fprintf(tw, "speckle size\tundefined\n")
	}
	switch r.NoiseSource {
	case NoiseGiven:
		fmt.Fprintf(tw, "noise\t%.3g gray levels (given)\n", r.Noise)
	case NoiseStaticPair:
		fmt.Fprintf(tw, "noise\t%.3g gray levels (from the static pair, %d px)\n", r.Noise, r.NoisePixels)
	default:
		fmt.Fprintf(tw, "noise\tunknown\n")
	}
	tw.Flush()

	fmt.Fprintln(w)
	tw = tabwriter.NewWriter(w, 2, 4, 2, ' ', tabwriter.AlignRight)
	fmt.Fprintln(tw, "subset px\tSSSIG median\tσ_u px/gray level\tσ_u px\t")
	for _, s := range r.Subsets {
		pred, mark := "-", ""
		if s.Predicted > 0 {
			pred = fmt.Sprintf("%.4f", s.Predicted)
		}
		if s.Size == r.SmallestSubset {
			mark = "  ← smallest meeting the target"
		}
		perGray := "-"
		if s.PerGray > 0 {
			perGray = fmt.Sprintf("%.5f", s.PerGray)
		}
		fmt.Fprintf(tw, "%d\t%.4g\t%s\t%s\t%s\n", s.Size, s.SSSIG, perGray, pred, mark)
	}
	tw.Flush()
	fmt.Fprintln(w)

	fmt.Fprintf(w, "smallest subset for σ_u ≤ %g px: %s\n", r.Target, r.SmallestSubsetText)
	m := r.Map
	fmt.Fprintf(w, "map: %dx%d subsets of %d px every %d px, SSSIG %.3g to %.3g (median %.3g)", m.Columns, m.Rows, m.Subset, m.Step, m.Min, m.Max, m.Median)
	if m.MeetsTarget != nil {
		fmt.Fprintf(w, ", %.1f %% meet the target", 100**m.MeetsTarget)
	}
	fmt.Fprintln(w)
	for _, n := range r.Notes {
		fmt.Fprintf(w, "note: %s\n", n)
	}
	return ew.err
}

// errWriter passes writes on until the first error, then keeps it.
type errWriter struct {
	w   io.Writer
	err error
}

func (e *errWriter) Write(p []byte) (int, error) {
	if e.err != nil {
		return 0, e.err
	}
	n, err := e.w.Write(p)
	e.err = err
	return n, err
}
