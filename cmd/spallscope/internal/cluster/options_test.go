package cluster

import (
	"strings"
	"testing"
)

// The values sbatch(1) (Slurm 22.05) documents are accepted: --mem as a
// number with an optional K, M, G or T (0: all of a node's memory),
// --time in its six formats (0: no limit), --partition as a name or a
// comma-separated list; UNLIMITED and lower-case units, which sbatch
// 22.05 also accepted when tried.
func TestValidateAcceptsSbatchDocumentedValues(t *testing.T) {
	base := SubmitOptions{CPUsPerTask: 1, Binary: "spallscope"}
	for _, o := range []SubmitOptions{
		{Mem: "16000"}, {Mem: "8G"}, {Mem: "512M"}, {Mem: "1T"}, {Mem: "4096K"}, {Mem: "0"}, {Mem: "8g"},
		{Time: "90"}, {Time: "90:30"}, {Time: "04:00:00"}, {Time: "48:00:00"}, {Time: "2-12"}, {Time: "2-12:30"},
		{Time: "2-12:30:15"}, {Time: "0"}, {Time: "UNLIMITED"}, {Time: "infinite"},
		{Partition: "long"}, {Partition: "gpu_a100"}, {Partition: "short,long"}, {Partition: "rock-mech.2"},
		{MaxParallel: 4}, {CPUsPerTask: 64}, {Binary: "/opt/spallscope 1.2/bin/spallscope"}, {Binary: "./spallscope"},
	} {
		o.CPUsPerTask = max(o.CPUsPerTask, base.CPUsPerTask)
		if o.Binary == "" {
			o.Binary = base.Binary
		}
		if err := o.Validate(); err != nil {
			t.Errorf("%+v refused: %v", o, err)
		}
	}
}

// Hostile and careless values are refused with the option's name and
// what was expected: newlines and shell metacharacters (which used to be
// written verbatim into the #SBATCH lines, the newline starting a
// command), values outside sbatch(1)'s forms — most of which sbatch 22.05
// refuses too when tried ("8.5G", "-1" memory, "8X", "1:2:3:4", "abc",
// ":10", " 10"), some it takes without documenting them ("8GB", time "1-"
// and "-1") — and counts out of range.
func TestValidateRefusesHostileAndMalformedValues(t *testing.T) {
	for _, c := range []struct {
		opt  SubmitOptions
		flag string
	}{
		{SubmitOptions{Partition: "long\ntouch PWNED"}, "--partition"},
		{SubmitOptions{Partition: "long; touch PWNED"}, "--partition"},
		{SubmitOptions{Partition: "$(touch PWNED)"}, "--partition"},
		{SubmitOptions{Partition: "long,"}, "--partition"},
		{SubmitOptions{Partition: "a b"}, "--partition"},
		{SubmitOptions{Partition: "long%x"}, "--partition"},
		{SubmitOptions{Mem: "8G\n#SBATCH --uid=0"}, "--mem"},
		{SubmitOptions{Mem: "8G `touch PWNED`"}, "--mem"},
		{SubmitOptions{Mem: "8.5G"}, "--mem"},
		{SubmitOptions{Mem: "-1"}, "--mem"},
		{SubmitOptions{Mem: "8X"}, "--mem"},
		{SubmitOptions{Mem: "G"}, "--mem"},
		{SubmitOptions{Mem: "8GB"}, "--mem"},
		{SubmitOptions{Mem: "99999999999999999999"}, "--mem"},
		{SubmitOptions{Time: "04:00:00\nrm -rf ~"}, "--time"},
		{SubmitOptions{Time: "$(reboot)"}, "--time"},
		{SubmitOptions{Time: "1:2:3:4"}, "--time"},
		{SubmitOptions{Time: "1-2:3:4:5"}, "--time"},
		{SubmitOptions{Time: "abc"}, "--time"},
		{SubmitOptions{Time: "1-"}, "--time"},
		{SubmitOptions{Time: "-1"}, "--time"},
		{SubmitOptions{Time: ":10"}, "--time"},
		{SubmitOptions{Time: " 10"}, "--time"},
		{SubmitOptions{Binary: "spallscope\ntouch PWNED"}, "--binary"},
		{SubmitOptions{Binary: "-c"}, "--binary"},
		{SubmitOptions{Binary: ""}, "--binary"},
		{SubmitOptions{CPUsPerTask: -1}, "--cpus-per-task"},
		{SubmitOptions{MaxParallel: -2}, "--max-parallel"},
	} {
		o := c.opt
		if o.CPUsPerTask == 0 {
			o.CPUsPerTask = 1
		}
		if o.Binary == "" && c.flag != "--binary" {
			o.Binary = "spallscope"
		}
		err := o.Validate()
		if err == nil || !strings.Contains(err.Error(), c.flag) || !strings.Contains(err.Error(), "expected") {
			t.Errorf("%+v: error %v, want one naming %s and what was expected", c.opt, err, c.flag)
		}
	}
	// A zero CPU count is refused too (the command's default is 2), and
	// several errors are reported at once.
	err := SubmitOptions{Partition: "a\nb", Mem: "x", Binary: "spallscope"}.Validate()
	for _, flag := range []string{"--partition", "--mem", "--cpus-per-task 0"} {
		if err == nil || !strings.Contains(err.Error(), flag) {
			t.Errorf("several wrong options: %v, want %s named", err, flag)
		}
	}
	// A megabyte of pasted text is not echoed whole.
	long := strings.Repeat("x;", 1<<19)
	if err := (SubmitOptions{Partition: long, CPUsPerTask: 1, Binary: "s"}).Validate(); err == nil || len(err.Error()) > 400 {
		t.Errorf("a 1 MiB partition: error of %d bytes, want a short excerpt", len(err.Error()))
	}
}
