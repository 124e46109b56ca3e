package main

import (
	"sync"

	"github.com/spf13/cobra"

	"spallscope/cmd/spallscope/internal/job"
	"spallscope/cmd/spallscope/internal/progress"
)

// reporter is the progress display of a command: bars on a terminal,
// plain lines when stderr is a file or a pipe.
func reporter(cmd *cobra.Command) progress.Reporter { return progress.New(cmd.ErrOrStderr()) }

// testProgress shows one test's stages as tasks "TEST/STAGE".
func testProgress(r progress.Reporter, test string) job.Progress {
	return func(stage string, done, total int) { r.Update(test+"/"+stage, done, total) }
}

// campaignProgress shows each test's stages and, as tests finish their
// zones stage, how many of the campaign's tests are done.
func campaignProgress(r progress.Reporter, tests int) job.CampaignProgress {
	var mu sync.Mutex
	finished := map[string]bool{}
	return func(test, stage string, done, total int) {
		r.Update(test+"/"+stage, done, total)
		if stage != "zones" || done != total {
			return
		}
		mu.Lock()
		finished[test] = true
		n := len(finished)
		mu.Unlock()
		r.Update("campaign tests", n, tests)
	}
}
