package config

import (
	"fmt"
	"regexp"

	"github.com/goccy/go-yaml/ast"
)

// leadingZeroNumber matches a plain number written with a leading zero
// (017, -0042, +07): YAML 1.1 reads it as octal, YAML 1.2's core schema
// (§10.3.2) as decimal, and goccy/go-yaml v1.19.2 as octal (017 gives 15,
// measured in TestLeadingZeroIsRefused); 0o17, 0x1F and 0.5 do not match.
var leadingZeroNumber = regexp.MustCompile(`^[-+]?0[0-9]+$`)

// leadingZeroes reports every plain scalar of the document written as a
// number with a leading zero. The two YAML versions disagree on its value,
// and a specimen number such as "name: 017" would silently become the test
// "15": the writer is asked to say which one is meant.
func leadingZeroes(root ast.Node) []*schemaProblem {
	var found []*schemaProblem
	ast.Walk(visitFunc(func(n ast.Node) {
		x, ok := n.(*ast.IntegerNode)
		if !ok || x.Token == nil || !leadingZeroNumber.MatchString(x.Token.Value) {
			return
		}
		line := 0
		if x.Token.Position != nil {
			line = x.Token.Position.Line
		}
		v := x.Token.Value
		found = append(found, &schemaProblem{line, fmt.Errorf("%s: a number with a leading zero is octal to some YAML readers and decimal to others; write it without the zero, as 0o… for octal, or in quotes ('%s') for a name", v, v)})
	}), root)
	return found
}

// visitFunc is an ast.Visitor that calls itself on every node.
type visitFunc func(ast.Node)

func (f visitFunc) Visit(n ast.Node) ast.Visitor {
	f(n)
	return f
}
