package strainfile

import (
	"spallscope/dic"
	"spallscope/dic/runfolder"
)

// Scale returns the run's image scale from its track or strain record
// (0 when neither knows it).
func Scale(dir string) dic.Scale {
	var tr runfolder.TrackRecord
	if runfolder.Section(dir, "track", &tr) == nil && tr.MMPerPx.Known() {
		return tr.MMPerPx
	}
	var sr StrainRecord
	if runfolder.Section(dir, "strain", &sr) == nil {
		return sr.MMPerPx
	}
	return 0
}
