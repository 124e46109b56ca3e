package cluster

import (
	"errors"
	"fmt"
	"path/filepath"
	"strconv"
	"strings"
)

// Script returns an sbatch array script for plan p of the campaign file
// campaign with output folder out: task i runs `spallscope batch CAMPAIGN
// --shard i/p.Tasks` (with the plan's --frames-per-task), so each task
// runs its units into the shared output folder. tasks lists the array
// indices to run (nil: all of them), for resubmitting only what is not
// done. The script is meant to be read and reused by hand.
//
// Nothing reaches the script that could run as a command or change what
// sbatch reads: the plan must validate (Plan.Validate), the options too
// (SubmitOptions.Validate), and the campaign's name must make a job name
// (JobName). The binary, campaign file and output folder — any bytes but
// NUL — are quoted for POSIX sh (shellQuote), the two paths made absolute.
// sbatch reads the #SBATCH lines with rules of its own, so the output
// folder goes into --output only when its path holds nothing but ASCII
// letters, digits and / _ - . + @ (see logLines); otherwise the logs
// go to the folder sbatch is run in, and Submit runs it in out.
func Script(p *Plan, campaign, out string, tasks []int, opt SubmitOptions) (string, error) {
	name, campaign, out, err := checkScript(p, campaign, out, opt)
	if err != nil {
		return "", err
	}
	if err := checkTasks(tasks, p.Tasks); err != nil {
		return "", err
	}
	var b strings.Builder
	fmt.Fprintf(&b, "#!/bin/bash\n# spallscope campaign %s as a Slurm array job: %d units of work over %d tasks.\n", p.Campaign, len(p.Units), p.Tasks)
	b.WriteString("# Task i runs the units k with k mod tasks = i (listed in " + PlanFile + ").\n")
	if p.FramesPerTask > 0 {
		fmt.Fprintf(&b, "# Tests with more than %d frames are tracked in frame parts; 'spallscope cluster merge'\n# assembles them and runs their strain, zones and outputs.\n", p.FramesPerTask)
	}
	b.WriteString("# The campaign and output folders must be on a file system every node shares;\n")
	b.WriteString("# nodes need the OpenCV runtime libraries (or the bundle from `make bundle`).\n")
	b.WriteString("# Resubmit with `spallscope cluster submit` to run only the tasks not done.\n")
	fmt.Fprintf(&b, "#SBATCH --job-name=%s\n", name)
	array := ArraySpec(tasks, p.Tasks)
	if opt.MaxParallel > 0 {
		array += fmt.Sprintf("%%%d", opt.MaxParallel)
	}
	fmt.Fprintf(&b, "#SBATCH --array=%s\n", array)
	writeResources(&b, opt)
	b.WriteString(logLines(out, "slurm-%A_%a.log"))
	b.WriteString(scriptPrologue)
	fmt.Fprintf(&b, "exec %s batch %s --out %s --shard \"${SLURM_ARRAY_TASK_ID}/%d\"", shellQuote(opt.Binary), shellQuote(campaign), shellQuote(out), p.Tasks)
	if p.FramesPerTask > 0 {
		fmt.Fprintf(&b, " --frames-per-task %d", p.FramesPerTask)
	}
	b.WriteString("\n")
	return b.String(), nil
}

// MergeScript returns an sbatch script that runs `spallscope cluster merge`
// for the campaign once its array job has ended (submitted with a
// dependency on it): it assembles frame parts, runs those tests' strain,
// zones and outputs on a compute node rather than the login node, and
// writes the campaign summary when every test is done. Its values are
// checked and quoted as Script's are.
func MergeScript(p *Plan, campaign, out string, opt SubmitOptions) (string, error) {
	name, campaign, out, err := checkScript(p, campaign, out, opt)
	if err != nil {
		return "", err
	}
	var b strings.Builder
	fmt.Fprintf(&b, "#!/bin/bash\n# spallscope campaign %s: merge once the array job has ended (submitted with\n", p.Campaign)
	b.WriteString("# --dependency=afterany on it). Merge finishes every test whose units are done and\n")
	b.WriteString("# writes the campaign summary when all are; it lists what is missing otherwise.\n")
	fmt.Fprintf(&b, "#SBATCH --job-name=%s-merge\n", name)
	writeResources(&b, opt)
	b.WriteString(logLines(out, "slurm-merge-%j.log"))
	b.WriteString(scriptPrologue)
	fmt.Fprintf(&b, "exec %s cluster merge %s --out %s\n", shellQuote(opt.Binary), shellQuote(campaign), shellQuote(out))
	return b.String(), nil
}

// checkScript checks what both scripts are made of (see Script) and
// returns the job name and the absolute campaign file and output folder.
func checkScript(p *Plan, campaign, out string, opt SubmitOptions) (name, absCampaign, absOut string, err error) {
	if err := p.Validate(); err != nil {
		return "", "", "", fmt.Errorf("script: the plan: %w", err)
	}
	if err := opt.Validate(); err != nil {
		return "", "", "", err
	}
	if name, err = JobName(p.Campaign); err != nil {
		return "", "", "", err
	}
	if absCampaign, err = scriptPath("the campaign file", campaign); err != nil {
		return "", "", "", err
	}
	if absOut, err = scriptPath("the output folder", out); err != nil {
		return "", "", "", err
	}
	return name, absCampaign, absOut, nil
}

// scriptPath returns path made absolute, so that it means the same file
// in whatever folder the job starts; a path that is empty or holds NUL
// (which no command-line argument can carry) is refused.
func scriptPath(what, path string) (string, error) {
	if path == "" || strings.ContainsRune(path, 0) {
		return "", fmt.Errorf("script: %s %s: expected a path without NUL bytes", what, excerpt(path))
	}
	abs, err := filepath.Abs(path)
	if err != nil {
		return "", fmt.Errorf("script: %s %s: %w", what, excerpt(path), err)
	}
	return abs, nil
}

// checkTasks checks a list of array tasks to submit: nil (all), or
// indices of 0…n−1 in increasing order, at least one.
func checkTasks(tasks []int, n int) error {
	if tasks == nil {
		return nil
	}
	if len(tasks) == 0 {
		return errors.New("script: no tasks to submit")
	}
	for i, k := range tasks {
		if k < 0 || k >= n || (i > 0 && k <= tasks[i-1]) {
			return fmt.Errorf("script: tasks %v: expected increasing task indices of 0..%d", tasks, n-1)
		}
	}
	return nil
}

// logLines returns the #SBATCH --output line for task logs named
// pattern (sbatch's filename pattern, %A_%a or %j) in the output folder
// out. sbatch reads an #SBATCH line itself: it splits at blanks, reads
// quotes and backslashes its own way and takes % as a replacement symbol
// (sbatch(1), "filename pattern"); a newline would end the line and make
// the rest a command. The path is written only when it holds nothing but
// ASCII letters, digits and / _ - . + @ (our choice, which none of those
// rules touch). Otherwise the line names the file alone, which Slurm
// opens in the job's working folder — the folder sbatch runs in
// (sbatch(1), --chdir) — and Submit runs sbatch in the output folder.
func logLines(out, pattern string) string {
	if onlyBytes(out, sbatchPathBytes) {
		return "#SBATCH --output=" + out + "/" + pattern + "\n"
	}
	return "# The output folder's path holds characters an #SBATCH line cannot carry safely:\n" +
		"# the logs go to the folder sbatch runs in. Submit from the output folder\n" +
		"# (spallscope cluster submit does).\n" +
		"#SBATCH --output=" + pattern + "\n"
}

// sbatchPathBytes are the bytes a path may hold to be written on an
// #SBATCH line (see logLines).
const sbatchPathBytes = asciiAlnum + "/_-.+@"

// writeResources writes the #SBATCH lines of each task's resources
// (validated: SubmitOptions.Validate).
func writeResources(b *strings.Builder, opt SubmitOptions) {
	fmt.Fprintf(b, "#SBATCH --cpus-per-task=%d\n", opt.CPUsPerTask)
	if opt.Partition != "" {
		fmt.Fprintf(b, "#SBATCH --partition=%s\n", opt.Partition)
	}
	if opt.Mem != "" {
		fmt.Fprintf(b, "#SBATCH --mem=%s\n", opt.Mem)
	}
	if opt.Time != "" {
		fmt.Fprintf(b, "#SBATCH --time=%s\n", opt.Time)
	}
}

// scriptPrologue starts the commands of a script: stop at the first
// error, and use the CPUs Slurm gave the task.
const scriptPrologue = "set -euo pipefail\nexport GOMAXPROCS=\"${SLURM_CPUS_PER_TASK:-1}\"\n"

// JobName is the Slurm job name of a campaign's array job: "spallscope-"
// and the campaign's name. It goes on an #SBATCH line and into squeue's
// and sacct's --name, which take a comma-separated list, so the name must
// be ASCII letters, digits and _ - . only (our choice; sbatch itself
// takes any text, sbatch(1) --job-name).
func JobName(campaign string) (string, error) {
	if campaign == "" || !onlyBytes(campaign, asciiAlnum+"_-.") {
		return "", fmt.Errorf("campaign name %s: a Slurm job name (spallscope-NAME) needs ASCII letters, digits, _ - and . only: set the campaign file's name key (such as name: ucs-2024), or rename the campaign folder", excerpt(campaign))
	}
	return "spallscope-" + campaign, nil
}

// ArraySpec writes task indices (sorted) as an sbatch --array list with
// ranges, "0,2-4"; nil means all of 0…n−1.
func ArraySpec(tasks []int, n int) string {
	if tasks == nil {
		return fmt.Sprintf("0-%d", n-1)
	}
	var parts []string
	for i := 0; i < len(tasks); {
		j := i
		for j+1 < len(tasks) && tasks[j+1] == tasks[j]+1 {
			j++
		}
		if j == i {
			parts = append(parts, strconv.Itoa(tasks[i]))
		} else {
			parts = append(parts, fmt.Sprintf("%d-%d", tasks[i], tasks[j]))
		}
		i = j + 1
	}
	return strings.Join(parts, ",")
}
