package render

import (
	"context"
	"encoding/json"
	"errors"
	"fmt"
	"image"
	"io/fs"
	"math"
	"os"
	"path/filepath"
	"slices"
	"strconv"
	"strings"

	"gocv.io/x/gocv"

	"spallscope/dic"
	"spallscope/dic/frames"
	"spallscope/dic/lens"
	"spallscope/dic/region"
	"spallscope/dic/runfolder"
	"spallscope/strain/strainfile"
	"spallscope/subset"
)

// OverlaysDir is the run-folder folder Run writes the overlay images to,
// one PNG per frame named after it (the folder the report page reads).

// Photos to draw on.
const (
	OnReference = "reference" // the reference photo, fields where measured
	OnCurrent   = "current"   // each frame's photo, fields moved with the material
)

// DefaultVectorEvery is the default spacing of arrows, in grid points.
const DefaultVectorEvery = 4

// Options set up Run.
type Options struct {
	// Field is the quantity to show (see Quantities; default "e1").
	Field string
	// On is OnReference (default) or OnCurrent.
	On string
	// Limits is "sequence" (default), "auto" or "MIN,MAX" (see ParseLimits);
	// LowPct and HighPct are the percentiles of automatic limits (default
	// 1 and 99).
	Limits          string
	LowPct, HighPct float64
	// Alpha is the field's opacity (default DefaultAlpha).
	Alpha float64
	// Vectors adds displacement arrows at every VectorEvery-th grid point
	// (default DefaultVectorEvery), with one gain for the whole sequence.
	Vectors     bool
	VectorEvery int
	// Video also writes the overlays as a video of Format (VideoMP4, the
	// default, or VideoAVI) at FPS frames per second (default DefaultFPS),
	// with the raw frame to the left when SideBySide.
	Video      bool
	Format     string
	FPS        float64
	SideBySide bool
	// VideoWidth is the video's frame width in px (0: DefaultVideoWidth;
	// negative: the overlays' own size); wider frames are scaled down to
	// it, keeping their shape. The PNGs keep the photo's pixels.
	VideoWidth int
	// Images replaces the photo sequence recorded by the track stage (when
	// the photos have moved).
	Images string
	// Progress, if set, is called after each frame.
	Progress func(done, total int)
}

// Result says what Run wrote.
type Result struct {
	Quantity Quantity
	Limits   Limits
	Unit     Unit
	// Frames is the number of overlays, Dir their folder.
	Frames int
	Dir    string
	// Video is the video file written (empty without one), VideoFormat its
	// format.
	Video, VideoFormat string
	// Notes are things the user should know (a format fallback, missing
	// zone outlines).
	Notes []string
}

// Run draws the overlays of run folder dir: for every frame of the track
// record, opt.Field over the reference photo (or the frame's own photo),
// written to dir/overlays/<frame>.png, and with opt.Video the video
// dir/video.mp4 (or .avi). Limits default to robust percentiles over the
// whole sequence, so a colour means the same value in every frame. Zone
// outlines (zones.csv, zone_cells.csv), onset badges (onset.json, from the
// onset's frame on), frame times and nominal stress (run.json's timeline)
// are drawn when the run folder has them. Run stops between frames when
// ctx is done, with ctx's error; the video is then not written.
func Run(ctx context.Context, dir string, opt Options) (Result, error) {
	if opt.Field == "" {
		opt.Field = "e1"
	}
	q, err := QuantityNamed(opt.Field)
	if err != nil {
		return Result{}, err
	}
	switch opt.On {
	case "":
		opt.On = OnReference
	case OnReference, OnCurrent:
	default:
		return Result{}, fmt.Errorf("photo %q: expected %s or %s", opt.On, OnReference, OnCurrent)
	}
	if opt.LowPct == 0 && opt.HighPct == 0 {
		opt.LowPct, opt.HighPct = DefaultLowPercentile, DefaultHighPercentile
	}
	if opt.VectorEvery == 0 {
		opt.VectorEvery = DefaultVectorEvery
	}
	if opt.FPS == 0 {
		opt.FPS = DefaultFPS
	}
	if opt.Format == "" {
		opt.Format = VideoMP4
	}
	if opt.VideoWidth == 0 {
		opt.VideoWidth = DefaultVideoWidth
	}
	rr, err := openRenderRun(dir, opt)
	if err != nil {
		return Result{}, err
	}
	defer rr.seq.Close()
	spec, err := ParseLimits(opt.Limits, q, rr.scale)
	if err != nil {
		return Result{}, err
	}
	res := Result{Quantity: q, Dir: filepath.Join(dir, OverlaysDir), Notes: rr.notes}

	// First pass: sequence-wide limits and arrow gain.
	var lim Limits
	gain := 0.0
	if spec.Mode == LimitsSequence || opt.Vectors {
		var pool, mags Pool
		// The strain files are parsed on all cores, used in frame order.
		read := func(k int) (frameData, error) { return rr.frameValues(q, rr.names[k], opt.Vectors) }
		err := runfolder.ReadInOrder(len(rr.names), read, func(_ int, fv frameData) error {
			pool.Add(fv.values.Values)
			if opt.Vectors {
				m := make([]float64, len(fv.u.Values))
				for i := range m {
					m[i] = math.Hypot(fv.u.Values[i], fv.v.Values[i])
				}
				mags.Add(m)
			}
			return nil
		})
		if err != nil {
			return res, err
		}
		if spec.Mode == LimitsSequence {
			if lim, err = AutoLimits(q, &pool, LimitsSequence, opt.LowPct, opt.HighPct); err != nil {
				return res, fmt.Errorf("run folder %s: %w", dir, err)
			}
		}
		if opt.Vectors && mags.Len() > 0 {
			xs := slices.Clone(mags.vals)
			slices.Sort(xs)
			if p := Percentile(xs, 99); p > 0 {
				gain = 0.9 * float64(opt.VectorEvery*rr.grid.Step) / p
			}
		}
	}
	if spec.Mode == LimitsFixed {
		lim = spec.Fixed(q)
	}

	if err := os.MkdirAll(res.Dir, 0o755); err != nil {
		return res, err
	}
	var video *VideoWriter
	defer func() {
		if video != nil {
			video.Abort()
		}
	}()
	for k, name := range rr.names {
		if err := ctx.Err(); err != nil {
			return res, fmt.Errorf("render stopped before frame %s: %w", name, context.Cause(ctx))
		}
		fv, err := rr.frameValues(q, name, opt.On == OnCurrent || opt.Vectors)
		if err != nil {
			return res, err
		}
		if spec.Mode == LimitsFrame {
			var pool Pool
			pool.Add(fv.values.Values)
			if lim, err = AutoLimits(q, &pool, LimitsFrame, opt.LowPct, opt.HighPct); err != nil {
				return res, fmt.Errorf("frame %s: %w", name, err)
			}
		}
		photo, err := rr.photo(name, opt.On)
		if err != nil {
			return res, err
		}
		ov := rr.overlayOptions(q, lim, k, name)
		ov.Alpha = opt.Alpha
		if opt.On == OnCurrent {
			ov.Deform = &Deformation{U: fv.u, V: fv.v}
		}
		if opt.Vectors {
			ov.Vectors = &Vectors{U: fv.u, V: fv.v, Every: opt.VectorEvery, Gain: gain}
		}
		canvas, err := Overlay(photo, fv.values, ov)
		if err != nil {
			return res, err
		}
		if err := frames.WritePNGStripes(filepath.Join(res.Dir, name+".png"), canvas); err != nil {
			canvas.Close()
			return res, fmt.Errorf("frame %s: %w", name, err)
		}
		if opt.Video {
			err = rr.writeVideoFrame(&video, canvas, name, opt, filepath.Join(dir, VideoFile(opt.Format)))
		}
		canvas.Close()
		if err != nil {
			return res, err
		}
		res.Frames++
		if opt.Progress != nil {
			opt.Progress(k+1, len(rr.names))
		}
	}
	res.Limits, res.Unit = lim, q.Unit(lim, rr.scale)
	if video != nil {
		v := video
		video = nil
		if err := v.Close(); err != nil {
			return res, err
		}
		res.Video, res.VideoFormat = v.Path(), v.Format()
		if v.Note != "" {
			res.Notes = append(res.Notes, v.Note)
		}
	}
	return res, nil
}

// renderRun is what Run reads from a run folder once.
type renderRun struct {
	dir      string
	names    []string
	seq      frames.Sequence
	seqIndex map[string]int
	ref      *subset.Image
	keep     *region.Mask
	lens     *lens.Model // the fields' lens correction (nil: none)
	grid     dic.Grid
	scale    dic.Scale
	times    map[string]float64
	stress   map[string]float64
	peak     float64
	zones    map[string][]ZoneOutline
	onsets   []strainfile.OnsetRecord
	res      *strainfile.ResolutionRecord
	notes    []string
	buffers  overlayBuffers // the overlays' arrays, reused from frame to frame
}

// openRenderRun reads the run folder's records and opens its photos.
func openRenderRun(dir string, opt Options) (*renderRun, error) {
	rr := &renderRun{dir: dir, times: map[string]float64{}, stress: map[string]float64{}, zones: map[string][]ZoneOutline{}}
	var err error
	if rr.names, err = runfolder.Frames(dir); err != nil {
		return nil, err
	}
	var tr runfolder.TrackRecord
	if err := runfolder.Section(dir, "track", &tr); err != nil {
		return nil, fmt.Errorf("run folder %s: no track record to find the photos (%w)", dir, err)
	}
	rr.grid, rr.scale = tr.Grid, strainfile.Scale(dir)
	images := opt.Images
	if images == "" {
		images = tr.Images
	}
	if images == "" {
		return nil, fmt.Errorf("run folder %s: the track record names no photos; give them with --images", dir)
	}
	if rr.seq, err = frames.Open(resolveRunPath(dir, images)); err != nil {
		return nil, fmt.Errorf("run folder %s: photos %s: %w (give them with --images if they moved)", dir, images, err)
	}
	ok := false
	defer func() {
		if !ok {
			rr.seq.Close()
		}
	}()
	rr.seqIndex = map[string]int{}
	for i := 0; i < rr.seq.Len(); i++ {
		rr.seqIndex[rr.seq.Name(i)] = i
	}
	if rr.ref, err = rr.reference(tr.Reference); err != nil {
		return nil, err
	}
	var layout region.Layout
	for _, s := range tr.Exclude {
		sh, err := region.ParseShape(s)
		if err != nil {
			return nil, fmt.Errorf("run folder %s: track record exclusion: %w", dir, err)
		}
		layout.Exclude = append(layout.Exclude, sh)
	}
	if len(layout.Exclude) > 0 {
		if rr.keep, err = layout.Rasterise(rr.ref.Width, rr.ref.Height); err != nil {
			return nil, fmt.Errorf("run folder %s: %w", dir, err)
		}
	}
	if tr.Lens != nil {
		path := resolveRunPath(dir, tr.Lens.File)
		m, err := lens.Read(path)
		changed := tr.Lens.Unchanged(path)
		switch {
		case err != nil:
			rr.notes = append(rr.notes, fmt.Sprintf("the fields are corrected for the lens %s, which cannot be read (%v): they are drawn at their undistorted positions, off the photos by the lens's distortion towards the frame's corners", path, err))
		case changed != nil:
			rr.notes = append(rr.notes, fmt.Sprintf("%v: the fields are drawn at their undistorted positions, not through the changed lens", changed))
		case m.Width != rr.ref.Width || m.Height != rr.ref.Height:
			rr.notes = append(rr.notes, fmt.Sprintf("the lens %s is for %dx%d px photos, these are %dx%d px: the fields are drawn at their undistorted positions", path, m.Width, m.Height, rr.ref.Width, rr.ref.Height))
		default:
			rr.lens = &m
		}
	}
	for k, name := range tr.Frames {
		if k < len(tr.Times) {
			rr.times[name] = tr.Times[k]
		}
	}
	var tl strainfile.TimelineRecord
	if runfolder.Section(dir, "timeline", &tl) == nil {
		for k, name := range tl.Frames {
			if k < len(tl.Times) {
				rr.times[name] = tl.Times[k]
			}
			if k < len(tl.Stress) && (k >= len(tl.InSpan) || tl.InSpan[k]) {
				rr.stress[name] = tl.Stress[k]
			}
		}
	}
	var load runfolder.LoadRecord
	if runfolder.Section(dir, "load", &load) == nil {
		rr.peak = load.Peak
	}
	if err := rr.readOnsets(); err != nil {
		return nil, err
	}
	if err := rr.readZones(); err != nil {
		return nil, err
	}
	var res strainfile.ResolutionRecord
	if runfolder.Section(dir, "resolution", &res) == nil {
		rr.res = &res
	}
	ok = true
	return rr, nil
}

// resolveRunPath returns p as given when it exists, else relative to the run
// folder (a run folder moved with its photos).
func resolveRunPath(dir, p string) string {
	if filepath.IsAbs(p) || strings.ContainsAny(p, "*?[") {
		return p
	}
	if _, err := os.Stat(p); err == nil {
		return p
	}
	if alt := filepath.Join(dir, p); runFileExists(alt) {
		return alt
	}
	return p
}

// runFileExists reports whether a file or folder is there.
func runFileExists(p string) bool {
	_, err := os.Stat(p)
	return err == nil
}

// reference reads the reference photo named by the track record: a frame
// index of the sequence or an image file.
func (rr *renderRun) reference(spec string) (*subset.Image, error) {
	if spec == "" {
		spec = "0"
	}
	if n, err := strconv.Atoi(spec); err == nil {
		if n < 0 || n >= rr.seq.Len() {
			return nil, fmt.Errorf("run folder %s: reference frame %d, the photos have frames 0..%d", rr.dir, n, rr.seq.Len()-1)
		}
		img, err := rr.seq.Read(n)
		if err != nil {
			return nil, fmt.Errorf("run folder %s: reference photo: %w", rr.dir, err)
		}
		return img, nil
	}
	img, err := frames.ReadImage(resolveRunPath(rr.dir, spec))
	if err != nil {
		return nil, fmt.Errorf("run folder %s: reference photo: %w", rr.dir, err)
	}
	return img, nil
}

// photo returns the photo to draw frame name on.
func (rr *renderRun) photo(name, on string) (*subset.Image, error) {
	if on == OnReference {
		return rr.ref, nil
	}
	i, ok := rr.seqIndex[name]
	if !ok {
		return nil, fmt.Errorf("frame %s: not in the photo sequence (%d frames)", name, rr.seq.Len())
	}
	img, err := rr.seq.Read(i)
	if err != nil {
		return nil, fmt.Errorf("frame %s: %w", name, err)
	}
	return img, nil
}

// readOnsets reads onset.json when the run has one.
func (rr *renderRun) readOnsets() error {
	path := filepath.Join(rr.dir, strainfile.OnsetJSON)
	data, err := os.ReadFile(path)
	if errors.Is(err, fs.ErrNotExist) {
		return nil
	}
	if err != nil {
		return err
	}
	var rep strainfile.OnsetReport
	if err := json.Unmarshal(data, &rep); err != nil {
		return fmt.Errorf("%s: %w", path, err)
	}
	rr.onsets = rep.Onsets
	if rr.peak == 0 {
		rr.peak = rep.Peak.Stress
	}
	return nil
}

// readZones reads the zones and their grid points when the run has them.
func (rr *renderRun) readZones() error {
	if !runFileExists(filepath.Join(rr.dir, strainfile.ZonesCSV)) {
		return nil
	}
	if !runFileExists(filepath.Join(rr.dir, strainfile.ZoneCellsCSV)) {
		rr.notes = append(rr.notes, fmt.Sprintf("no zone outlines: %s has no %s (run zones again to write it)", rr.dir, strainfile.ZoneCellsCSV))
		return nil
	}
	zs, err := strainfile.ReadZones(rr.dir)
	if err != nil {
		return err
	}
	for _, z := range zs {
		rr.zones[z.Frame] = append(rr.zones[z.Frame], ZoneOutline{Cells: z.Cells, Class: z.Class})
	}
	return nil
}

// frameData is what one frame contributes: the values shown and, when
// asked for, the displacement.
type frameData struct {
	values *GridValues
	u, v   *GridValues
}

// frameValues reads frame name's values of q and, with disp, its
// displacement.
func (rr *renderRun) frameValues(q Quantity, name string, disp bool) (frameData, error) {
	var fd frameData
	var df *dic.Field
	if !q.NeedsStrain() || disp {
		f, err := runfolder.ReadField(runfolder.FieldPath(rr.dir, name))
		if err != nil {
			return fd, err
		}
		df = f
	}
	var err error
	if q.NeedsStrain() {
		sf, err := strainfile.ReadStrain(strainfile.StrainPath(rr.dir, name))
		if err != nil {
			if errors.Is(err, fs.ErrNotExist) {
				return fd, fmt.Errorf("frame %s: no strain file (run strain first, or show u, v, disp or zncc): %w", name, err)
			}
			return fd, err
		}
		fd.values, err = q.StrainValues(sf)
		if err != nil {
			return fd, err
		}
	} else if fd.values, err = q.DisplacementValues(df); err != nil {
		return fd, err
	}
	if disp {
		uq, _ := QuantityNamed("u")
		vq, _ := QuantityNamed("v")
		if fd.u, err = uq.DisplacementValues(df); err != nil {
			return fd, err
		}
		if fd.v, err = vq.DisplacementValues(df); err != nil {
			return fd, err
		}
	}
	return fd, nil
}

// overlayOptions returns the drawing options of frame k, name.
func (rr *renderRun) overlayOptions(q Quantity, lim Limits, k int, name string) OverlayOptions {
	ov := OverlayOptions{Quantity: q, Limits: lim, Scale: rr.scale, Keep: rr.keep, Lens: rr.lens,
		Zones: rr.zones[name], ReserveZones: len(rr.zones) > 0, ReserveOnsets: len(rr.onsets), buffers: &rr.buffers}
	ov.Stamp = Stamp{Frame: name, Peak: rr.peak}
	if t, ok := rr.times[name]; ok {
		ov.Stamp.Time, ov.Stamp.HasTime = t, true
	}
	if s, ok := rr.stress[name]; ok {
		ov.Stamp.Stress, ov.Stamp.HasStress = s, true
	}
	for n, o := range rr.onsets {
		if o.Frame > k {
			continue
		}
		ov.Onsets = append(ov.Onsets, OnsetMark{X: o.Cx, Y: o.Cy, Number: n + 1, Legend: onsetLegend(o)})
	}
	ov.Notes = rr.resolutionNotes(q)
	return ov
}

// onsetLegend is an onset's panel line: class, place and nominal stress.
func onsetLegend(o strainfile.OnsetRecord) string {
	place := string(o.Sector)
	if o.OpeningName != "" {
		place += " " + o.OpeningName
	}
	s := o.Class + ", " + place
	if o.InSpan {
		s += fmt.Sprintf(", %.1f MPa", o.Stress)
	} else {
		s += ", frame " + o.Name
	}
	return s
}

// resolutionNotes states the virtual strain gauge and the noise floor of q
// measured on the static frames, when the run has them.
func (rr *renderRun) resolutionNotes(q Quantity) []string {
	if rr.res == nil {
		return nil
	}
	r := rr.res
	var notes []string
	if r.VSG > 0 {
		s := fmt.Sprintf("VSG %d px", r.VSG)
		if r.VSGmm > 0 {
			s += fmt.Sprintf(" (%.3g mm)", r.VSGmm)
		}
		notes = append(notes, s+fmt.Sprintf(", step %d px, subset %d px", r.Step, r.Subset))
	}
	noise := map[string]float64{"exx": r.Exx, "eyy": r.Eyy, "exy": r.Exy, "e1": r.E1, "e2": r.E2,
		"gamma_max": r.GammaMax, "e_eq": r.Eeq, "u": r.U, "v": r.V}
	if n, ok := noise[q.Name]; ok && n > 0 {
		switch q.Kind {
		case StrainKind:
			notes = append(notes, fmt.Sprintf("noise floor %s %.0f µε (%d static frames)", q.Symbol, n*1e6, r.Frames))
		case DisplacementKind:
			notes = append(notes, fmt.Sprintf("noise floor %s %.4f px (%d static frames)", q.Symbol, n, r.Frames))
		}
	}
	return notes
}

// writeVideoFrame appends canvas (beside the raw frame with SideBySide) to
// the video, creating it at the first frame.
func (rr *renderRun) writeVideoFrame(video **VideoWriter, canvas gocv.Mat, name string, opt Options, path string) error {
	frame := canvas
	if opt.SideBySide {
		raw, err := rr.photo(name, OnCurrent)
		if err != nil {
			return err
		}
		sb, err := SideBySide(raw, canvas)
		if err != nil {
			return fmt.Errorf("frame %s: %w", name, err)
		}
		defer sb.Close()
		frame = sb
	}
	if opt.VideoWidth > 0 && frame.Cols() > opt.VideoWidth {
		h := max(1, int(math.Round(float64(frame.Rows())*float64(opt.VideoWidth)/float64(frame.Cols()))))
		small := gocv.NewMat()
		defer small.Close()
		gocv.Resize(frame, &small, image.Pt(opt.VideoWidth, h), 0, 0, gocv.InterpolationArea)
		frame = small
	}
	if *video == nil {
		v, err := CreateVideo(path, opt.Format, opt.FPS, frame.Cols(), frame.Rows())
		if err != nil {
			return err
		}
		*video = v
	}
	return (*video).Write(frame, name)
}
