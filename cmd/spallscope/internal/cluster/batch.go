package cluster

import (
	"context"
	"fmt"
	"path/filepath"

	"spallscope/cmd/spallscope/internal/config"
	"spallscope/cmd/spallscope/internal/job"
)

// BatchOptions are how a campaign runs in one process: on its own, or as
// one task of an array job.
type BatchOptions struct {
	Out  string // output folder (default the campaign's)
	Jobs int    // tests at once (default the campaign's jobs, else 1)
	// Shard is "i/n" to run one share of the campaign; empty: from the
	// array job's environment (ShardCount gives the count where the
	// environment does not), else the whole campaign.
	Shard      string
	ShardCount int
	// FramesPerTask, with a shard, follows the campaign's plan: tests
	// with more frames are tracked in frame parts.
	FramesPerTask int
	Tool          string
	Progress      job.CampaignProgress
}

// Batch is what a campaign's run in one process did.
type Batch struct {
	Out string
	// Sharded is true for one task of an array job (Shard): it writes no
	// campaign summary; 'cluster merge' does once every task is done.
	Sharded bool
	Shard   Shard
	Results []job.Result
	// Parts are the frame parts the task tracked, PartErrs their errors.
	Parts    []Unit
	PartErrs []error
	// Summary is the campaign summary page, when one was written.
	Summary string
}

// Failed counts the tests and parts that failed.
func (b *Batch) Failed() int {
	n := len(b.PartErrs)
	for _, r := range b.Results {
		if r.Err != "" {
			n++
		}
	}
	return n
}

// Units counts the units of work run, and says what they were.
func (b *Batch) Units() (int, string) {
	if len(b.Parts) > 0 {
		return len(b.Results) + len(b.Parts), "units (tests and frame parts)"
	}
	return len(b.Results), "tests"
}

// RunBatch runs campaign c, or this process's share of it, each test into
// its run folder under the output folder, and — for a whole campaign —
// writes the campaign summary. A failing test does not stop the others;
// its error is in its Result. When ctx is done, the tests under way stop
// at their next frame boundary and resume when run again.
func RunBatch(ctx context.Context, c *config.Campaign, o BatchOptions) (*Batch, error) {
	b := &Batch{Out: job.CampaignOut(c, o.Out)}
	// --shard wins over the environment: a resubmission of some of the
	// tasks has fewer array tasks than the plan has.
	var err error
	if o.Shard != "" {
		if b.Shard, err = ParseShard(o.Shard); err != nil {
			return nil, err
		}
		b.Sharded = b.Shard.N > 1
	} else if b.Shard, b.Sharded, err = FromEnv(o.ShardCount); err != nil {
		return nil, err
	}
	if o.FramesPerTask > 0 && !b.Sharded {
		return nil, fmt.Errorf("--frames-per-task divides tests over the tasks of an array job: give --shard i/n too (or use 'spallscope cluster submit')")
	}
	include := b.Shard.Has
	if b.Sharded {
		plan, err := NewPlan(c, o.FramesPerTask, b.Shard.N)
		if err != nil {
			return nil, err
		}
		if plan.Tasks != b.Shard.N {
			return nil, fmt.Errorf("shard %d/%d: the campaign has only %d units of work", b.Shard.I, b.Shard.N, plan.Tasks)
		}
		if err := CheckPlan(b.Out, plan); err != nil {
			return nil, fmt.Errorf("shard %d/%d: %w", b.Shard.I, b.Shard.N, err)
		}
		whole := map[string]bool{}
		for _, u := range plan.Task(b.Shard.I) {
			if u.Part == nil {
				whole[u.Config] = true
			} else {
				b.Parts = append(b.Parts, u)
			}
		}
		include = func(k int) bool { return whole[c.Tests[k]] }
	}
	b.Results = job.RunCampaign(ctx, c, b.Out, o.Tool, o.Jobs, include, o.Progress)
	b.PartErrs = runParts(ctx, b.Parts, b.Out, o.Tool, o.Progress)
	if !b.Sharded {
		if err := job.WriteCampaignSummary(b.Out, c.Name, b.Results); err != nil {
			return b, err
		}
		b.Summary = filepath.Join(b.Out, job.SummaryHTML)
	}
	return b, nil
}

// runParts tracks frame parts one after the other, each into its test's
// run folder under out, and returns their errors.
func runParts(ctx context.Context, units []Unit, out, tool string, progress job.CampaignProgress) []error {
	var errs []error
	for _, u := range units {
		label := u.Test + " " + u.Part.String()
		var p job.Progress
		if progress != nil {
			p = func(stage string, done, total int) { progress(label, stage, done, total) }
		}
		if err := job.TrackPart(ctx, u.Config, filepath.Join(out, u.Test), tool, *u.Part, p); err != nil {
			errs = append(errs, fmt.Errorf("%s: %w", u, err))
		}
	}
	return errs
}
