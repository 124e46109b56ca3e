package export

import (
	"encoding/binary"
	"fmt"
	"io"
	"math"
	"strconv"
	"strings"
)

// The NPY dtypes written here, as the descr strings of the format.
const (
	dtypeFloat64 = "<f8" // little-endian IEEE 754 binary64
	dtypeUint8   = "|u1" // one byte, no byte order
)

// npyMagic opens every NPY file; version 1.0 follows.
const npyMagic = "\x93NUMPY"

// npyAlign is the alignment of the data start: the total header length is
// a multiple of it (64, which NumPy uses, is also a multiple of the 16 the
// format proposal asks for).
const npyAlign = 64

// npyHeader returns the NPY format 1.0 header of a C-order array of dtype
// and shape: magic, version 1.0, the little-endian uint16 length of the
// dict, and the dict literal padded with spaces and ended by a newline.
// The dict is written the way NumPy writes it, keys in the order descr,
// fortran_order, shape and a trailing ", }", which simple readers expect.
func npyHeader(dtype string, shape []int) ([]byte, error) {
	dims := make([]string, len(shape))
	for i, n := range shape {
		if n < 0 {
			return nil, fmt.Errorf("npy: negative dimension %d in shape %v", n, shape)
		}
		dims[i] = strconv.Itoa(n)
	}
	tuple := "(" + strings.Join(dims, ", ") + ")"
	if len(shape) == 1 {
		tuple = "(" + dims[0] + ",)" // a one-element Python tuple
	}
	dict := "{'descr': '" + dtype + "', 'fortran_order': False, 'shape': " + tuple + ", }"
	pre := len(npyMagic) + 2 + 2 // magic, version, header length
	total := (pre + len(dict) + 1 + npyAlign - 1) / npyAlign * npyAlign
	n := total - pre
	if n > math.MaxUint16 {
		return nil, fmt.Errorf("npy: header of %d bytes does not fit format 1.0", n)
	}
	h := make([]byte, 0, total)
	h = append(h, npyMagic...)
	h = append(h, 1, 0)
	h = binary.LittleEndian.AppendUint16(h, uint16(n))
	h = append(h, dict...)
	for len(h) < total-1 {
		h = append(h, ' ')
	}
	return append(h, '\n'), nil
}

// appendValues appends vs in dtype's byte layout: float64 bits little-end
// first (NaN keeps its bit pattern), or one byte per value for codes.
func appendValues(buf []byte, dtype string, vs []float64) []byte {
	switch dtype {
	case dtypeUint8:
		for _, v := range vs {
			buf = append(buf, byte(v))
		}
	default:
		for _, v := range vs {
			buf = binary.LittleEndian.AppendUint64(buf, math.Float64bits(v))
		}
	}
	return buf
}

// writeNPY writes a whole small array (positions, times) in one go.
func writeNPY(w io.Writer, dtype string, shape []int, vs []float64) error {
	n := 1
	for _, d := range shape {
		n *= d
	}
	if n != len(vs) {
		return fmt.Errorf("npy: %d values for shape %v", len(vs), shape)
	}
	h, err := npyHeader(dtype, shape)
	if err != nil {
		return err
	}
	if _, err := w.Write(h); err != nil {
		return err
	}
	_, err = w.Write(appendValues(nil, dtype, vs))
	return err
}
