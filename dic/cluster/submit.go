package cluster

import (
	"bufio"
	"bytes"
	"fmt"
	"os"
	"os/exec"
	"path/filepath"
	"strings"

	"spallscope/dic/runfolder"
)

// ScriptFile is the name of the written sbatch script in the output folder.
const ScriptFile = "campaign.sbatch"

// WriteScript writes the array script of plan p (see Script) into out and
// returns its path.
func WriteScript(p *Plan, campaign, out string, tasks []int, opt SubmitOptions) (string, error) {
	if err := os.MkdirAll(out, 0o755); err != nil {
		return "", err
	}
	path := filepath.Join(out, ScriptFile)
	err := runfolder.WriteAtomic(path, func(w *bufio.Writer) error {
		_, err := w.WriteString(Script(p, campaign, out, tasks, opt))
		return err
	})
	if err == nil {
		err = os.Chmod(path, 0o755)
	}
	return path, err
}

// Submit hands the script to sbatch and returns its answer (the job id
// line). Without sbatch on PATH it says so; the script stays written.
func Submit(script string) (string, error) {
	bin, err := exec.LookPath("sbatch")
	if err != nil {
		return "", fmt.Errorf("submit: sbatch is not on PATH (Slurm's client is missing); the script is written at %s — submit it on a login node, or use --dry-run", script)
	}
	var out, errOut bytes.Buffer
	cmd := exec.Command(bin, script)
	cmd.Stdout, cmd.Stderr = &out, &errOut
	if err := cmd.Run(); err != nil {
		return "", fmt.Errorf("submit: sbatch %s: %v: %s", script, err, strings.TrimSpace(errOut.String()))
	}
	return strings.TrimSpace(out.String()), nil
}

// SharedWarning returns a warning when out is on a file system that is
// unlikely to be shared between nodes (/tmp, /dev/shm, /run), "" otherwise.
func SharedWarning(out string) string {
	abs, err := filepath.Abs(out)
	if err != nil {
		return ""
	}
	for _, local := range []string{"/tmp", "/dev/shm", "/run", "/var/tmp"} {
		if abs == local || strings.HasPrefix(abs, local+"/") {
			return fmt.Sprintf("warning: %s is under %s, usually local to each node; the tasks' results must land on a file system every node shares", abs, local)
		}
	}
	return ""
}
