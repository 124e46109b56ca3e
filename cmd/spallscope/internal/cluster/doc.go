// Package cluster runs a campaign on a batch cluster: it shards the tests
// over the tasks of an array job (Slurm's SLURM_ARRAY_TASK_ID, Kubernetes
// Indexed Jobs' JOB_COMPLETION_INDEX, or a plain --shard i/n), writes the
// sbatch array script, tells which tasks finished, failed or are pending,
// and merges finished run folders into the campaign summary. The run
// folders live on a file system every node shares.
package cluster
