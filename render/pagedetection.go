package render

import (
	"fmt"

	"spallscope/strain/strainfile"
)

// pageDetection is the page's statement of the smallest fracture the run
// could see, one line per strain indicator, and the table behind it.
type pageDetection struct {
	// Lines say it in words, per indicator.
	Lines []string
	Rows  []pageDetectionRow
}

// pageDetectionRow is one indicator's detection limit, formatted.
type pageDetectionRow struct {
	Indicator, Noise, K, Strain, VSG, OpeningPx, Opening string
}

// detectionSection formats onset.json's detection limits; nil when the
// record has none (onset.json from before they were written).
func detectionSection(r *runRecords) *pageDetection {
	if r.Onset == nil || len(r.Onset.DetectionLimits) == 0 {
		return nil
	}
	d := &pageDetection{}
	for _, l := range r.Onset.DetectionLimits {
		d.Lines = append(d.Lines, detectionLine(l))
		row := pageDetectionRow{
			Indicator: indicatorLabel(l.Indicator),
			Noise:     fmt.Sprintf("%.3g", 1e6*l.Noise),
			K:         formatFactor(l.K),
			Strain:    fmt.Sprintf("%.3g", 1e6*l.Strain),
			VSG:       fmt.Sprintf("%d", l.VSG),
			OpeningPx: fmt.Sprintf("%.3g", l.OpeningPx),
			Opening:   "—",
		}
		if l.OpeningMM > 0 {
			row.Opening = fmt.Sprintf("%.3g", 1000*l.OpeningMM)
		}
		d.Rows = append(d.Rows, row)
	}
	return d
}

// detectionLine says one indicator's limit in words: "a localized strain
// below … µε over the … px VSG, or a crack opening below … µm, cannot be
// seen in this run".
func detectionLine(l strainfile.DetectionLimit) string {
	opening := fmt.Sprintf("%.3g px", l.OpeningPx)
	if l.OpeningMM > 0 {
		opening = fmt.Sprintf("%.3g µm (%.3g px)", 1000*l.OpeningMM, l.OpeningPx)
	}
	return fmt.Sprintf("By %s, a localized strain below %.3g µε over the %d px VSG, or a crack opening below %s, cannot be seen in this run.",
		indicatorLabel(l.Indicator), 1e6*l.Strain, l.VSG, opening)
}
