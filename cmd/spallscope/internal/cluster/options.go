package cluster

import (
	"errors"
	"fmt"
	"strings"
	"unicode"
	"unicode/utf8"
)

// SubmitOptions are the resources of each array task. Validate checks
// them; Script and MergeScript refuse options that do not validate.
type SubmitOptions struct {
	Partition   string // one name or a comma-separated list ("" : the cluster's default)
	CPUsPerTask int    // at least 1
	Mem         string // memory per node, e.g. "8G" ("" : the partition's default)
	Time        string // time limit, e.g. "04:00:00" ("" : the partition's default)
	MaxParallel int    // at most this many tasks at once (0: no limit)
	Binary      string // the spallscope binary the nodes run
}

// Validate checks every option against what sbatch accepts, so that a
// value reaches an #SBATCH line or the script's command line only when it
// means there what it says (the sbatch(1) man page of Slurm 22.05, read
// for this; the bounds of our own are said so):
//
//   - --partition: one partition name or a comma-separated list of them
//     (sbatch(1), -p). sbatch passes any text on to the controller; we
//     allow only ASCII letters, digits and _ - . in a name, which keeps
//     spaces, quotes, #, % and newlines off the #SBATCH line.
//   - --mem: a whole number with an optional unit K, M, G or T, megabytes
//     without one; 0 is all of a node's memory (sbatch(1), --mem). The
//     unit letter may be lower case, as sbatch 22.05 accepts (tried);
//     at most 15 digits (ours: sbatch refuses 20). "8GB", which sbatch
//     takes but does not document, is refused.
//   - --time: "minutes", "minutes:seconds", "hours:minutes:seconds",
//     "days-hours", "days-hours:minutes" or "days-hours:minutes:seconds",
//     0 for no limit (sbatch(1), --time); UNLIMITED or INFINITE, which
//     sbatch 22.05 accepts too (tried). Each field is 1 to 9 digits
//     (ours); minutes over 59 are allowed, as sbatch allows them; "1-"
//     and "-1", which sbatch takes without documenting them, are not.
//   - --cpus-per-task: at least 1 (sbatch(1), -c: "ncpus number of
//     processors per task").
//   - --max-parallel: 0 (no limit) or more; written as the array's "%K"
//     suffix (sbatch(1), --array).
//   - --binary: a program name or path, not empty, without control
//     characters, not starting with "-" (exec would read it as an option).
//     Any other bytes are fine: the script quotes it for sh.
//
// The error names each option that is wrong and what was expected.
func (o SubmitOptions) Validate() error {
	var errs []error
	if o.Partition != "" && !partitionList(o.Partition) {
		errs = append(errs, fmt.Errorf("--partition %s: expected a partition name, or several separated by commas, of ASCII letters, digits, _ - and . only", excerpt(o.Partition)))
	}
	if o.Mem != "" && !memSize(o.Mem) {
		errs = append(errs, fmt.Errorf("--mem %s: expected a whole number of megabytes, or with a unit K, M, G or T, such as 8G or 16000 (0: all of a node's memory)", excerpt(o.Mem)))
	}
	if o.Time != "" && !timeLimit(o.Time) {
		errs = append(errs, fmt.Errorf("--time %s: expected minutes, minutes:seconds, hours:minutes:seconds, days-hours, days-hours:minutes or days-hours:minutes:seconds, such as 90, 04:00:00 or 2-12 (0 or UNLIMITED: no limit)", excerpt(o.Time)))
	}
	if o.CPUsPerTask < 1 {
		errs = append(errs, fmt.Errorf("--cpus-per-task %d: expected a whole number of at least 1", o.CPUsPerTask))
	}
	if o.MaxParallel < 0 {
		errs = append(errs, fmt.Errorf("--max-parallel %d: expected 0 (no limit) or a whole number of tasks", o.MaxParallel))
	}
	switch {
	case o.Binary == "":
		errs = append(errs, errors.New("--binary is empty: expected the spallscope program as the nodes see it, such as spallscope or /opt/spallscope/bin/spallscope"))
	case strings.HasPrefix(o.Binary, "-"):
		errs = append(errs, fmt.Errorf("--binary %s starts with '-': expected a program name or path (write ./%s for a file in the working folder)", excerpt(o.Binary), o.Binary))
	case hasControl(o.Binary):
		errs = append(errs, fmt.Errorf("--binary %s holds a control character (newline, tab, ...): expected a program name or path", excerpt(o.Binary)))
	}
	return errors.Join(errs...)
}

// partitionList reports whether s is one or more partition names
// separated by commas, each of ASCII letters, digits, _ - and . .
func partitionList(s string) bool {
	for _, name := range strings.Split(s, ",") {
		if name == "" || !onlyBytes(name, asciiAlnum+"_-.") {
			return false
		}
	}
	return true
}

// memSize reports whether s is digits with an optional K, M, G or T.
func memSize(s string) bool {
	if n := len(s); n > 1 && strings.ContainsRune("KMGTkmgt", rune(s[n-1])) {
		s = s[:n-1]
	}
	return digits(s, 15)
}

// timeLimit reports whether s is one of sbatch's time formats (see
// SubmitOptions.Validate).
func timeLimit(s string) bool {
	switch strings.ToUpper(s) {
	case "UNLIMITED", "INFINITE":
		return true
	}
	days, rest, dashed := strings.Cut(s, "-")
	if dashed && !digits(days, 9) {
		return false
	}
	fields := strings.Split(rest, ":")
	if !dashed {
		fields = strings.Split(s, ":")
	}
	// Without days: minutes, minutes:seconds, hours:minutes:seconds. With
	// days: hours, hours:minutes, hours:minutes:seconds.
	if len(fields) > 3 {
		return false
	}
	for _, f := range fields {
		if !digits(f, 9) {
			return false
		}
	}
	return true
}

// digits reports whether s is 1 to most ASCII digits.
func digits(s string, most int) bool {
	return s != "" && len(s) <= most && onlyBytes(s, "0123456789")
}

const asciiAlnum = "ABCDEFGHIJKLMNOPQRSTUVWXYZabcdefghijklmnopqrstuvwxyz0123456789"

// onlyBytes reports whether every byte of s is one of allowed's.
func onlyBytes(s, allowed string) bool {
	return strings.Trim(s, allowed) == ""
}

// hasControl reports whether s holds a control character or bytes that
// are not UTF-8.
func hasControl(s string) bool {
	return !utf8.ValidString(s) || strings.ContainsFunc(s, unicode.IsControl)
}

// excerpt quotes s for a message, cut to its first 60 bytes so that a
// megabyte of pasted text does not fill the terminal.
func excerpt(s string) string {
	const most = 60
	if len(s) <= most {
		return fmt.Sprintf("%q", s)
	}
	return fmt.Sprintf("%q… (%d bytes)", s[:most], len(s))
}
