package cluster

import (
	"bufio"
	"bytes"
	"errors"
	"fmt"
	"os"
	"os/exec"
	"path/filepath"
	"strings"

	"spallscope/dic/runfolder"
)

// ScriptFile is the name of the written sbatch script in the output folder.
const ScriptFile = "campaign.sbatch"

// MergeScriptFile is the name of the written merge script (MergeScript).
const MergeScriptFile = "merge.sbatch"

// WriteSubmission writes what a submission of plan p to the output
// folder out needs: the plan (PlanFile), the array script for tasks (nil:
// all; see Script) and, with merge, the merge script (MergeScript), both
// for the campaign file p.File. Both scripts are made, and so every value
// in them checked, before anything is written; each file is written whole
// or not at all. It returns the scripts' paths ("" for no merge script).
func WriteSubmission(p *Plan, out string, tasks []int, opt SubmitOptions, merge bool) (script, mergeScript string, err error) {
	if p.File == "" {
		return "", "", errors.New("submit: the plan names no campaign file")
	}
	text, err := Script(p, p.File, out, tasks, opt)
	if err != nil {
		return "", "", err
	}
	var mergeText string
	if merge {
		if mergeText, err = MergeScript(p, p.File, out, opt); err != nil {
			return "", "", err
		}
	}
	if err := WritePlan(out, p); err != nil {
		return "", "", err
	}
	if script, err = writeExecutable(filepath.Join(out, ScriptFile), text); err != nil {
		return "", "", err
	}
	if merge {
		if mergeScript, err = writeExecutable(filepath.Join(out, MergeScriptFile), mergeText); err != nil {
			return "", "", err
		}
	}
	return script, mergeScript, nil
}

func writeExecutable(path, text string) (string, error) {
	err := runfolder.WriteAtomic(path, func(w *bufio.Writer) error {
		_, err := w.WriteString(text)
		return err
	})
	if err == nil {
		err = os.Chmod(path, 0o755)
	}
	return path, err
}

// Submit hands the script to sbatch and returns its answer (the job id
// line). Without sbatch on PATH it says so; the script stays written.
// sbatch runs in the script's folder (the output folder), which is the
// job's working folder: a script whose output folder cannot be written
// on an #SBATCH line writes its logs there (see Script).
func Submit(script string) (string, error) { return sbatch(script) }

// SubmitAfter submits script to start once job (a job id) has ended,
// whatever its tasks' outcome (sbatch --dependency=afterany).
func SubmitAfter(script, job string) (string, error) {
	return sbatch("--dependency=afterany:"+job, script)
}

// JobID reads the job id from sbatch's answer "Submitted batch job 812"
// (on a multi-cluster site: "... job 812 on cluster c").
func JobID(answer string) (string, error) {
	f := strings.Fields(answer)
	for i := 0; i+1 < len(f); i++ {
		if f[i] == "job" && isDigits(f[i+1]) {
			return f[i+1], nil
		}
	}
	return "", fmt.Errorf("sbatch answered %q, expected \"Submitted batch job ID\"", answer)
}

func isDigits(s string) bool {
	for _, r := range s {
		if r < '0' || r > '9' {
			return false
		}
	}
	return s != ""
}

func sbatch(args ...string) (string, error) {
	script, err := filepath.Abs(args[len(args)-1]) // sbatch runs in its folder
	if err != nil {
		return "", fmt.Errorf("submit: %w", err)
	}
	args[len(args)-1] = script
	bin, err := exec.LookPath("sbatch")
	if err != nil {
		return "", fmt.Errorf("submit: sbatch is not on PATH (Slurm's client is missing); the script is written at %s — submit it on a login node, or use --dry-run", script)
	}
	var out, errOut bytes.Buffer
	cmd := exec.Command(bin, args...)
	cmd.Dir = filepath.Dir(script)
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
