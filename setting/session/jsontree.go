package session

import (
	"bytes"
	"errors"
	"fmt"
	"io"
	"strconv"

	"evenbeat/setting/jsonx"
)

// The decoder reads the file into a small tree first (keys kept in order,
// numbers kept as their text), so that every later check can name the exact
// field it is looking at, duplicate keys are caught, and the engine object
// can be handed to the engine decoder as it was written.

type nodeKind int

const (
	nodeNull nodeKind = iota
	nodeBool
	nodeNumber
	nodeString
	nodeArray
	nodeObject
)

// node is one JSON value.
type node struct {
	kind  nodeKind
	text  string   // string value, or the number as written
	b     bool     // bool value
	keys  []string // object keys, in file order
	vals  []*node  // object values, parallel to keys
	elems []*node  // array elements
}

// maxFileBytes bounds what Decode reads: a session of many rounds is a few
// hundred kilobytes; anything near this is not a session.
const maxFileBytes = 16 << 20

// maxDepth bounds how deeply lists and objects may nest: a session nests
// about ten deep; a deeper file is not a session, and the bound keeps the
// reader's recursion small.
const maxDepth = 64

// treeOptions: a key written twice is refused, nesting is bounded, and text
// after the value is left for readTree to report.
func treeOptions() jsonx.Options {
	return jsonx.Options{MaxDepth: maxDepth, NoDuplicates: true, Prefix: true}
}

// readTree reads one JSON value and nothing after it.
func readTree(r io.Reader) (*node, []byte, error) {
	data, err := io.ReadAll(io.LimitReader(r, maxFileBytes+1))
	if err != nil {
		return nil, nil, userError("", fmt.Sprintf("The session file could not be read: %v.", err))
	}
	if len(data) > maxFileBytes {
		return nil, nil, userError("", fmt.Sprintf("The file is larger than %d MB; a session file is far smaller. Is this the right file?", maxFileBytes>>20))
	}
	if len(bytes.TrimSpace(data)) == 0 {
		return nil, nil, userError("", "The file is empty; a session file starts with {\"format\": \"evenbeat-session\", ...}.")
	}
	v, err := jsonx.Parse(data, treeOptions())
	if err != nil {
		return nil, nil, syntaxError(data, err)
	}
	if rest := bytes.TrimLeft(data[v.End:], " \t\r\n"); len(rest) > 0 {
		line, col := lineCol(data, int64(len(data)-len(rest)))
		return nil, nil, userError("", fmt.Sprintf("The file has more text after the end of the session (line %d, column %d); a session file holds one JSON object.", line, col))
	}
	return treeOf(v), data, nil
}

// treeOf copies a parsed value into a node tree.
func treeOf(v *jsonx.Value) *node {
	n := &node{text: v.Text, b: v.Bool, keys: v.Keys}
	switch v.Kind {
	case jsonx.Null:
		n.kind = nodeNull
	case jsonx.Bool:
		n.kind = nodeBool
	case jsonx.Number:
		n.kind = nodeNumber
	case jsonx.String:
		n.kind = nodeString
	case jsonx.Array:
		n.kind = nodeArray
		n.elems = make([]*node, len(v.Elems))
		for i, e := range v.Elems {
			n.elems[i] = treeOf(e)
		}
	case jsonx.Object:
		n.kind = nodeObject
		n.vals = make([]*node, len(v.Vals))
		for i, e := range v.Vals {
			n.vals[i] = treeOf(e)
		}
	}
	return n
}

// step is one step of the way to a value: an object key, or a list index
// when key is empty. The path is only spelt out for a message.
type step struct {
	key   string
	index int
}

// spell turns steps into a field name: "cylinders[1].name".
func spell(steps []step) string {
	path := ""
	for _, s := range steps {
		if s.key == "" {
			path += "[" + strconv.Itoa(s.index) + "]"
		} else {
			path = joinPath(path, s.key)
		}
	}
	return path
}

// syntaxError turns a JSON reading error into a sentence with a line and
// column: where the offending byte is, or where the text stops.
func syntaxError(data []byte, err error) error {
	var deep *jsonx.DepthError
	if errors.As(err, &deep) {
		line, col := lineCol(data, deep.Offset)
		return userError("", fmt.Sprintf("The file nests lists and objects more than %d deep (line %d, column %d); it is not a session file.", maxDepth, line, col))
	}
	var dup *jsonx.DuplicateKeyError
	if errors.As(err, &dup) {
		steps := make([]step, len(dup.Path))
		for i, s := range dup.Path {
			steps[i] = step{key: s.Key, index: s.Index}
		}
		return userError(spell(steps), "This field is written twice; keep one of them.")
	}
	var se *jsonx.SyntaxError
	if errors.As(err, &se) && se.EOF {
		line, col := lineCol(data, int64(len(bytes.TrimRight(data, " \t\r\n"))))
		return userError("", fmt.Sprintf("The file ends too early (line %d, column %d): it is cut short or a bracket is missing.", line, col))
	}
	off := int64(len(data))
	if se != nil {
		off = se.Offset - 1 // the offending byte
	}
	line, col := lineCol(data, off)
	return userError("", fmt.Sprintf("The file is not valid JSON at line %d, column %d: %s.", line, col, err.Error()))
}

// lineCol converts a byte offset to a 1-based line and column.
func lineCol(data []byte, off int64) (line, col int) {
	if off > int64(len(data)) {
		off = int64(len(data))
	}
	if off < 0 {
		off = 0
	}
	before := data[:off]
	line = bytes.Count(before, []byte("\n")) + 1
	col = int(off) - bytes.LastIndexByte(before, '\n')
	return line, col
}

// get returns the value of key in an object node, or nil.
func (n *node) get(key string) *node {
	for i, k := range n.keys {
		if k == key {
			return n.vals[i]
		}
	}
	return nil
}

// joinPath appends an object key to a JSON-path-like field name.
func joinPath(path, key string) string {
	if !plainKey(key) {
		key = strconv.Quote(key)
	}
	if path == "" {
		return key
	}
	return path + "." + key
}

// plainKey reports whether key can be shown without quotes.
func plainKey(key string) bool {
	if key == "" {
		return false
	}
	for _, r := range key {
		if !(r == '_' || r >= 'a' && r <= 'z' || r >= 'A' && r <= 'Z' || r >= '0' && r <= '9') {
			return false
		}
	}
	return true
}

// describe names a JSON value's type for messages ("the text \"NaN\"").
func (n *node) describe() string {
	switch n.kind {
	case nodeNull:
		return "null"
	case nodeBool:
		return strconv.FormatBool(n.b)
	case nodeNumber:
		return "the number " + n.text
	case nodeString:
		s := n.text
		if r := []rune(s); len(r) > 40 {
			s = string(r[:40]) + "..."
		}
		return "the text " + strconv.Quote(s)
	case nodeArray:
		return "a list"
	default:
		return "an object"
	}
}

// writeCompact writes n as compact JSON, keys in order.
func (n *node) writeCompact(b *bytes.Buffer) {
	n.write(b, "", "")
}

// write writes n as JSON; with indent != "" each member starts a new line.
func (n *node) write(b *bytes.Buffer, prefix, indent string) {
	switch n.kind {
	case nodeNull:
		b.WriteString("null")
	case nodeBool:
		b.WriteString(strconv.FormatBool(n.b))
	case nodeNumber:
		b.WriteString(n.text)
	case nodeString:
		writeString(b, n.text)
	case nodeArray:
		if len(n.elems) == 0 {
			b.WriteString("[]")
			return
		}
		inner := prefix + indent
		b.WriteByte('[')
		for i, e := range n.elems {
			if i > 0 {
				b.WriteByte(',')
			}
			newline(b, inner, indent)
			e.write(b, inner, indent)
		}
		newline(b, prefix, indent)
		b.WriteByte(']')
	case nodeObject:
		if len(n.keys) == 0 {
			b.WriteString("{}")
			return
		}
		inner := prefix + indent
		b.WriteByte('{')
		for i, k := range n.keys {
			if i > 0 {
				b.WriteByte(',')
			}
			newline(b, inner, indent)
			writeString(b, k)
			b.WriteByte(':')
			if indent != "" {
				b.WriteByte(' ')
			}
			n.vals[i].write(b, inner, indent)
		}
		newline(b, prefix, indent)
		b.WriteByte('}')
	}
}

func newline(b *bytes.Buffer, prefix, indent string) {
	if indent == "" {
		return
	}
	b.WriteByte('\n')
	b.WriteString(prefix)
}

// writeString writes s as a JSON string (HTML characters left alone).
func writeString(b *bytes.Buffer, s string) {
	b.Write(jsonx.AppendString(b.AvailableBuffer(), s, false))
}

// parseCompact parses JSON bytes known to be valid into a tree (text after
// the value is ignored).
func parseCompact(data []byte) (*node, error) {
	v, err := jsonx.Parse(data, treeOptions())
	if err != nil {
		return nil, err
	}
	return treeOf(v), nil
}
