package runfolder

import (
	"errors"
	"fmt"
	"io/fs"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"syscall"
	"time"
)

// LockFile is the file that holds a run folder's lock while a process
// writes the folder: the process ID, the host and the start time.
const LockFile = ".lock"

// ErrLocked is wrapped by Lock's error when another live process holds the
// run folder.
var ErrLocked = errors.New("run folder in use")

// Lock takes dir's lock for this process and returns the function that
// releases it. A lock held by a live process on this host is refused,
// naming its PID; one left by a process that is gone (killed, or a
// machine that restarted) is taken over. A lock taken on another host
// (a shared file system) cannot be checked from here and is refused,
// with how to remove it by hand.
func Lock(dir string) (unlock func(), err error) {
	path := filepath.Join(dir, LockFile)
	host, _ := os.Hostname()
	mine := fmt.Sprintf("%d %s %s\n", os.Getpid(), host, time.Now().UTC().Format(time.RFC3339))
	for attempt := 0; attempt < 2; attempt++ {
		f, err := os.OpenFile(path, os.O_WRONLY|os.O_CREATE|os.O_EXCL, 0o644)
		if err == nil {
			_, werr := f.WriteString(mine)
			if cerr := f.Close(); werr == nil {
				werr = cerr
			}
			if werr != nil {
				os.Remove(path)
				return nil, fmt.Errorf("lock %s: %w", dir, werr)
			}
			return func() { os.Remove(path) }, nil
		}
		if !errors.Is(err, fs.ErrExist) {
			return nil, fmt.Errorf("lock %s: %w", dir, err)
		}
		data, rerr := os.ReadFile(path)
		if rerr != nil && !errors.Is(rerr, fs.ErrNotExist) {
			return nil, fmt.Errorf("lock %s: %w", dir, rerr)
		}
		pid, holder, since := parseLock(string(data))
		switch {
		case pid > 0 && holder != host:
			return nil, fmt.Errorf("%s is being written by process %d on host %s (since %s): %w; if that process has ended, remove %s", dir, pid, holder, since, ErrLocked, path)
		case pid > 0 && alive(pid):
			return nil, fmt.Errorf("%s is being written by process %d (since %s): %w; wait for it to finish, or stop it", dir, pid, since, ErrLocked)
		}
		os.Remove(path) // stale: its process is gone
	}
	return nil, fmt.Errorf("lock %s: another process keeps taking it: %w", dir, ErrLocked)
}

// parseLock reads a lock file's "PID HOST TIME" line.
func parseLock(s string) (pid int, host, since string) {
	f := strings.Fields(s)
	if len(f) >= 1 {
		pid, _ = strconv.Atoi(f[0])
	}
	if len(f) >= 2 {
		host = f[1]
	}
	if len(f) >= 3 {
		since = f[2]
	}
	return pid, host, since
}

// alive reports whether process pid exists on this host (signal 0 checks
// without sending anything; EPERM means it exists under another user).
func alive(pid int) bool {
	err := syscall.Kill(pid, 0)
	return err == nil || errors.Is(err, syscall.EPERM)
}
