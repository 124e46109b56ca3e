package cluster

import (
	"fmt"
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

// Script returns an sbatch array script for a campaign of tests tasks:
// task i runs `spallscope batch CAMPAIGN --shard i/tasks`, so each task
// runs its share of the tests into the campaign's shared output folder.
// The script is meant to be read and reused by hand.
func Script(name, campaign, out string, tasks int, opt SubmitOptions) string {
	if opt.CPUsPerTask == 0 {
		opt.CPUsPerTask = 2
	}
	if opt.Binary == "" {
		opt.Binary = "spallscope"
	}
	var b strings.Builder
	fmt.Fprintf(&b, "#!/bin/bash\n# spallscope campaign %s as a Slurm array job: one task per share of the tests.\n", name)
	b.WriteString("# The campaign and output folders must be on a file system every node shares;\n")
	b.WriteString("# nodes need the OpenCV runtime libraries (or the bundle from `make bundle`).\n")
	fmt.Fprintf(&b, "#SBATCH --job-name=spallscope-%s\n", name)
	array := fmt.Sprintf("0-%d", tasks-1)
	if opt.MaxParallel > 0 {
		array += fmt.Sprintf("%%%d", opt.MaxParallel)
	}
	fmt.Fprintf(&b, "#SBATCH --array=%s\n", array)
	fmt.Fprintf(&b, "#SBATCH --cpus-per-task=%d\n", opt.CPUsPerTask)
	if opt.Partition != "" {
		fmt.Fprintf(&b, "#SBATCH --partition=%s\n", opt.Partition)
	}
	if opt.Mem != "" {
		fmt.Fprintf(&b, "#SBATCH --mem=%s\n", opt.Mem)
	}
	if opt.Time != "" {
		fmt.Fprintf(&b, "#SBATCH --time=%s\n", opt.Time)
	}
	fmt.Fprintf(&b, "#SBATCH --output=%s/slurm-%%A_%%a.log\n", out)
	b.WriteString("set -euo pipefail\n")
	b.WriteString("export GOMAXPROCS=\"${SLURM_CPUS_PER_TASK:-1}\"\n")
	fmt.Fprintf(&b, "exec %s batch %q --out %q --shard \"${SLURM_ARRAY_TASK_ID}/%d\"\n", opt.Binary, campaign, out, tasks)
	return b.String()
}
