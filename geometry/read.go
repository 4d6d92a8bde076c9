package geometry

import (
	"errors"
	"fmt"
	"math"
	"sort"
	"strings"

	"github.com/BurntSushi/toml"
)

// InputError is one mistake in a job file, located by file, line and key. Its message is one line:
// "file:line: key: what is wrong (how to fix it)". The command line exits with status 2 on it.
type InputError struct {
	File string
	Line int
	// Key is the dotted key as written in the file, without array indices ("coil.turn.wall").
	Key string
	// Msg says what is wrong and, in parentheses, how to fix it.
	Msg string
}

func (e *InputError) Error() string {
	if e.Key == "" {
		return fmt.Sprintf("%s:%d: %s", e.File, e.Line, e.Msg)
	}
	return fmt.Sprintf("%s:%d: %s: %s", e.File, e.Line, e.Key, e.Msg)
}

// reader turns TOML values into typed values and every complaint into an *InputError with a line.
type reader struct {
	file  string
	lines map[string]int // indexed key path ("coil[1].turn[0].wall") → line of the key
}

// errAt builds the error for the key at indexed path; a key absent from the file is reported at the line of
// the nearest enclosing table that is present (line 1 for the top level).
func (r *reader) errAt(path, format string, args ...any) *InputError {
	file := ""
	if r != nil {
		file = r.file
	}
	return &InputError{File: file, Line: r.line(path), Key: displayKey(path), Msg: fmt.Sprintf(format, args...)}
}

func (r *reader) line(path string) int {
	if r == nil {
		return 0
	}
	for p := path; p != ""; {
		if l, ok := r.lines[p]; ok {
			return l
		}
		i := strings.LastIndexAny(p, ".[")
		if i < 0 {
			break
		}
		p = p[:i]
	}
	return 1
}

// displayKey drops array indices: "coil[1].turn[0].wall" → "coil.turn.wall".
func displayKey(path string) string {
	var b strings.Builder
	skip := false
	for _, c := range path {
		switch {
		case c == '[':
			skip = true
		case c == ']':
			skip = false
		case !skip:
			b.WriteRune(c)
		}
	}
	return b.String()
}

// decodeTOML parses src into a generic tree, turning syntax errors into *InputError.
func (r *reader) decodeTOML(src string) (map[string]any, error) {
	var tree map[string]any
	if _, err := toml.Decode(src, &tree); err != nil {
		var pe toml.ParseError
		if errors.As(err, &pe) {
			key := ""
			if pe.LastKey != "" {
				key = pe.LastKey
			}
			return nil, &InputError{File: r.file, Line: pe.Position.Line, Key: key,
				Msg: fmt.Sprintf("TOML syntax: %s (see docs/job-file.md for the file's form)", pe.Message)}
		}
		return nil, &InputError{File: r.file, Line: 1, Msg: fmt.Sprintf("TOML: %v", err)}
	}
	return tree, nil
}

// node is one TOML table being read; it remembers which keys were asked for so unknown ones can be reported.
type node struct {
	r     *reader
	path  string
	m     map[string]any
	known map[string]bool
}

func (r *reader) root(m map[string]any) *node { return &node{r: r, m: m, known: map[string]bool{}} }

func (n *node) keyPath(key string) string {
	if n.path == "" {
		return key
	}
	return n.path + "." + key
}

func (n *node) err(key, format string, args ...any) *InputError {
	return n.r.errAt(n.keyPath(key), format, args...)
}

func (n *node) has(key string) bool {
	n.known[key] = true
	_, ok := n.m[key]
	return ok
}

func tomlKind(v any) string {
	switch v.(type) {
	case string:
		return "a string"
	case int64, float64:
		return "a number"
	case bool:
		return "true/false"
	case map[string]any:
		return "a table"
	case []map[string]any:
		return "an array of tables"
	case []any:
		return "an array"
	}
	return fmt.Sprintf("%T", v)
}

func missing(key, example string) string {
	return fmt.Sprintf("missing value (add for example %s = %s)", key, example)
}

// missingErr reports a required key that is absent; when the table holds an unknown key spelled nearly the
// same, that misspelling is the error reported, at its own line.
func (n *node) missingErr(key, example string) error {
	for k := range n.m {
		if !n.known[k] && editDistance(k, key) <= 2 {
			return n.err(k, "unknown key (did you mean %s?)", key)
		}
	}
	return n.err(key, "%s", missing(key, example))
}

// editDistance is the Levenshtein distance between a and b (bytes).
func editDistance(a, b string) int {
	prev := make([]int, len(b)+1)
	cur := make([]int, len(b)+1)
	for j := range prev {
		prev[j] = j
	}
	for i := 1; i <= len(a); i++ {
		cur[0] = i
		for j := 1; j <= len(b); j++ {
			c := prev[j-1]
			if a[i-1] != b[j-1] {
				c++
			}
			cur[j] = min(c, prev[j]+1, cur[j-1]+1)
		}
		prev, cur = cur, prev
	}
	return prev[len(b)]
}

// str reads a string; def is used when absent and not required.
func (n *node) str(key string, required bool, def string) (string, error) {
	if !n.has(key) {
		if required {
			return "", n.missingErr(key, `"..."`)
		}
		return def, nil
	}
	s, ok := n.m[key].(string)
	if !ok {
		return "", n.err(key, "expected a string in quotes, found %s (write for example %s = \"name\")", tomlKind(n.m[key]), key)
	}
	return s, nil
}

// choice reads a string that must be one of opts.
func (n *node) choice(key string, required bool, def string, opts ...string) (string, error) {
	s, err := n.str(key, required, def)
	if err != nil {
		return "", err
	}
	for _, o := range opts {
		if s == o {
			return s, nil
		}
	}
	return "", n.err(key, "%q is not one of the choices (use one of %s)", s, quoteList(opts))
}

func quoteList(s []string) string {
	q := make([]string, len(s))
	for i := range s {
		q[i] = fmt.Sprintf("%q", s[i])
	}
	return strings.Join(q, ", ")
}

// quantity reads a value with a unit (or a bare SI number). present says whether the key was in the file.
func (n *node) quantity(key string, d Dim, required bool, def float64) (v float64, present bool, err error) {
	if !n.has(key) {
		if required {
			return 0, false, n.missingErr(key, dimExamples[d])
		}
		return def, false, nil
	}
	v, err = n.valueQuantity(n.keyPath(key), n.m[key], d)
	return v, true, err
}

func (n *node) valueQuantity(path string, raw any, d Dim) (float64, error) {
	switch x := raw.(type) {
	case string:
		v, err := ParseQuantity(x, d)
		if err != nil {
			return 0, n.r.errAt(path, "%v (write it like %s)", err, dimExamples[d])
		}
		return v, nil
	case int64:
		return float64(x), nil
	case float64:
		if math.IsNaN(x) || math.IsInf(x, 0) {
			return 0, n.r.errAt(path, "%v is not a finite number (write it like %s)", x, dimExamples[d])
		}
		return x, nil
	}
	return 0, n.r.errAt(path, "expected %s such as %s, found %s", d, dimExamples[d], tomlKind(raw))
}

// positive reads a quantity that must be > 0 when present.
func (n *node) positive(key string, d Dim, required bool, def float64) (float64, bool, error) {
	v, ok, err := n.quantity(key, d, required, def)
	if err == nil && ok && !(v > 0) {
		err = n.err(key, "must be greater than zero, got %v (give a positive %s such as %s)", n.m[key], strings.TrimPrefix(strings.TrimPrefix(d.String(), "an "), "a "), dimExamples[d])
	}
	return v, ok, err
}

// integer reads a whole number.
func (n *node) integer(key string, required bool, def int) (int, bool, error) {
	if !n.has(key) {
		if required {
			return 0, false, n.missingErr(key, "3")
		}
		return def, false, nil
	}
	switch x := n.m[key].(type) {
	case int64:
		if x > math.MaxInt32 || x < math.MinInt32 {
			return 0, true, n.err(key, "%d is out of range (use a smaller whole number)", x)
		}
		return int(x), true, nil
	case float64:
		if x == math.Trunc(x) && math.Abs(x) < math.MaxInt32 {
			return int(x), true, nil
		}
	}
	return 0, true, n.err(key, "expected a whole number, found %s (write for example %s = 3)", tomlKind(n.m[key]), key)
}

// quantityList reads an array of quantities.
func (n *node) quantityList(key string, d Dim) ([]float64, error) {
	if !n.has(key) {
		return nil, nil
	}
	arr, ok := n.m[key].([]any)
	if !ok {
		return nil, n.err(key, "expected an array such as [%s, %s], found %s", dimExamples[d], dimExamples[d], tomlKind(n.m[key]))
	}
	out := make([]float64, len(arr))
	for i, a := range arr {
		v, err := n.valueQuantity(n.keyPath(key), a, d)
		if err != nil {
			return nil, err
		}
		out[i] = v
	}
	return out, nil
}

// table reads a sub-table; nil when absent.
func (n *node) table(key string) (*node, error) {
	if !n.has(key) {
		return nil, nil
	}
	m, ok := n.m[key].(map[string]any)
	if !ok {
		return nil, n.err(key, "expected a table [%s], found %s", n.keyPath(key), tomlKind(n.m[key]))
	}
	return &node{r: n.r, path: n.keyPath(key), m: m, known: map[string]bool{}}, nil
}

// tables reads an array of tables [[key]].
func (n *node) tables(key string) ([]*node, error) {
	if !n.has(key) {
		return nil, nil
	}
	arr, ok := n.m[key].([]map[string]any)
	if !ok {
		return nil, n.err(key, "expected one or more [[%s]] tables, found %s", n.keyPath(key), tomlKind(n.m[key]))
	}
	out := make([]*node, len(arr))
	for i, m := range arr {
		out[i] = &node{r: n.r, path: fmt.Sprintf("%s[%d]", n.keyPath(key), i), m: m, known: map[string]bool{}}
	}
	return out, nil
}

// finish reports the first (in file order) key that no reader asked for.
func (n *node) finish() error {
	var unknown []string
	for k := range n.m {
		if !n.known[k] {
			unknown = append(unknown, k)
		}
	}
	if len(unknown) == 0 {
		return nil
	}
	sort.Slice(unknown, func(a, b int) bool {
		la, lb := n.r.line(n.keyPath(unknown[a])), n.r.line(n.keyPath(unknown[b]))
		if la != lb {
			return la < lb
		}
		return unknown[a] < unknown[b]
	})
	keys := make([]string, 0, len(n.known))
	for k := range n.known {
		keys = append(keys, k)
	}
	sort.Strings(keys)
	where := "at the top level"
	if n.path != "" {
		where = "in [" + displayKey(n.path) + "]"
	}
	return n.err(unknown[0], "unknown key (check the spelling; keys allowed %s: %s)", where, strings.Join(keys, ", "))
}

// indexKeys maps each key and table of a TOML document to its line, as indexed paths: "coil[1].turn[0].wall".
// It follows the document's structure only as far as finding keys needs (tables, arrays of tables, dotted keys,
// values spanning lines); the TOML parser proper has already accepted the document.
func indexKeys(src string) map[string]int {
	lines := map[string]int{}
	count := map[string]int{}
	table := ""
	depth := 0 // bracket nesting of a value continuing over lines
	inML := "" // closing delimiter of a multi-line string in progress
	resolve := func(parts []string, array bool) string {
		path := ""
		for i, p := range parts {
			if path != "" {
				path += "."
			}
			path += p
			if array && i == len(parts)-1 {
				idx := count[path]
				count[path]++
				path += fmt.Sprintf("[%d]", idx)
			} else if c := count[path]; c > 0 {
				path += fmt.Sprintf("[%d]", c-1)
			}
		}
		return path
	}
	for ln, line := range strings.Split(src, "\n") {
		lineNo := ln + 1
		if inML != "" {
			i := strings.Index(line, inML)
			if i < 0 {
				continue
			}
			line = line[i+3:]
			inML = ""
		} else if depth == 0 {
			t := strings.TrimSpace(line)
			switch {
			case strings.HasPrefix(t, "[["):
				if e := strings.Index(t, "]]"); e > 2 {
					table = resolve(splitDotted(t[2:e]), true)
					lines[table] = lineNo
				}
				continue
			case strings.HasPrefix(t, "["):
				if e := strings.Index(t, "]"); e > 1 {
					table = resolve(splitDotted(t[1:e]), false)
					if _, ok := lines[table]; !ok {
						lines[table] = lineNo
					}
				}
				continue
			}
			if key, rest, ok := cutKey(t); ok {
				path := table
				for _, p := range splitDotted(key) {
					if path != "" {
						path += "."
					}
					path += p
					if _, ok := lines[path]; !ok {
						lines[path] = lineNo
					}
				}
				line = rest
			}
		}
		depth, inML = scanValue(line, depth)
	}
	return lines
}

// cutKey splits "key = value" at the first '=' outside quotes.
func cutKey(t string) (key, rest string, ok bool) {
	var q byte
	for i := 0; i < len(t); i++ {
		c := t[i]
		switch {
		case q != 0:
			if c == q {
				q = 0
			}
		case c == '"' || c == '\'':
			q = c
		case c == '#':
			return "", "", false
		case c == '=':
			return strings.TrimSpace(t[:i]), t[i+1:], i > 0
		}
	}
	return "", "", false
}

// splitDotted splits a dotted key, removing quotes and spaces around the parts.
func splitDotted(k string) []string {
	var parts []string
	var b strings.Builder
	var q byte
	for i := 0; i < len(k); i++ {
		c := k[i]
		switch {
		case q != 0:
			if c == q {
				q = 0
			} else {
				b.WriteByte(c)
			}
		case c == '"' || c == '\'':
			q = c
		case c == '.':
			parts = append(parts, strings.TrimSpace(b.String()))
			b.Reset()
		case c != ' ' && c != '\t':
			b.WriteByte(c)
		}
	}
	return append(parts, strings.TrimSpace(b.String()))
}

// scanValue follows brackets and strings on one line of a value, returning the nesting depth at its end and the
// delimiter of a multi-line string left open.
func scanValue(s string, depth int) (int, string) {
	for i := 0; i < len(s); i++ {
		c := s[i]
		switch c {
		case '#':
			return depth, ""
		case '[', '{':
			depth++
		case ']', '}':
			if depth > 0 {
				depth--
			}
		case '"', '\'':
			delim := string([]byte{c, c, c})
			if strings.HasPrefix(s[i:], delim) {
				j := strings.Index(s[i+3:], delim)
				if j < 0 {
					return depth, delim
				}
				i += 3 + j + 2
				continue
			}
			for i++; i < len(s) && s[i] != c; i++ {
				if c == '"' && s[i] == '\\' {
					i++
				}
			}
		}
	}
	return depth, ""
}
