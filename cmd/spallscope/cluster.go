package main

import (
	"errors"
	"fmt"
	"os"
	"path/filepath"
	"text/tabwriter"

	"github.com/spf13/cobra"

	"spallscope/cmd/spallscope/internal/cluster"
	"spallscope/cmd/spallscope/internal/config"
	"spallscope/cmd/spallscope/internal/job"
)

func newClusterCmd() *cobra.Command {
	root := &cobra.Command{
		Use:   "cluster",
		Short: "Run a campaign as a batch-cluster array job: submit, status, merge",
		Long: `cluster runs a campaign on a Slurm cluster as an array job. The campaign is
divided into units — a whole test, or with --frames-per-task one frame range of
a long test's tracking — and task i of n runs the units k with k mod n = i,
as 'spallscope batch CAMPAIGN --shard i/n' into one output folder that all
nodes share. 'status' tells which units are done, failed or pending from the
run folders (and what squeue/sacct say, where present); 'merge' assembles the
frame parts, runs their tests' strain, zones and outputs, and writes the
campaign summary once every test is done. Submitting again submits only the
tasks with a unit not done (finished stages are skipped, interrupted tracking
resumes).`,
	}
	tool := "spallscope " + version
	var (
		out           string
		tasks, frames int
		dryRun, all   bool
		mergeJob      bool
		opt           cluster.SubmitOptions
	)
	submit := &cobra.Command{
		Use:   "submit CAMPAIGN.yaml [--tasks N] [--frames-per-task F] [--partition P --cpus-per-task N --mem M --time T --max-parallel K] [--merge-job] [--dry-run] [--all]",
		Short: "Write the sbatch array script into the output folder and submit it",
		Long: `submit divides the campaign into units of work, writes the plan
(cluster-plan.json) and an sbatch array script (campaign.sbatch) into the
output folder, and hands the script to sbatch.

--frames-per-task F tracks each test with more than F frames in frame parts of
at most F frames, one unit each, so several nodes track one long sequence.
This needs the fixed reference: every frame is correlated against the same
reference, so a part needs nothing from the frames before it, and a part's
first frame starts from the integer ZNCC search at the seed points, as the
first frame of a whole run does. Results then equal a whole run's to within
IC-GN's stopping tolerance (1e-3 px), not to the last digit. A test with the
incremental reference is refused; tests with several faces run whole.

--merge-job also writes merge.sbatch and submits it to run 'cluster merge' on
a compute node once the array job has ended, whatever its tasks' outcome.

Submitting again with the same plan submits only the tasks that have a unit
not done and are not queued or running; --all submits every task.`,
		Args: cobra.ExactArgs(1),
		RunE: func(cmd *cobra.Command, args []string) error {
			// Every option is checked before anything is read or written.
			if err := refuseTypedZero(cmd, "tasks", "frames-per-task", "max-parallel"); err != nil {
				return err
			}
			if err := opt.Validate(); err != nil {
				return err
			}
			c, err := config.ReadCampaign(args[0])
			if err != nil {
				return err
			}
			if _, err := cluster.JobName(c.Name); err != nil {
				return fmt.Errorf("%s: %w", args[0], err)
			}
			o := job.CampaignOut(c, out)
			plan, err := cluster.NewPlan(c, frames, tasks)
			if err != nil {
				return err
			}
			plan.File, _ = filepath.Abs(args[0])
			if w := cluster.SharedWarning(o); w != "" {
				fmt.Fprintln(cmd.ErrOrStderr(), w)
			}
			run, notes, err := cluster.ToSubmit(plan, o, tool, all)
			for _, n := range notes {
				fmt.Fprintln(cmd.ErrOrStderr(), n)
			}
			if errors.Is(err, cluster.ErrNothingToSubmit) {
				fmt.Fprintln(cmd.OutOrStdout(), err)
				return nil
			}
			if err != nil {
				return err
			}
			script, mergeScript, err := cluster.WriteSubmission(plan, o, run, opt, mergeJob)
			if err != nil {
				return err
			}
			fmt.Fprintf(cmd.OutOrStdout(), "array script: %s (%d units of %d tests over %d tasks; submitting tasks %s)\n",
				script, len(plan.Units), len(c.Tests), plan.Tasks, cluster.ArraySpec(run, plan.Tasks))
			if mergeJob {
				fmt.Fprintf(cmd.OutOrStdout(), "merge script: %s (runs once the array job has ended)\n", mergeScript)
			}
			if dryRun {
				return nil
			}
			answer, err := cluster.Submit(script)
			if err != nil {
				return err
			}
			fmt.Fprintln(cmd.OutOrStdout(), answer)
			if mergeJob {
				job, err := cluster.JobID(answer)
				if err != nil {
					return err
				}
				answer, err := cluster.SubmitAfter(mergeScript, job)
				if err != nil {
					return err
				}
				fmt.Fprintf(cmd.OutOrStdout(), "%s (merge, after job %s)\n", answer, job)
			}
			return nil
		},
	}
	submit.Flags().StringVar(&out, "out", "", "shared output folder (default: the campaign's)")
	submit.Flags().IntVar(&tasks, "tasks", 0, "array tasks (default: one per unit)")
	submit.Flags().IntVar(&frames, "frames-per-task", 0, "track tests longer than this many frames in frame parts (fixed reference only)")
	submit.Flags().BoolVar(&dryRun, "dry-run", false, "write the plan and the script, do not submit")
	submit.Flags().BoolVar(&all, "all", false, "submit every task, not only those with a unit not done")
	submit.Flags().BoolVar(&mergeJob, "merge-job", false, "also submit 'cluster merge' as a job that starts when the array job has ended")
	submit.Flags().StringVar(&opt.Partition, "partition", "", "Slurm partition")
	submit.Flags().IntVar(&opt.CPUsPerTask, "cpus-per-task", 2, "CPUs per task")
	submit.Flags().StringVar(&opt.Mem, "mem", "", "memory per task, e.g. 8G")
	submit.Flags().StringVar(&opt.Time, "time", "", "time limit per task, e.g. 04:00:00")
	submit.Flags().IntVar(&opt.MaxParallel, "max-parallel", 0, "at most this many tasks at once")
	submit.Flags().StringVar(&opt.Binary, "binary", "spallscope", "the spallscope binary as the nodes see it")

	var statusOut string
	var statusTasks int
	status := &cobra.Command{
		Use:   "status CAMPAIGN.yaml|OUT [--out DIR] [--tasks N]",
		Short: "List which units of work are done, failed or pending",
		Long: `status lists each unit of work — a whole test or a frame part — with its array
task and state (done, failed with the error, or pending), read from the run
folders, and what squeue/sacct say of the task where they are present. Give
the campaign file, or the output folder of a submitted campaign.`,
		Args: cobra.ExactArgs(1),
		RunE: func(cmd *cobra.Command, args []string) error {
			if err := refuseTypedZero(cmd, "tasks"); err != nil {
				return err
			}
			c, o, plan, err := openCampaign(args[0], statusOut, statusTasks)
			if err != nil {
				return err
			}
			states, err := cluster.Status(plan, o)
			if err != nil {
				return err
			}
			queue := cluster.Queue(c.Name)
			w := tabwriter.NewWriter(cmd.OutOrStdout(), 2, 4, 2, ' ', 0)
			fmt.Fprintln(w, "test\tframes\ttask\tstate\tscheduler\terror")
			for _, s := range states {
				frames, q := "all", queue[s.Task]
				if s.Part != nil {
					frames = fmt.Sprintf("%d-%d", s.Part.From, s.Part.To-1)
				}
				if q == "" {
					q = "-"
				}
				fmt.Fprintf(w, "%s\t%s\t%d\t%s\t%s\t%s\n", s.Test, frames, s.Task, s.State, q, s.Error)
			}
			return w.Flush()
		},
	}
	status.Flags().StringVar(&statusOut, "out", "", "shared output folder (default: the campaign's)")
	status.Flags().IntVar(&statusTasks, "tasks", 0, "array tasks, when the campaign was not submitted with 'cluster submit' (default: one per test)")

	var mergeOut string
	merge := &cobra.Command{
		Use:   "merge CAMPAIGN.yaml|OUT [--out DIR]",
		Short: "Assemble frame parts, finish their tests and write the campaign summary",
		Long: `merge makes every test whose units are all done a complete run folder: a test
tracked in frame parts gets its fields from the parts and then its strain,
zones, onsets, renders and report, here. When every test is done it writes
the campaign summary (summary.csv, summary.html); otherwise it lists the tests
not done and why, and writes no summary. Give the campaign file, or the output
folder of a submitted campaign.`,
		Args: cobra.ExactArgs(1),
		RunE: func(cmd *cobra.Command, args []string) error {
			c, o, plan, err := openCampaign(args[0], mergeOut, 0)
			if err != nil {
				return err
			}
			r := reporter(cmd)
			results, err := cluster.Merge(cmd.Context(), c, plan, o, tool, campaignProgress(r, len(c.Tests)))
			r.Wait()
			if err != nil {
				return err
			}
			fmt.Fprintf(cmd.OutOrStdout(), "campaign %s: %d tests merged; summary in %s\n", c.Name, len(results), filepath.Join(o, job.SummaryHTML))
			return nil
		},
	}
	merge.Flags().StringVar(&mergeOut, "out", "", "shared output folder (default: the campaign's)")
	root.AddCommand(submit, status, merge)
	return root
}

// refuseTypedZero refuses an integer option typed as 0 whose 0 means "the
// default": leave the option out for the default.
func refuseTypedZero(cmd *cobra.Command, names ...string) error {
	for _, name := range names {
		if f := cmd.Flags().Lookup(name); f != nil && f.Changed && f.Value.String() == "0" {
			return fmt.Errorf("--%s 0: 0 is the default; leave the option out, or give a whole number of at least 1", name)
		}
	}
	return nil
}

// openCampaign reads what status and merge start from: arg is a campaign
// file (or folder of test configs) with its output folder from out, or
// the output folder of a submitted campaign, whose plan names the
// campaign file. Without a submitted plan, the plan is one unit per test
// over tasks tasks.
func openCampaign(arg, out string, tasks int) (*config.Campaign, string, *cluster.Plan, error) {
	if st, err := os.Stat(filepath.Join(arg, cluster.PlanFile)); err == nil && !st.IsDir() {
		plan, err := cluster.ReadPlan(arg)
		if err != nil {
			return nil, "", nil, err
		}
		if plan.File == "" {
			return nil, "", nil, fmt.Errorf("%s names no campaign file: give the campaign file and --out %s", filepath.Join(arg, cluster.PlanFile), arg)
		}
		c, err := config.ReadCampaign(plan.File)
		if err != nil {
			return nil, "", nil, fmt.Errorf("the campaign of %s: %w", arg, err)
		}
		return c, arg, plan, nil
	}
	c, err := config.ReadCampaign(arg)
	if err != nil {
		return nil, "", nil, err
	}
	o := job.CampaignOut(c, out)
	plan, err := cluster.ReadPlan(o)
	if plan == nil && err == nil {
		plan, err = cluster.NewPlan(c, 0, tasks)
	}
	return c, o, plan, err
}
