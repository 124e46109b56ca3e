package main

import (
	"context"
	"errors"
	"fmt"
	"io"
	"os"
	"os/signal"
	"syscall"
)

// signalled is the cause of a context ended by a signal.
type signalled struct{ sig os.Signal }

func (s signalled) Error() string { return s.sig.String() + " signal" }

// stopOnSignal returns a context that ends at the first interrupt (Ctrl-C)
// or terminate signal, so that long commands stop at their next frame
// boundary and leave a run that resumes; the signal is told on w. A second
// signal ends the process at once, as the signal would without spallscope
// catching it. release stops catching signals.
func stopOnSignal(w io.Writer) (ctx context.Context, release func()) {
	ctx, cancel := context.WithCancelCause(context.Background())
	ch := make(chan os.Signal, 1)
	signal.Notify(ch, os.Interrupt, syscall.SIGTERM)
	done := make(chan struct{})
	go func() {
		select {
		case sig := <-ch:
			signal.Stop(ch) // the next one takes its default action
			fmt.Fprintf(w, "spallscope: %v: stopping at the next frame boundary (send it again to stop at once)\n", sig)
			cancel(signalled{sig})
		case <-done:
		}
	}()
	return ctx, func() {
		signal.Stop(ch)
		close(done)
		cancel(nil)
	}
}

// exitCode is the process's exit status for a command's error: 128 plus
// the signal's number when a signal stopped it (the shells' convention,
// 130 for an interrupt, 143 for a terminate), else 1.
func exitCode(ctx context.Context, err error) int {
	var s signalled
	if errors.As(context.Cause(ctx), &s) {
		if n, ok := s.sig.(syscall.Signal); ok {
			return 128 + int(n)
		}
	}
	return 1
}
