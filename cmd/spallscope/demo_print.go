package main

import (
	"encoding/json"
	"fmt"
	"os"
	"path/filepath"
	"text/tabwriter"

	"github.com/spf13/cobra"

	"spallscope/cmd/spallscope/internal/demo"
	"spallscope/cmd/spallscope/internal/job"
	"spallscope/strain/model"
)

// printFaces prints the onsets of every face on the load log's clock.
func printFaces(cmd *cobra.Command, run string) {
	data, err := os.ReadFile(filepath.Join(run, job.FacesFile))
	if err != nil {
		return
	}
	var rep job.FacesReport
	if json.Unmarshal(data, &rep) != nil {
		return
	}
	o := cmd.OutOrStdout()
	fmt.Fprintf(o, "  onsets of both faces on the load log's clock (UCS %.0f MPa, K = %.2f assumed for the context):\n", demo.UCS, demo.K)
	w := tabwriter.NewWriter(o, 2, 4, 2, ' ', 0)
	fmt.Fprintln(w, "    face\tclass\topening\tsector\tindicator\tframe\tinterval\ttrigger\tlog_time_s\tstress_MPa\tpct_of_peak")
	for _, on := range rep.Onsets {
		interval, stress := intervalColumns(on.Onset)
		fmt.Fprintf(w, "    %s\t%s\t%s\t%s\t%s\t%s\t%s\t%d\t%.1f\t%s\t%.0f\n", on.Face, on.Class, on.OpeningName, on.Sector, on.Indicator, on.Name, interval, on.TriggerFrame, on.LogTime, stress, on.Percent)
	}
	w.Flush()
	if f := rep.First; f != nil {
		fmt.Fprintf(o, "  first onset over all faces: %s, %s at the %s, log time %.1f s, %.2f MPa (%.0f %% of peak)\n", f.Face, f.Class, f.Sector, f.LogTime, f.Stress, f.Percent)
	}
}

// printTruth prints the truth table of the faces' damage features, to
// read beside the onsets.
func printTruth(cmd *cobra.Command, rows []demo.TruthRow, path string) {
	o := cmd.OutOrStdout()
	fmt.Fprintf(o, "  truth of the damage features (detectable: the earliest frame each face's run could report each — kernel: its own displacement through the run's strain window, at the run's own per-point bar, box: its own γmax averaged over the run's VSG centred on its grid points — above the face's detection limit; box_truth: the box truth beside the kernel's), in %s:\n", path)
	w := tabwriter.NewWriter(o, 2, 4, 2, ' ', 0)
	fmt.Fprintln(w, "    face\tfeature\topening\tsector\twall\thidden_start\tdetectable\ttruth\tbox_truth\tstress_MPa\tlimit_µε\tVSG_px")
	for _, r := range rows {
		src := ""
		if !r.LimitFromRun {
			src = " (nominal)"
		}
		truth := r.Source()
		fmt.Fprintf(w, "    %s\t%s\t%s\t%s\t%s\t%s\t%s\t%s\t%s\t%.2f\t%.0f%s\t%d\n", r.Face, r.Feature, r.Opening, r.Sector, r.Wall,
			r.HiddenName, r.DetectableName, truth, r.BoxDetectableName, r.DetectableStress, r.Limit*1e6, src, r.VSG)
	}
	w.Flush()
	notes := map[string]bool{}
	for _, r := range rows {
		if r.Kernel && !r.MeasuredBar && !notes[r.Face] {
			notes[r.Face] = true
			fmt.Fprintf(o, "  %s face: kernel_gain — the window's theoretical noise gain stands in for the run's own per-point bar: %s\n", r.Face, r.BarNote)
		}
	}
}

// printModel prints the model comparison's summary, if there is one.
func printModel(cmd *cobra.Command, dir string) {
	data, err := os.ReadFile(filepath.Join(dir, model.SummaryFile))
	if err != nil {
		return
	}
	var s struct {
		FrameName  string `json:"frame_name"`
		Quantities []struct {
			Quantity    any      `json:"quantity"`
			RMS         *float64 `json:"rms"`
			Correlation *float64 `json:"correlation"`
			Ratio       *float64 `json:"rms_over_resolution"`
		} `json:"quantities"`
	}
	if json.Unmarshal(data, &s) != nil {
		return
	}
	fmt.Fprintf(cmd.OutOrStdout(), "  model (elastic Kirsch at %g MPa) against the front face at %s:", demo.ModelMPa, s.FrameName)
	for _, q := range s.Quantities {
		if q.RMS != nil && q.Correlation != nil && q.Ratio != nil {
			fmt.Fprintf(cmd.OutOrStdout(), " %v RMS %.2g (%.1f× resolution, r = %.3f);", q.Quantity, *q.RMS, *q.Ratio, *q.Correlation)
		}
	}
	fmt.Fprintln(cmd.OutOrStdout())
}
