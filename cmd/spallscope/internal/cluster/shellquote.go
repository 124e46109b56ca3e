package cluster

import "strings"

// shellQuote returns s as one word of a POSIX sh command line, the same
// bytes after the shell has read it: s itself when every byte is one that
// no shell treats specially (letters, digits and % + , - . / : @ _),
// otherwise s in single quotes, each ' in s written as
//
//	'\''
//
// (close the quotes, an escaped quote, open them again). Inside single
// quotes the shell expands nothing — no $, `, \ or newline is special —
// and a single quote cannot occur (POSIX.1-2017, Shell Command Language,
// 2.2.3 "Single-Quotes"), so this holds for any bytes but NUL, which no
// argument of a command can carry.
func shellQuote(s string) string {
	if s != "" && strings.Trim(s, shellPlain) == "" {
		return s
	}
	return "'" + strings.ReplaceAll(s, "'", `'\''`) + "'"
}

// shellPlain are the bytes a word may hold unquoted: none of them is an
// operator, a quote, an expansion, a glob or a separator in sh (POSIX
// Shell Command Language 2.2 and 2.13), and none starts a tilde expansion
// or makes a word an assignment.
const shellPlain = "ABCDEFGHIJKLMNOPQRSTUVWXYZabcdefghijklmnopqrstuvwxyz0123456789%+,-./:@_"
