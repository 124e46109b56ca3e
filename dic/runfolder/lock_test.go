package runfolder

import (
	"errors"
	"fmt"
	"os"
	"os/exec"
	"path/filepath"
	"strings"
	"testing"
)

// A second writer is refused with the holder's PID while the first holds
// the lock, and takes it once the first has released it (the run folder's
// rule: one writer at a time, common practice, no source).
func TestLockRefusesSecondWriter(t *testing.T) {
	dir := t.TempDir()
	unlock, err := Lock(dir)
	if err != nil {
		t.Fatal(err)
	}
	_, err = Lock(dir)
	if !errors.Is(err, ErrLocked) || !strings.Contains(err.Error(), fmt.Sprint(os.Getpid())) {
		t.Fatalf("second lock: got %v, want ErrLocked naming PID %d", err, os.Getpid())
	}
	unlock()
	unlock2, err := Lock(dir)
	if err != nil {
		t.Fatalf("after release: %v", err)
	}
	unlock2()
	if _, err := os.Stat(filepath.Join(dir, LockFile)); !os.IsNotExist(err) {
		t.Fatalf("lock file left after release: %v", err)
	}
}

// A lock left by a process that has ended is taken over: kill(pid, 0)
// fails with ESRCH for a process that no longer exists (POSIX.1-2017,
// kill()).
func TestLockTakesOverStaleLock(t *testing.T) {
	dir := t.TempDir()
	cmd := exec.Command("true")
	if err := cmd.Run(); err != nil {
		t.Skip("no true(1):", err)
	}
	host, _ := os.Hostname()
	stale := fmt.Sprintf("%d %s 2026-01-01T00:00:00Z\n", cmd.Process.Pid, host)
	if err := os.WriteFile(filepath.Join(dir, LockFile), []byte(stale), 0o644); err != nil {
		t.Fatal(err)
	}
	unlock, err := Lock(dir)
	if err != nil {
		t.Fatalf("stale lock of ended process %d not taken over: %v", cmd.Process.Pid, err)
	}
	unlock()
}

// A lock from another host cannot be checked (a PID means nothing across
// hosts) and is refused, naming the host (common practice, no source).
func TestLockRefusesOtherHost(t *testing.T) {
	dir := t.TempDir()
	os.WriteFile(filepath.Join(dir, LockFile), []byte("4242 node-elsewhere 2026-01-01T00:00:00Z\n"), 0o644)
	_, err := Lock(dir)
	if !errors.Is(err, ErrLocked) || !strings.Contains(err.Error(), "node-elsewhere") {
		t.Fatalf("got %v, want ErrLocked naming the other host", err)
	}
}
