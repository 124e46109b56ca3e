package export

import (
	"bytes"
	"errors"
	"math"
	"os"
	"path/filepath"
	"slices"
	"testing"

	"codeberg.org/sbinet/npyio/npy"
)

// The header follows format 1.0 of NEP 1 byte for byte: magic, version,
// little-endian length, the dict as NumPy writes it (one-element shapes as
// "(n,)"), space padding and a final newline, data aligned to 64 bytes.
func TestNPYHeaderLayout(t *testing.T) {
	for _, c := range []struct {
		dtype string
		shape []int
		dict  string
	}{
		{dtypeFloat64, []int{5}, "{'descr': '<f8', 'fortran_order': False, 'shape': (5,), }"},
		{dtypeFloat64, []int{3, 4}, "{'descr': '<f8', 'fortran_order': False, 'shape': (3, 4), }"},
		{dtypeUint8, []int{2000, 200, 200}, "{'descr': '|u1', 'fortran_order': False, 'shape': (2000, 200, 200), }"},
		{dtypeFloat64, nil, "{'descr': '<f8', 'fortran_order': False, 'shape': (), }"},
	} {
		h, err := npyHeader(c.dtype, c.shape)
		if err != nil {
			t.Fatal(err)
		}
		if len(h)%64 != 0 {
			t.Errorf("%v: header of %d bytes, want a multiple of 64", c.shape, len(h))
		}
		want := append([]byte("\x93NUMPY\x01\x00"), byte(len(h)-10), byte((len(h)-10)>>8))
		want = append(want, c.dict...)
		want = append(want, bytes.Repeat([]byte(" "), len(h)-len(want)-1)...)
		want = append(want, '\n')
		if !bytes.Equal(h, want) {
			t.Errorf("%v: header\n%q\nwant\n%q", c.shape, h, want)
		}
	}
	if _, err := npyHeader(dtypeFloat64, []int{2, -1}); err == nil {
		t.Error("a negative dimension must be refused")
	}
}

// A 2-D float64 array with NaN reads back through npyio, an independent
// reader, with its shape and every value; NaN stays NaN.
func TestWriteNPYReadByNpyio(t *testing.T) {
	vals := []float64{0, -1.5, math.NaN(), 1e-300, math.Inf(1), 7}
	var buf bytes.Buffer
	if err := writeNPY(&buf, dtypeFloat64, []int{2, 3}, vals); err != nil {
		t.Fatal(err)
	}
	r, err := npy.NewReader(bytes.NewReader(buf.Bytes()))
	if err != nil {
		t.Fatal(err)
	}
	if got := r.Header.Descr.Shape; !slices.Equal(got, []int{2, 3}) || r.Header.Descr.Type != "'<f8'" || r.Header.Descr.Fortran {
		t.Fatalf("npyio header: shape %v, descr %s, fortran %t; want [2 3] <f8 C order", got, r.Header.Descr.Type, r.Header.Descr.Fortran)
	}
	var got []float64
	if err := r.Read(&got); err != nil {
		t.Fatal(err)
	}
	if len(got) != len(vals) {
		t.Fatalf("npyio read %d values, want %d", len(got), len(vals))
	}
	for i := range vals {
		if math.Float64bits(got[i]) != math.Float64bits(vals[i]) {
			t.Errorf("value %d: %v, want %v bit for bit", i, got[i], vals[i])
		}
	}
	if err := writeNPY(&buf, dtypeFloat64, []int{2, 2}, vals); err == nil {
		t.Error("6 values for shape (2, 2) must be refused")
	}
}

// A stack streamed frame by frame is one (frames, rows, cols) array in C
// order: the spec parse and npyio agree on shape and values, for float64
// and for the uint8 codes.
func TestStackStreamsFrames(t *testing.T) {
	dir := t.TempDir()
	const frames, rows, cols = 3, 2, 4
	pf := filepath.Join(dir, "q.npy")
	pc := filepath.Join(dir, "status.npy")
	sf := newStack(pf, dtypeFloat64, frames, rows, cols)
	sc := newStack(pc, dtypeUint8, frames, rows, cols)
	val := func(k, i int) float64 { return float64(100*k+i) / 8 }
	for k := 0; k < frames; k++ {
		p, c := make([]float64, rows*cols), make([]float64, rows*cols)
		for i := range p {
			p[i], c[i] = val(k, i), float64((k+i)%7)
		}
		p[3] = math.NaN()
		if err := sf.add(p); err != nil {
			t.Fatal(err)
		}
		if err := sc.add(c); err != nil {
			t.Fatal(err)
		}
	}
	if err := sf.close(); err != nil {
		t.Fatal(err)
	}
	if err := sc.close(); err != nil {
		t.Fatal(err)
	}

	a := readNPYFile(t, pf)
	if !slices.Equal(a.shape, []int{frames, rows, cols}) {
		t.Fatalf("spec parse: shape %v, want [3 2 4]", a.shape)
	}
	vs := a.float64s(t)
	fh, err := os.Open(pf)
	if err != nil {
		t.Fatal(err)
	}
	defer fh.Close()
	r, err := npy.NewReader(fh)
	if err != nil {
		t.Fatal(err)
	}
	var viaNpyio []float64
	if err := r.Read(&viaNpyio); err != nil {
		t.Fatal(err)
	}
	if !slices.Equal(r.Header.Descr.Shape, a.shape) || len(viaNpyio) != frames*rows*cols || len(vs) != len(viaNpyio) {
		t.Fatalf("npyio: shape %v with %d values; spec parse %d values", r.Header.Descr.Shape, len(viaNpyio), len(vs))
	}
	for k := 0; k < frames; k++ {
		for i := 0; i < rows*cols; i++ {
			want := val(k, i)
			if i == 3 {
				want = math.NaN()
			}
			j := k*rows*cols + i // C order: frame, row, col
			if !near(vs[j], want, 0) || !near(viaNpyio[j], want, 0) {
				t.Errorf("frame %d point %d: spec %v, npyio %v, want %v", k, i, vs[j], viaNpyio[j], want)
			}
		}
	}

	c := readNPYFile(t, pc)
	if c.descr != "|u1" || !slices.Equal(c.shape, []int{frames, rows, cols}) || len(c.data) != frames*rows*cols {
		t.Fatalf("codes: descr %s shape %v, %d bytes", c.descr, c.shape, len(c.data))
	}
	if c.data[0] != 0 || c.data[9] != byte((1+1)%7) || c.data[23] != byte((2+7)%7) {
		t.Errorf("codes %v", c.data)
	}
	var codes []uint8
	if err := npy.Read(bytes.NewReader(mustRead(t, pc)), &codes); err != nil || !slices.Equal(codes, c.data) {
		t.Errorf("npyio codes %v (%v), want %v", codes, err, c.data)
	}
}

func mustRead(t *testing.T, path string) []byte {
	t.Helper()
	b, err := os.ReadFile(path)
	if err != nil {
		t.Fatal(err)
	}
	return b
}

// A stack closed before its last frame, or given one frame too many,
// fails and leaves neither the file nor a temporary behind: a stack that
// exists is complete (the run folder's atomic-write rule).
func TestStackIncompleteLeavesNothing(t *testing.T) {
	dir := t.TempDir()
	short := newStack(filepath.Join(dir, "short.npy"), dtypeFloat64, 3, 1, 2)
	short.add([]float64{1, 2})
	short.add([]float64{3, 4})
	if err := short.close(); !errors.Is(err, errIncomplete) {
		t.Errorf("closed after 2 of 3 frames: %v, want errIncomplete", err)
	}
	long := newStack(filepath.Join(dir, "long.npy"), dtypeFloat64, 1, 1, 2)
	long.add([]float64{1, 2})
	long.add([]float64{3, 4})
	if err := long.close(); err == nil {
		t.Error("a second frame for a 1-frame stack must fail")
	}
	bad := newStack(filepath.Join(dir, "bad.npy"), dtypeFloat64, 1, 1, 2)
	bad.add([]float64{1, 2, 3})
	if err := bad.close(); err == nil {
		t.Error("a plane of 3 values for 1×2 must fail")
	}
	if ents, _ := os.ReadDir(dir); len(ents) != 0 {
		t.Errorf("folder holds %v, want nothing", ents)
	}
}

// A stack whose file cannot be created reports it at the next add rather
// than after the last frame, and names the file.
func TestStackFailsEarly(t *testing.T) {
	p := filepath.Join(t.TempDir(), "missing-folder", "u.npy")
	s := newStack(p, dtypeFloat64, 1000, 1, 1)
	var err error
	for k := 0; k < 1000 && err == nil; k++ {
		err = s.add([]float64{1})
	}
	if err == nil || !bytes.Contains([]byte(err.Error()), []byte(p)) {
		t.Errorf("add into a missing folder: %v, want an error naming %s", err, p)
	}
	if cerr := s.close(); cerr == nil {
		t.Error("close after a failed write must report it")
	}
}
