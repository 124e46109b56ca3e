package main

import (
	"fmt"
	"strconv"
	"strings"

	"github.com/spf13/cobra"

	"spallscope/render"
)

func newReportCmd() *cobra.Command {
	var (
		opt                      render.ReportOptions
		extensometer, gauge, cmp string
	)
	cmd := &cobra.Command{
		Use:   "report RUN_DIR [--out FILE] [--embed]",
		Short: "Write the plots and a self-contained HTML report of a run folder",
		Long: `report draws the plots of a run folder into RUN/plots/ (PNG and SVG) and
writes RUN/report.html: the job, the cautions, the settings and measurement
resolution, the onsets with their stress and an elastic boundary-stress
comparison, a frame slider over RUN/overlays/*.png, and the plots. With
--out FILE in another folder it writes FILE and its plots in FILE_STEM_files/
and nothing into the run folder (which may be read-only).

Plots: nominal stress against time with the onsets; zone area and peak
strain frame by frame; the largest zone peak per sector; stress against a
virtual extensometer and a virtual strain gauge (readings in
RUN/plots/virtual_gauges.csv); the noise floor.

Virtual extensometer (--extensometer X1,Y1,X2,Y2, reference px): the change
of distance between the grid points nearest the two ends over their
reference distance. Default: vertical, over the middle 80 % of the grid
height, a quarter of the way in from the left. Virtual gauge (--gauge
X0,Y0,X1,Y1 with --gauge-component): the mean of a strain component over
the grid points inside the rectangle. Default: eyy over a patch about a
fifth of the grid, away from openings and edges.

Images: the page refers to the plots and overlays by paths relative to its
own folder (keep it with the run folder); with --embed they are put into
the page as data URIs, so the one file travels alone. Either way the page
loads nothing from the network and its slider works offline.

Measured fields are test results, not design values; support design
belongs to licensed engineers under local codes.`,
		Example: `  spallscope report run1
  spallscope report run1 --embed --out share/run1.html
  spallscope report run1 --extensometer 120,40,120,440 --gauge 300,200,360,260 --gauge-component eyy`,
		Args: cobra.ExactArgs(1),
		RunE: func(cmd *cobra.Command, args []string) error {
			if extensometer != "" {
				v, err := parseFour("--extensometer", extensometer)
				if err != nil {
					return err
				}
				opt.Plots.Extensometer = render.Extensometer{X1: v[0], Y1: v[1], X2: v[2], Y2: v[3]}
			}
			if gauge != "" {
				v, err := parseFour("--gauge", gauge)
				if err != nil {
					return err
				}
				opt.Plots.Gauge = render.Gauge{X0: v[0], Y0: v[1], X1: v[2], Y1: v[3]}
			}
			opt.Plots.Gauge.Component = cmp
			opt.Tool = "spallscope " + version
			path, err := render.WriteReport(args[0], opt)
			if err != nil {
				return err
			}
			fmt.Fprintf(cmd.OutOrStdout(), "wrote %s\n", path)
			return nil
		},
	}
	f := cmd.Flags()
	f.StringVar(&opt.Out, "out", "", "report file (default RUN_DIR/report.html)")
	f.BoolVar(&opt.Embed, "embed", false, "embed the images in the page as data URIs (one file that travels alone)")
	f.StringVar(&opt.Title, "title", "", "page title (default: Test report — RUN_DIR's name)")
	f.StringVar(&opt.Pattern, "pattern", "", "speckle pattern assessment to include (default RUN_DIR/pattern/pattern.json when present)")
	f.StringVar(&extensometer, "extensometer", "", "virtual extensometer ends X1,Y1,X2,Y2 in reference px")
	f.StringVar(&gauge, "gauge", "", "virtual strain gauge rectangle X0,Y0,X1,Y1 in reference px")
	f.StringVar(&cmp, "gauge-component", "eyy", "strain component the gauge averages: exx, eyy, exy, e1, e2, gamma_max or e_eq")
	return cmd
}

// parseFour parses four comma-separated numbers.
func parseFour(flag, s string) ([4]float64, error) {
	var v [4]float64
	parts := strings.Split(s, ",")
	if len(parts) != 4 {
		return v, fmt.Errorf("%s %q, expected four numbers in px such as 120,40,120,440", flag, s)
	}
	for i, p := range parts {
		x, err := strconv.ParseFloat(strings.TrimSpace(p), 64)
		if err != nil {
			return v, fmt.Errorf("%s %q: %q is not a number", flag, s, p)
		}
		v[i] = x
	}
	return v, nil
}
