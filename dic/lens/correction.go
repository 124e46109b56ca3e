package lens

import (
	"fmt"
	"math"

	"spallscope/dic"
	"spallscope/dic/region"
	"spallscope/subset"
)

// Correction takes a lens's distortion out of tracked displacement fields.
//
// A tracked field lives in photo pixels: its grid is regular in the photo.
// The corrected field lives in ideal pixels, on the same grid read as
// ideal pixels, so that the strain window, which differentiates over a
// regular grid, differentiates with respect to undistorted positions. For
// each corrected grid point P (ideal px):
//
//  1. its reference position in the photo is p = Distort(P);
//  2. its deformed position in the photo is p + u(p), where u(p) is the
//     measured warp of the subset whose centre is nearest p, evaluated at
//     p (the subset's own shape function, within half a grid step of its
//     centre, inside the subset it was fitted on);
//  3. that position is undistorted, P' = Undistort(p + u(p)), and the
//     corrected displacement is P' − P, the difference of the two
//     undistorted positions;
//  4. the displacement gradient follows by the chain rule,
//     I + ∇U = J(P')⁻¹ · (I + ∇u) · J(P), with J the Jacobian of Distort.
//
// A corrected point takes the status, ZNCC and iterations of the subset it
// came from. It is masked when p falls on an unmeasured pixel of the
// mask, and out of image when p lies beyond half a step from the tracked
// grid or does not undistort. Second-order shape terms of the corrected
// field are left zero (the strain window does not use them).
type Correction struct {
	Model Model
	// Mask is the photo's measured-pixel mask (nil: every pixel measured).
	Mask *region.Mask
}

// NewCorrection checks the model against the photo size and returns the
// correction for photos of that size with the given mask.
func NewCorrection(m Model, width, height int, mask *region.Mask) (*Correction, error) {
	if err := m.Validate(); err != nil {
		return nil, err
	}
	if m.Width != width || m.Height != height {
		return nil, fmt.Errorf("the lens was calibrated for %dx%d px photos, these are %dx%d px", m.Width, m.Height, width, height)
	}
	if mask != nil && (mask.Width != width || mask.Height != height) {
		return nil, fmt.Errorf("mask %dx%d px for %dx%d px photos", mask.Width, mask.Height, width, height)
	}
	return &Correction{Model: m, Mask: mask}, nil
}

// Field returns the corrected field of tracked field f (see Correction).
// f is not changed.
func (c *Correction) Field(f *dic.Field) *dic.Field {
	g := f.Grid
	out := &dic.Field{Index: f.Index, Name: f.Name, Reference: f.Reference, Grid: g, Points: make([]dic.Point, g.Len())}
	m := &c.Model
	step := float64(g.Step)
	for i := range out.Points {
		X, Y := g.Pos(i)
		q := &out.Points[i]
		q.X, q.Y, q.Status = X, Y, subset.OutOfImage
		px, py := m.Distort(float64(X), float64(Y))
		col := int(math.Round((px - float64(g.X0)) / step))
		row := int(math.Round((py - float64(g.Y0)) / step))
		j := g.Index(col, row)
		if j < 0 || j >= len(f.Points) {
			continue
		}
		if !c.measured(px, py) {
			q.Status = subset.Masked
			continue
		}
		src := &f.Points[j]
		q.ZNCC, q.Iterations, q.Status = src.ZNCC, src.Iterations, src.Status
		if !src.Valid() {
			continue
		}
		dx, dy := px-float64(src.X), py-float64(src.Y)
		wx, wy := src.P.Warp(dx, dy) // the deformed position, as an offset from the subset centre
		// The photo displacement gradient at the offset, from the shape
		// function (constant for the affine one).
		p := &src.P
		ux, uy := p[subset.PUx]+p[subset.PUxx]*dx+p[subset.PUxy]*dy, p[subset.PUy]+p[subset.PUxy]*dx+p[subset.PUyy]*dy
		vx, vy := p[subset.PVx]+p[subset.PVxx]*dx+p[subset.PVxy]*dy, p[subset.PVy]+p[subset.PVxy]*dx+p[subset.PVyy]*dy
		DX, DY, ok := m.Undistort(float64(src.X)+wx, float64(src.Y)+wy)
		if !ok {
			q.Status = subset.OutOfImage
			continue
		}
		// I + ∇U = J(P')⁻¹ (I + ∇u) J(P).
		a := m.Jacobian(float64(X), float64(Y))
		b := m.Jacobian(DX, DY)
		f11, f12, f21, f22 := 1+ux, uy, vx, 1+vy
		m11, m12 := f11*a[0]+f12*a[2], f11*a[1]+f12*a[3]
		m21, m22 := f21*a[0]+f22*a[2], f21*a[1]+f22*a[3]
		det := b[0]*b[3] - b[1]*b[2]
		i11, i12, i21, i22 := b[3]/det, -b[1]/det, -b[2]/det, b[0]/det
		q.P = subset.Params{}
		q.P[subset.PU], q.P[subset.PV] = DX-float64(X), DY-float64(Y)
		q.P[subset.PUx] = i11*m11 + i12*m21 - 1
		q.P[subset.PUy] = i11*m12 + i12*m22
		q.P[subset.PVx] = i21*m11 + i22*m21
		q.P[subset.PVy] = i21*m12 + i22*m22 - 1
	}
	return out
}

// measured reports whether photo position (x, y) falls on a measured
// pixel of the mask (and inside the photo).
func (c *Correction) measured(x, y float64) bool {
	ix, iy := int(math.Round(x)), int(math.Round(y))
	if ix < 0 || iy < 0 || ix >= c.Model.Width || iy >= c.Model.Height {
		return false
	}
	return c.Mask == nil || c.Mask.Pix[iy*c.Mask.Width+ix] != 0
}

// Length returns the distance in ideal pixels between photo pixels
// (x1, y1) and (x2, y2): a scale bar measured on a photo, undistorted.
func (m *Model) Length(x1, y1, x2, y2 float64) (float64, error) {
	X1, Y1, ok1 := m.Undistort(x1, y1)
	X2, Y2, ok2 := m.Undistort(x2, y2)
	if !ok1 || !ok2 {
		return 0, fmt.Errorf("the scale line (%g, %g)–(%g, %g) does not undistort", x1, y1, x2, y2)
	}
	return math.Hypot(X2-X1, Y2-Y1), nil
}
