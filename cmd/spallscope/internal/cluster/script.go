package cluster

import (
	"fmt"
	"strconv"
	"strings"
)

// SubmitOptions are the resources of each array task.
type SubmitOptions struct {
	Partition   string
	CPUsPerTask int
	Mem         string // e.g. "8G"
	Time        string // e.g. "04:00:00"
	MaxParallel int    // at most this many tasks at once (0: no limit)
	Binary      string // the spallscope binary the nodes run
}

// Script returns an sbatch array script for plan p of the campaign file
// campaign with output folder out: task i runs `spallscope batch CAMPAIGN
// --shard i/p.Tasks` (with the plan's --frames-per-task), so each task
// runs its units into the shared output folder. tasks lists the array
// indices to run (nil: all of them), for resubmitting only what is not
// done. The script is meant to be read and reused by hand.
func Script(p *Plan, campaign, out string, tasks []int, opt SubmitOptions) string {
	if opt.CPUsPerTask == 0 {
		opt.CPUsPerTask = 2
	}
	if opt.Binary == "" {
		opt.Binary = "spallscope"
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
	fmt.Fprintf(&b, "#SBATCH --job-name=%s\n", JobName(p.Campaign))
	array := ArraySpec(tasks, p.Tasks)
	if opt.MaxParallel > 0 {
		array += fmt.Sprintf("%%%d", opt.MaxParallel)
	}
	fmt.Fprintf(&b, "#SBATCH --array=%s\n", array)
	writeResources(&b, opt)
	fmt.Fprintf(&b, "#SBATCH --output=%s/slurm-%%A_%%a.log\n", out)
	b.WriteString(scriptPrologue)
	fmt.Fprintf(&b, "exec %s batch %q --out %q --shard \"${SLURM_ARRAY_TASK_ID}/%d\"", opt.Binary, campaign, out, p.Tasks)
	if p.FramesPerTask > 0 {
		fmt.Fprintf(&b, " --frames-per-task %d", p.FramesPerTask)
	}
	b.WriteString("\n")
	return b.String()
}

// MergeScript returns an sbatch script that runs `spallscope cluster merge`
// for the campaign once its array job has ended (submitted with a
// dependency on it): it assembles frame parts, runs those tests' strain,
// zones and outputs on a compute node rather than the login node, and
// writes the campaign summary when every test is done.
func MergeScript(p *Plan, campaign, out string, opt SubmitOptions) string {
	if opt.CPUsPerTask == 0 {
		opt.CPUsPerTask = 2
	}
	if opt.Binary == "" {
		opt.Binary = "spallscope"
	}
	var b strings.Builder
	fmt.Fprintf(&b, "#!/bin/bash\n# spallscope campaign %s: merge once the array job has ended (submitted with\n", p.Campaign)
	b.WriteString("# --dependency=afterany on it). Merge finishes every test whose units are done and\n")
	b.WriteString("# writes the campaign summary when all are; it lists what is missing otherwise.\n")
	fmt.Fprintf(&b, "#SBATCH --job-name=%s-merge\n", JobName(p.Campaign))
	writeResources(&b, opt)
	fmt.Fprintf(&b, "#SBATCH --output=%s/slurm-merge-%%j.log\n", out)
	b.WriteString(scriptPrologue)
	fmt.Fprintf(&b, "exec %s cluster merge %q --out %q\n", opt.Binary, campaign, out)
	return b.String()
}

// writeResources writes the #SBATCH lines of each task's resources.
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

// JobName is the Slurm job name of a campaign's array job.
func JobName(campaign string) string { return "spallscope-" + campaign }

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
