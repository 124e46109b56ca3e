package logtable

import (
	"fmt"
	"io"
)

// LineTooLongError is the error a LimitLines reader returns at the first
// line longer than its limit.
type LineTooLongError struct {
	Line  int // 1-based number of the line
	Limit int // bytes
}

func (e *LineTooLongError) Error() string {
	return fmt.Sprintf("line %d is longer than %d bytes; expected a text table", e.Line, e.Limit)
}

// LimitLines returns a reader that reads r until a line (bytes between
// '\n's) grows longer than limit bytes, and then fails with a
// *LineTooLongError. It bounds the memory of readers that, like
// encoding/csv, keep a whole line however long it is.
func LimitLines(r io.Reader, limit int) io.Reader {
	return &lineLimiter{r: r, limit: limit, line: 1}
}

// lineLimiter is the reader LimitLines returns.
type lineLimiter struct {
	r     io.Reader
	limit int
	line  int // number of the line being read
	n     int // bytes of that line so far
	err   error
}

func (l *lineLimiter) Read(p []byte) (int, error) {
	if l.err != nil {
		return 0, l.err
	}
	n, err := l.r.Read(p)
	for i, b := range p[:n] {
		if b == '\n' {
			l.line++
			l.n = 0
			continue
		}
		if l.n++; l.n > l.limit {
			l.err = &LineTooLongError{Line: l.line, Limit: l.limit}
			return i, l.err
		}
	}
	return n, err
}
