package main

import (
	"fmt"
	"path/filepath"

	"github.com/spf13/cobra"

	"spallscope/cmd/spallscope/internal/cluster"
	"spallscope/cmd/spallscope/internal/config"
	"spallscope/cmd/spallscope/internal/job"
	"spallscope/strain/strainfile"
)

func newRunCmd() *cobra.Command {
	var out string
	cmd := &cobra.Command{
		Use:   "run TEST.yaml [--out DIR]",
		Short: "Do the whole job for one test: track, strain, zones and onsets, from a test config",
		Long: `run reads a test config (YAML; see testdata/example_test.yaml for every key,
commented) and runs the stages into a run folder: track → strain → zones and
onsets. Paths in the config are relative to its folder.

Resume: every stage has a fingerprint of its inputs and settings in run.json.
Running again skips stages whose fingerprint and outputs are complete; an
interrupted tracking run (Ctrl-C, kill, power loss) continues after the last
complete field file (fixed reference; an incremental run is tracked again).
Changing a setting reruns exactly the stages it affects: a new strain window
re-runs strain and zones, not tracking.

run.json records the tool version, settings, input hashes, stage timings and
the measurement resolution.`,
		Args: cobra.ExactArgs(1),
		RunE: func(cmd *cobra.Command, args []string) error {
			t, err := config.Read(args[0])
			if err != nil {
				return err
			}
			r := reporter(cmd)
			s, err := job.Run(cmd.Context(), t, out, "spallscope "+version, testProgress(r, t.Name))
			r.Wait()
			if err != nil {
				return err
			}
			printSummary(cmd, s)
			return nil
		},
	}
	cmd.Flags().StringVar(&out, "out", "", `run folder (default: "<name>_run" beside the config)`)
	return cmd
}

// printSummary prints a run's outcome.
func printSummary(cmd *cobra.Command, s *job.Summary) {
	o := cmd.OutOrStdout()
	fmt.Fprintf(o, "%s: %d frames in %.1f s -> %s", s.Name, s.Frames, s.Seconds, s.Out)
	if len(s.Skipped) > 0 {
		fmt.Fprintf(o, " (up to date: %v)", s.Skipped)
	}
	if s.Resumed > 0 {
		fmt.Fprintf(o, " (resumed after %d frames)", s.Resumed)
	}
	fmt.Fprintln(o)
	for _, n := range s.Notes {
		fmt.Fprintf(o, "note: %s\n", n)
	}
	if s.Resolution != nil {
		fmt.Fprintf(o, "resolution: u %.4f px, exx %.0f µε (VSG %d px)\n", s.Resolution.U, s.Resolution.Exx*1e6, s.Resolution.VSG)
	}
	rep := &strainfile.OnsetReport{Peak: s.Peak, Onsets: s.Onsets, DetectionLimits: s.DetectionLimits}
	printOnsets(cmd, rep, filepath.Join(s.Out, strainfile.OnsetJSON))
	if s.Report != "" {
		fmt.Fprintf(o, "report: %s\n", s.Report)
	}
}

func newBatchCmd() *cobra.Command {
	var opt cluster.BatchOptions
	cmd := &cobra.Command{
		Use:   "batch CAMPAIGN.yaml|FOLDER [--jobs N] [--out DIR] [--shard i/n]",
		Short: "Run a campaign of tests, with progress per test, and write a campaign summary",
		Long: `batch runs every test of a campaign — a YAML file with keys name, out, jobs and
tests (a list of test configs, relative to it), or a folder of test configs —
at most --jobs at once, each into OUT/<test name>, resuming what is done.
One failing test does not stop the others; the summary shows its error.

Output: OUT/summary.csv and OUT/summary.html, one row per onset with the
test's peak stress and resolution; each test's OUT/<name>/outcome.json says
how it ended.

Shards: with --shard i/n (or inside a Slurm array task, SLURM_ARRAY_TASK_ID
of SLURM_ARRAY_TASK_COUNT; or a Kubernetes Indexed Job's
JOB_COMPLETION_INDEX with --shard-count) only the tests whose index modulo n
is i run, and no summary is written: 'spallscope cluster merge' assembles it
once every task is done. With --frames-per-task F (as 'cluster submit' writes
it) the shard's units follow the campaign's plan: tests with more than F
frames are tracked in frame parts, and merge finishes them.`,
		Args: cobra.ExactArgs(1),
		RunE: func(cmd *cobra.Command, args []string) error {
			c, err := config.ReadCampaign(args[0])
			if err != nil {
				return err
			}
			r := reporter(cmd)
			opt.Tool, opt.Progress = "spallscope "+version, campaignProgress(r, len(c.Tests))
			b, err := cluster.RunBatch(cmd.Context(), c, opt)
			r.Wait()
			if err != nil {
				return err
			}
			for _, r := range b.Results {
				if r.Err != "" {
					fmt.Fprintf(cmd.ErrOrStderr(), "%s: %s\n", r.Config, r.Err)
				} else {
					printSummary(cmd, r.Summary)
				}
			}
			for _, e := range b.PartErrs {
				fmt.Fprintln(cmd.ErrOrStderr(), e)
			}
			where := b.Summary
			if b.Sharded {
				where = fmt.Sprintf("(shard %d/%d: no summary; run spallscope cluster merge)", b.Shard.I, b.Shard.N)
			}
			units, what := b.Units()
			failed := b.Failed()
			fmt.Fprintf(cmd.OutOrStdout(), "campaign %s: %d %s, %d failed; summary %s\n", c.Name, units, what, failed, where)
			if failed > 0 {
				return fmt.Errorf("%d of %d %s failed", failed, units, what)
			}
			return nil
		},
	}
	cmd.Flags().StringVar(&opt.Out, "out", "", "folder for the runs and the summary")
	cmd.Flags().IntVar(&opt.Jobs, "jobs", 0, "tests at once (default: the campaign's jobs, else 1)")
	cmd.Flags().StringVar(&opt.Shard, "shard", "", "run only share i of n of the tests (i/n); the summary is left to 'cluster merge'")
	cmd.Flags().IntVar(&opt.ShardCount, "shard-count", 0, "number of shards when the index comes from JOB_COMPLETION_INDEX")
	cmd.Flags().IntVar(&opt.FramesPerTask, "frames-per-task", 0, "with --shard: track tests longer than this in frame parts (as planned by 'cluster submit')")
	return cmd
}
