package main

import (
	"encoding/json"
	"fmt"
	"os"
	"strconv"
	"strings"

	"github.com/spf13/cobra"

	"spallscope/cmd/spallscope/internal/progress"
	"spallscope/dic/synth"
)

func newSynthCmd() *cobra.Command {
	var (
		s         synth.Simple
		out, spec string
		size      string
		from, to  string
		printSpec bool
	)
	var kinds strings.Builder
	for _, k := range synth.FieldKinds {
		fmt.Fprintf(&kinds, "  %-12s %s\n", k.Name, k.About)
	}
	cmd := &cobra.Command{
		Use:   "synth --field KIND --out DIR",
		Short: "Render a synthetic speckle sequence with exact ground truth and a load log",
		Long: `synth renders a speckle-painted face deformed by a prescribed displacement
field, frame by frame, with the exact truth and a matching load log, so that
settings can be checked against known answers before (or instead of) a test.

Frames are rendered analytically: every ink spot of the pattern is moved and
deformed by the field itself, and each pixel integrates the light over its
area; no reference bitmap is interpolated.

Fields (--field):
` + kinds.String() + `
For anything richer (several fields, openings, spalling, a load history; also
"notch" — a V of two bands from one apex — and "kirsch_pair" — twin openings
as two superposed Kirsch fields) write the scenario as JSON: --print-spec prints the scenario the flags describe, to
edit and pass back with --spec. The demo scenario is 'spallscope demo'.

A real camera: the scenario's "lens" (fx_px, fy_px, cx_px, cy_px, k1, k2, k3,
p1, p2; the Brown–Conrady model of 'spallscope calibrate') shoots every frame
through that distortion, each pixel sample mapped through the lens's inverse
(the field, openings and truth stay in undistorted px). "targets" ({"board":
{"cols", "rows", "square_mm"}, "poses": N}) adds N chessboard photos through
the same camera at poses that cover the frame, for calibrate:
  targets/target_NN.png   chessboard photos
  lens_truth.json         the lens as a lens file, with the boards' poses

Output folder:
  frames/<name>.png   frames; frame 0 is the undeformed reference
  truth/<name>.csv    exact x,y,u,v,dudx,dudy,dvdx,dvdy,material on a grid (px)
  truth.json          scenario, each frame's time, stress and force, and each
                      damage feature's truth ("features": band, crack, notch,
                      spall; its opening and sector, hidden_start_frame,
                      detectable_frame at "detection" {vsg_px, limit}, and
                      its own γmax per frame, pointwise and over the VSG)
  loadlog.csv         time_s,force_kN,stroke_mm on the test frame's clock

Units: px for lengths in the image, MPa for stresses (compression positive as
given; tension positive in the truth's derived quantities), s for time.`,
		Example: `  spallscope synth --field kirsch --frames 20 --stress 30 --k 0.25 --out kirsch
  spallscope synth --field translation --u 3.4 --v -1.25 --depth 16 --noise 200 --out shift
  spallscope synth --field crack --from 256,200 --to 256,80 --opening 1.5 --start-frame 4 --out crack
  spallscope synth --field strain --eyy -0.004 --print-spec > mytest.json`,
		Args: cobra.NoArgs,
		RunE: func(cmd *cobra.Command, _ []string) error {
			var sc *synth.Scenario
			if spec != "" {
				var err error
				if sc, err = readScenario(spec); err != nil {
					return err
				}
			} else {
				var err error
				if s.Width, s.Height, err = parseSize(size); err != nil {
					return err
				}
				if s.From, err = parsePoint("--from", from); err != nil {
					return err
				}
				if s.To, err = parsePoint("--to", to); err != nil {
					return err
				}
				if sc, err = s.Scenario(); err != nil {
					return err
				}
			}
			if printSpec {
				enc := json.NewEncoder(cmd.OutOrStdout())
				enc.SetIndent("", "  ")
				return enc.Encode(sc)
			}
			if out == "" {
				return fmt.Errorf("synth: --out DIR is required")
			}
			r := reporter(cmd)
			defer r.Wait()
			truth, err := synth.Write(sc, out, progress.Task(r, "synth: render"))
			if err != nil {
				return err
			}
			last := truth.Frames[len(truth.Frames)-1]
			fmt.Fprintf(cmd.OutOrStdout(), "wrote %d frames of %dx%d px to %s (last: %.4g MPa, %.4g kN)\n",
				len(truth.Frames), sc.Width, sc.Height, out, last.Stress, last.Force)
			return nil
		},
	}
	f := cmd.Flags()
	f.StringVar(&out, "out", "", "output folder")
	f.StringVar(&spec, "spec", "", "scenario JSON file (as printed by --print-spec); other flags are ignored")
	f.BoolVar(&printSpec, "print-spec", false, "print the scenario as JSON and exit")
	f.StringVar(&s.Field, "field", "kirsch", "field kind (see above)")
	f.StringVar(&s.Name, "name", "", "frame name prefix (default: the field kind)")
	f.StringVar(&size, "size", "512x512", "image size WIDTHxHEIGHT in px")
	f.IntVar(&s.Frames, "frames", 10, "number of frames, including the reference")
	f.Float64Var(&s.FPS, "fps", 1, "frames per second")
	f.StringVar(&s.Format, "format", "png", "frame file format: png or tif")
	f.Float64Var(&s.Pattern.Radius, "speckle-radius", 2.5, "ink spot radius in px (visible speckles are about 2–3 radii across)")
	f.Float64Var(&s.Pattern.Coverage, "coverage", 0.5, "inked fraction of the face, 0–1")
	f.Uint64Var(&s.Pattern.Seed, "seed", 1, "random seed of the pattern")
	f.IntVar(&s.Camera.Depth, "depth", 8, "bit depth: 8 or 16")
	f.Float64Var(&s.Camera.Noise, "noise", 0, "sensor noise standard deviation in gray levels of the depth")
	f.Float64Var(&s.Camera.Blur, "blur", 0, "optical blur standard deviation in px")
	f.IntVar(&s.Camera.Oversample, "oversample", 2, "Gauss–Legendre points per pixel side for pixel integration, 1–4")
	f.Float64Var(&s.U, "u", 0, "translation: horizontal displacement in px at the last frame")
	f.Float64Var(&s.V, "v", 0, "translation: vertical displacement in px at the last frame (down positive)")
	f.BoolVar(&s.Fourier, "fourier", false, "translation: render by the Fourier shift theorem (exact for a periodic pattern)")
	f.Float64Var(&s.AngleDeg, "angle", 0, "rotation: degrees at the last frame (x towards y)")
	f.Float64Var(&s.Exx, "exx", 0, "strain: exx at the last frame")
	f.Float64Var(&s.Eyy, "eyy", 0, "strain: eyy at the last frame")
	f.Float64Var(&s.Exy, "exy", 0, "strain: tensor shear exy at the last frame")
	f.Float64Var(&s.Radius, "radius", 0, "kirsch: opening radius in px (default a tenth of the smaller side)")
	f.Float64Var(&s.Stress, "stress", 40, "peak far-field vertical stress in MPa (compression positive)")
	f.Float64Var(&s.K, "k", 0, "kirsch: lateral to vertical far-field stress ratio")
	f.Float64Var(&s.E, "E", 20000, "kirsch: Young's modulus in MPa")
	f.Float64Var(&s.Nu, "nu", 0.2, "kirsch: Poisson's ratio")
	f.BoolVar(&s.PlaneStress, "plane-stress", false, "kirsch: plane stress instead of plane strain")
	f.Float64Var(&s.Amplitude, "amplitude", 0.5, "sine-sweep: amplitude in px")
	f.Float64Var(&s.PeriodMin, "period-min", 10, "sine-sweep: period at the top row in px")
	f.Float64Var(&s.PeriodMax, "period-max", 0, "sine-sweep: period at the bottom row in px (default half the width)")
	f.StringVar(&from, "from", "0,0", "crack/band: mouth X,Y in px")
	f.StringVar(&to, "to", "0,0", "crack/band: tip X,Y in px at full length")
	f.Float64Var(&s.Opening, "opening", 1, "crack: opening at the mouth in px at full length")
	f.Float64Var(&s.Slip, "slip", 1, "band: slip in px at full length")
	f.Float64Var(&s.HalfWidth, "half-width", 3, "band: half-width in px")
	f.IntVar(&s.StartFrame, "start-frame", 1, "crack/band: first frame in which it shows")
	f.Float64Var(&s.MMPerPx, "mm-per-px", 0.1, "image scale in mm per px")
	f.Float64Var(&s.ThicknessMM, "thickness", 50, "specimen thickness in mm (loaded area = image width × thickness)")
	return cmd
}

// readScenario reads a scenario JSON file, rejecting unknown keys.
func readScenario(path string) (*synth.Scenario, error) {
	data, err := os.ReadFile(path)
	if err != nil {
		return nil, err
	}
	dec := json.NewDecoder(strings.NewReader(string(data)))
	dec.DisallowUnknownFields()
	var sc synth.Scenario
	if err := dec.Decode(&sc); err != nil {
		return nil, fmt.Errorf("scenario %s: %w", path, err)
	}
	if err := sc.Validate(); err != nil {
		return nil, fmt.Errorf("scenario %s: %w", path, err)
	}
	return &sc, nil
}

// parseSize parses "WIDTHxHEIGHT".
func parseSize(s string) (int, int, error) {
	w, h, ok := strings.Cut(strings.ToLower(s), "x")
	wi, err1 := strconv.Atoi(w)
	hi, err2 := strconv.Atoi(h)
	if !ok || err1 != nil || err2 != nil || wi <= 0 || hi <= 0 {
		return 0, 0, fmt.Errorf("--size %q, expected WIDTHxHEIGHT in px such as 512x384", s)
	}
	return wi, hi, nil
}

// parsePoint parses "X,Y".
func parsePoint(flag, s string) ([2]float64, error) {
	a, b, ok := strings.Cut(s, ",")
	x, err1 := strconv.ParseFloat(strings.TrimSpace(a), 64)
	y, err2 := strconv.ParseFloat(strings.TrimSpace(b), 64)
	if !ok || err1 != nil || err2 != nil {
		return [2]float64{}, fmt.Errorf("%s %q, expected X,Y in px such as 256,120", flag, s)
	}
	return [2]float64{x, y}, nil
}
