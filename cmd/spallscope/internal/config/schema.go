package config

import (
	"encoding"
	"fmt"
	"math"
	"reflect"
	"slices"
	"sort"
	"strconv"
	"strings"

	"github.com/goccy/go-yaml"
	"github.com/goccy/go-yaml/ast"
	"github.com/goccy/go-yaml/parser"

	"spallscope/dic/logtable"
)

// checkSchema holds a YAML document, decoded without a type (doc, as
// yaml.Unmarshal into an any gives it: anchors, aliases and merge keys
// resolved, flow and block style alike), against the config struct type
// t, before the typed decoding that would let two kinds of slip through:
//
//   - a key that is not one of the struct's where it stands is named with
//     its section ("zones", "openings[1]") and the keys valid there;
//   - a number with a fraction or an exponent for an integer setting
//     (2.5, 1e3, '2.5') is refused, where the decoder truncates it to 2
//     (or takes -0.5 as 0, that is the default).
//
// data is the document's text, parsed again only to give each problem its
// line. All problems are reported, in line order.
func checkSchema(data []byte, doc any, t reflect.Type) error {
	w := schemaWalk{}
	if f, err := parser.ParseBytes(data, 0); err == nil && len(f.Docs) > 0 {
		w.root = f.Docs[0].Body
		w.anchors = map[string]ast.Node{}
		if w.root != nil {
			ast.Walk(anchorCollector(w.anchors), w.root)
			w.problems = append(w.problems, leadingZeroes(w.root)...)
		}
	}
	w.walk(t, doc, nil)
	if w.values > maxSchemaValues {
		return &schemaProblem{0, fmt.Errorf("the document holds more than %d values (aliases repeat what they name); a config is far smaller", maxSchemaValues)}
	}
	if w.full() {
		w.problems = append(w.problems, &schemaProblem{0, fmt.Errorf("more problems not looked for after the first %d", maxSchemaProblems)})
	}
	order := func(p *schemaProblem) int { // problems without a line (through a merge key) last
		if p.line == 0 {
			return math.MaxInt
		}
		return p.line
	}
	sort.SliceStable(w.problems, func(i, j int) bool { return order(w.problems[i]) < order(w.problems[j]) })
	var p Problems
	for _, pr := range w.problems {
		p.add(pr)
	}
	return p.err()
}

// maxSchemaProblems is how many problems checkSchema collects before it
// stops looking: aliases can repeat one mapping of a thousand unknown keys
// a thousand times in 13 kB, and each problem costs a look-up of its line.
const maxSchemaProblems = 100

// maxSchemaValues is the most values checkSchema takes from a document,
// counted as the decoder would build them (an alias counts as often as it
// is used): the example config holds about 150, and a thousand faces of a
// thousand openings, written in 20 kB with an alias, would take seconds
// to check and decode.
const maxSchemaValues = 100_000

// schemaWalk is one pass of checkSchema.
type schemaWalk struct {
	values   int                 // values walked
	root     ast.Node            // the document's AST, for lines (nil: none)
	anchors  map[string]ast.Node // anchor name → its value
	problems []*schemaProblem
}

// schemaProblem is one problem with the line it is on (0: not known).
type schemaProblem struct {
	line int
	err  error
}

func (p *schemaProblem) Error() string {
	if p.line > 0 {
		return fmt.Sprintf("line %d: %v", p.line, p.err)
	}
	return p.err.Error()
}

func (p *schemaProblem) Unwrap() error { return p.err }

// step is one step of a path into the document: a key, or an index.
type step struct {
	key   string
	index int // when key is ""
}

// pathString writes a path as a dotted key: faces[1].times.fps.
func pathString(path []step) string {
	var b strings.Builder
	for _, s := range path {
		switch {
		case s.key == "":
			fmt.Fprintf(&b, "[%d]", s.index)
		case b.Len() > 0:
			b.WriteString("." + s.key)
		default:
			b.WriteString(s.key)
		}
	}
	return b.String()
}

var (
	textUnmarshaler  = reflect.TypeFor[encoding.TextUnmarshaler]()
	bytesUnmarshaler = reflect.TypeFor[yaml.BytesUnmarshaler]()
	ifaceUnmarshaler = reflect.TypeFor[yaml.InterfaceUnmarshaler]()
)

// full reports whether the walk has found maxSchemaProblems problems.
func (w *schemaWalk) full() bool { return len(w.problems) >= maxSchemaProblems }

// walk checks value v of Go type t at path.
func (w *schemaWalk) walk(t reflect.Type, v any, path []step) {
	for t.Kind() == reflect.Pointer {
		t = t.Elem()
	}
	if w.values++; v == nil || w.full() || w.values > maxSchemaValues {
		return
	}
	if p := reflect.PointerTo(t); p.Implements(textUnmarshaler) || p.Implements(bytesUnmarshaler) || p.Implements(ifaceUnmarshaler) {
		return // the type reads its own text (a delimiter)
	}
	switch t.Kind() {
	case reflect.Struct:
		m, ok := v.(map[string]any)
		if !ok {
			return // not a mapping: the typed decoder says so
		}
		keys := Keys(t)
		names := make([]string, 0, len(m))
		for k := range m {
			names = append(names, k)
		}
		sort.Strings(names)
		for _, k := range names {
			if w.full() {
				break
			}
			at := append(slices.Clip(path), step{key: k})
			i := slices.IndexFunc(keys, func(key Key) bool { return key.Name == k })
			if i < 0 {
				w.unknownKey(at, keys)
				continue
			}
			w.walk(keys[i].Type, m[k], at)
		}
	case reflect.Slice:
		s, ok := v.([]any)
		if !ok {
			return
		}
		for i, e := range s {
			w.walk(t.Elem(), e, append(slices.Clip(path), step{index: i}))
		}
	case reflect.Int, reflect.Int8, reflect.Int16, reflect.Int32, reflect.Int64,
		reflect.Uint, reflect.Uint8, reflect.Uint16, reflect.Uint32, reflect.Uint64:
		var whole bool
		switch x := v.(type) {
		case float64:
			whole = false // written with a point or an exponent, or as .inf/.nan
		case string:
			_, err := strconv.Atoi(x)
			whole = err == nil
		default:
			whole = true // an integer (or a bool, which the typed decoder refuses)
		}
		if !whole {
			line, text := w.locate(path)
			if text == "" {
				text = fmt.Sprint(v)
			}
			w.problems = append(w.problems, &schemaProblem{line, &FieldError{Key: pathString(path), Value: text,
				Expected: "a whole number (an integer setting: no decimal point, fraction or exponent)"}})
		}
	case reflect.Float32, reflect.Float64:
		if s, ok := v.(string); ok {
			if _, err := strconv.ParseFloat(s, 64); err != nil {
				line, _ := w.locate(path)
				w.problems = append(w.problems, &schemaProblem{line, &FieldError{Key: pathString(path), Value: logtable.Excerpt(s),
					Expected: "a number within float64's range"}})
			}
		}
	}
}

// unknownKey records a key that the struct at its section does not have.
func (w *schemaWalk) unknownKey(path []step, keys []Key) {
	section := "at the top level"
	if len(path) > 1 {
		section = "in " + pathString(path[:len(path)-1])
	}
	names := make([]string, len(keys))
	for i, k := range keys {
		names[i] = k.Name
	}
	line, _ := w.locate(path)
	w.problems = append(w.problems, &schemaProblem{line, fmt.Errorf("unknown key %s %s; valid keys there: %s",
		logtable.Excerpt(path[len(path)-1].key), section, strings.Join(names, ", "))})
}

// locate finds the node at path in the AST: the line of its key (or
// element) and the text of its value when it is a scalar. It gives 0 and
// "" for what it cannot follow (a key brought in by a merge key).
func (w *schemaWalk) locate(path []step) (line int, text string) {
	node := w.root
	for _, s := range path {
		node = w.resolve(node)
		var next ast.Node
		switch n := node.(type) {
		case *ast.MappingNode:
			for _, mv := range n.Values {
				if keyText(mv.Key) == s.key && s.key != "" {
					next, line = mv.Value, mv.Key.GetToken().Position.Line
					break
				}
			}
		case *ast.MappingValueNode:
			if keyText(n.Key) == s.key && s.key != "" {
				next, line = n.Value, n.Key.GetToken().Position.Line
			}
		case *ast.SequenceNode:
			if s.key == "" && s.index < len(n.Values) {
				next = n.Values[s.index]
				if tk := next.GetToken(); tk != nil {
					line = tk.Position.Line
				}
			}
		}
		if next == nil {
			return 0, ""
		}
		node = next
	}
	if sc, ok := w.resolve(node).(ast.ScalarNode); ok {
		if tk := sc.GetToken(); tk != nil {
			text = tk.Value
		}
	}
	return line, text
}

// resolve looks through tags, anchors and aliases (a bounded number, so a
// self-referring alias cannot loop).
func (w *schemaWalk) resolve(n ast.Node) ast.Node {
	for range 32 {
		switch x := n.(type) {
		case *ast.TagNode:
			n = x.Value
		case *ast.AnchorNode:
			n = x.Value
		case *ast.AliasNode:
			if x.Value == nil {
				return nil
			}
			n = w.anchors[x.Value.GetToken().Value]
		default:
			return n
		}
	}
	return nil
}

// keyText is a mapping key as the untyped decoder keys it.
func keyText(k ast.MapKeyNode) string {
	if k == nil {
		return ""
	}
	if s, ok := k.(*ast.StringNode); ok {
		return s.Value
	}
	if tk := k.GetToken(); tk != nil {
		return tk.Value
	}
	return ""
}

// anchorCollector records every anchor's value by name.
type anchorCollector map[string]ast.Node

func (a anchorCollector) Visit(n ast.Node) ast.Visitor {
	if x, ok := n.(*ast.AnchorNode); ok && x.Name != nil && x.Name.GetToken() != nil {
		a[x.Name.GetToken().Value] = x.Value
	}
	return a
}

// Key is one YAML key of a config struct and the type of its value.
type Key struct {
	Name string
	Type reflect.Type
}

// Keys lists the yaml keys of a struct type in declaration order (through
// slices and pointers, with the keys of inline structs put in where they
// are embedded); nil for a type that is not a struct.
func Keys(t reflect.Type) []Key {
	for t.Kind() == reflect.Slice || t.Kind() == reflect.Pointer {
		t = t.Elem()
	}
	if t.Kind() != reflect.Struct {
		return nil
	}
	var keys []Key
	for i := 0; i < t.NumField(); i++ {
		f := t.Field(i)
		tag, opts, _ := strings.Cut(f.Tag.Get("yaml"), ",")
		switch {
		case strings.Contains(opts, "inline"):
			keys = append(keys, Keys(f.Type)...)
		case tag != "" && tag != "-":
			keys = append(keys, Key{tag, f.Type})
		}
	}
	return keys
}
