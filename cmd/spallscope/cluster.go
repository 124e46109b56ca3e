package main

import (
	"fmt"
	"path/filepath"
	"text/tabwriter"

	"github.com/spf13/cobra"

	"spallscope/dic/cluster"
	"spallscope/dic/testconfig"
)

func newClusterCmd() *cobra.Command {
	root := &cobra.Command{
		Use:   "cluster",
		Short: "Run a campaign as a batch-cluster array job: submit, status, merge",
		Long: `cluster runs a campaign on a Slurm cluster as an array job, one task per share
of the tests; every task runs 'spallscope batch CAMPAIGN --shard i/n' into one
output folder that all nodes share. 'status' tells which tests are done,
failed or pending from the run folders; 'merge' writes the campaign summary
once every test is done. Resubmitting reruns only what is missing or failed
(finished stages of a test are skipped, interrupted tracking resumes).`,
	}
	outFor := func(c *testconfig.Campaign, out string) string {
		if out == "" {
			out = c.Out
		}
		if out == "" {
			out = filepath.Join(c.Dir, c.Name+"_runs")
		}
		return out
	}
	var (
		out    string
		tasks  int
		dryRun bool
		opt    cluster.SubmitOptions
	)
	submit := &cobra.Command{
		Use:   "submit CAMPAIGN.yaml [--tasks N] [--partition P --cpus-per-task N --mem M --time T --max-parallel K] [--dry-run]",
		Short: "Write the sbatch array script into the output folder and submit it",
		Args:  cobra.ExactArgs(1),
		RunE: func(cmd *cobra.Command, args []string) error {
			c, err := testconfig.ReadCampaign(args[0])
			if err != nil {
				return err
			}
			o := outFor(c, out)
			if tasks <= 0 || tasks > len(c.Tests) {
				tasks = len(c.Tests)
			}
			if w := cluster.SharedWarning(o); w != "" {
				fmt.Fprintln(cmd.ErrOrStderr(), w)
			}
			campaign, _ := filepath.Abs(args[0])
			script, err := cluster.WriteScript(c.Name, campaign, o, tasks, opt)
			if err != nil {
				return err
			}
			fmt.Fprintf(cmd.OutOrStdout(), "array script: %s (%d tasks for %d tests)\n", script, tasks, len(c.Tests))
			if dryRun {
				return nil
			}
			id, err := cluster.Submit(script)
			if err != nil {
				return err
			}
			fmt.Fprintln(cmd.OutOrStdout(), id)
			return nil
		},
	}
	submit.Flags().StringVar(&out, "out", "", "shared output folder (default: the campaign's)")
	submit.Flags().IntVar(&tasks, "tasks", 0, "array tasks (default: one per test)")
	submit.Flags().BoolVar(&dryRun, "dry-run", false, "write the script, do not submit")
	submit.Flags().StringVar(&opt.Partition, "partition", "", "Slurm partition")
	submit.Flags().IntVar(&opt.CPUsPerTask, "cpus-per-task", 2, "CPUs per task")
	submit.Flags().StringVar(&opt.Mem, "mem", "", "memory per task, e.g. 8G")
	submit.Flags().StringVar(&opt.Time, "time", "", "time limit per task, e.g. 04:00:00")
	submit.Flags().IntVar(&opt.MaxParallel, "max-parallel", 0, "at most this many tasks at once")
	submit.Flags().StringVar(&opt.Binary, "binary", "spallscope", "the spallscope binary as the nodes see it")

	var statusOut string
	var statusTasks int
	status := &cobra.Command{
		Use:   "status CAMPAIGN.yaml [--out DIR] [--tasks N]",
		Short: "List which tests are done, failed or pending",
		Args:  cobra.ExactArgs(1),
		RunE: func(cmd *cobra.Command, args []string) error {
			c, err := testconfig.ReadCampaign(args[0])
			if err != nil {
				return err
			}
			if statusTasks <= 0 {
				statusTasks = len(c.Tests)
			}
			states, err := cluster.Status(c, outFor(c, statusOut), statusTasks)
			if err != nil {
				return err
			}
			w := tabwriter.NewWriter(cmd.OutOrStdout(), 2, 4, 2, ' ', 0)
			fmt.Fprintln(w, "test\ttask\tstate\terror")
			for _, s := range states {
				fmt.Fprintf(w, "%s\t%d\t%s\t%s\n", s.Test, s.Task, s.State, s.Error)
			}
			return w.Flush()
		},
	}
	status.Flags().StringVar(&statusOut, "out", "", "shared output folder (default: the campaign's)")
	status.Flags().IntVar(&statusTasks, "tasks", 0, "array tasks the campaign was submitted with (default: one per test)")

	var mergeOut string
	merge := &cobra.Command{
		Use:   "merge CAMPAIGN.yaml [--out DIR]",
		Short: "Write the campaign summary from the finished run folders",
		Args:  cobra.ExactArgs(1),
		RunE: func(cmd *cobra.Command, args []string) error {
			c, err := testconfig.ReadCampaign(args[0])
			if err != nil {
				return err
			}
			o := outFor(c, mergeOut)
			results, err := cluster.Merge(c, o)
			if err != nil {
				return err
			}
			fmt.Fprintf(cmd.OutOrStdout(), "campaign %s: %d tests merged; summary in %s\n", c.Name, len(results), filepath.Join(o, "summary.html"))
			return nil
		},
	}
	merge.Flags().StringVar(&mergeOut, "out", "", "shared output folder (default: the campaign's)")
	root.AddCommand(submit, status, merge)
	return root
}
