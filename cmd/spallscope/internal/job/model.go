package job

import (
	"fmt"
	"math"
	"path/filepath"

	"spallscope/dic"
	"spallscope/dic/frames"
	"spallscope/dic/runfolder"
	"spallscope/render"
	"spallscope/strain"
	"spallscope/strain/model"
	"spallscope/strain/strainfile"
)

// CompareModel holds the model field in file (mapped by f; the run's
// scale when f has none) against the measurement of run folder run at
// frame, or — frame empty — at the frame whose nominal stress is nearest
// loadMPa (from the zones stage's timeline). It writes run/model/
// (model-diff.csv, model-summary.json and compare_<quantity>.png: model,
// measurement and difference side by side) and returns the comparison.
func CompareModel(run, file string, f model.Format, frame string, loadMPa float64) (*model.Comparison, error) {
	names, err := runfolder.Frames(run)
	if err != nil {
		return nil, err
	}
	if frame == "" {
		var tl strainfile.TimelineRecord
		if err := runfolder.Section(run, "timeline", &tl); err != nil || loadMPa == 0 {
			return nil, fmt.Errorf("model %s: give a frame, or a load level with a run whose zones stage placed the frames on the load log", file)
		}
		best := math.Inf(1)
		for k, s := range tl.Stress {
			if d := math.Abs(s - loadMPa); d < best {
				best, frame = d, tl.Frames[k]
			}
		}
	}
	index := -1
	for k, n := range names {
		if n == frame {
			index = k
		}
	}
	if index < 0 {
		return nil, fmt.Errorf("model %s: frame %q is not a frame of %s", file, frame, run)
	}
	if !f.Scale.Known() {
		f.Scale = strainfile.Scale(run)
	}
	m, err := model.Read(file, f)
	if err != nil {
		return nil, err
	}
	disp, err := runfolder.ReadField(runfolder.FieldPath(run, frame))
	if err != nil {
		return nil, err
	}
	disp.Index = index
	sf, _ := strainfile.ReadStrain(strainfile.StrainPath(run, frame)) // strain is optional
	opt := model.Options{}
	var res strainfile.ResolutionRecord
	if runfolder.Section(run, "resolution", &res) == nil {
		opt.Resolution = &res.Resolution
	}
	c, err := model.Compare(disp, sf, m, opt)
	if err != nil {
		return nil, err
	}
	out := filepath.Join(run, model.Dir)
	if err := model.Write(out, c); err != nil {
		return nil, err
	}
	if err := drawComparison(run, out, c, disp, sf); err != nil {
		return nil, err
	}
	return c, nil
}

// drawComparison writes out/compare_<quantity>.png for every compared
// quantity over the reference photo; without the photo (moved away) it
// draws none.
func drawComparison(run, out string, c *model.Comparison, disp *dic.Field, sf *strain.Field) error {
	var tr runfolder.TrackRecord
	if runfolder.Section(run, "track", &tr) != nil {
		return nil
	}
	in, err := openPhotos(tr.Images, tr.Reference, "", tr.Exclude, "")
	if err != nil {
		return nil
	}
	defer in.Seq.Close()
	g := disp.Grid
	for _, q := range c.Quantities {
		rq, err := render.QuantityNamed(q.String())
		if err != nil {
			continue
		}
		meas, mod, diff := make([]float64, g.Len()), make([]float64, g.Len()), make([]float64, g.Len())
		for i, d := range c.Points {
			v := measuredValue(q, disp, sf, i)
			meas[i], diff[i], mod[i] = v, d.Values[q], v-d.Values[q]
		}
		img, err := render.ModelSideBySide(in.Ref, &render.GridValues{Grid: g, Values: mod}, &render.GridValues{Grid: g, Values: meas},
			&render.GridValues{Grid: g, Values: diff}, rq, in.Mask, tr.MMPerPx, c.FrameName)
		if err != nil {
			continue
		}
		err = frames.WriteMat(filepath.Join(out, "compare_"+q.String()+".png"), img)
		img.Close()
		if err != nil {
			return err
		}
	}
	return nil
}

// measuredValue is the measured value of quantity q at grid point i (NaN
// where not measured).
func measuredValue(q model.Quantity, disp *dic.Field, sf *strain.Field, i int) float64 {
	switch q {
	case model.U, model.V:
		u, v := disp.Points[i].U()
		if q == model.U {
			return u
		}
		return v
	}
	if sf == nil || !sf.Points[i].Valid {
		return math.NaN()
	}
	s := &sf.Points[i]
	switch q {
	case model.Exx:
		return s.Exx
	case model.Eyy:
		return s.Eyy
	}
	return s.Exy
}
