package session

import (
	"bytes"
	"io"
	"strconv"

	"evenbeat/setting"
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

// sessionFile is how a session file is read: the rules the engine file
// shares (setting.JSONFile), with the session's bounds.
func sessionFile() setting.JSONFile {
	return setting.JSONFile{Noun: "file", Kind: "a session file", Opening: `{"format": "evenbeat-session", ...}`,
		MaxBytes: maxFileBytes, MaxDepth: maxDepth}
}

// readTree reads one JSON value and nothing after it.
func readTree(r io.Reader) (*node, []byte, error) {
	v, data, err := sessionFile().Read(r)
	if err != nil {
		return nil, nil, err
	}
	return treeOf(v), data, nil
}

// treeOf copies a parsed value into a node tree, letting go of each part
// of v once it is copied: a large file's two trees are never whole at once.
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
			n.elems[i], v.Elems[i] = treeOf(e), nil
		}
	case jsonx.Object:
		n.kind = nodeObject
		n.vals = make([]*node, len(v.Vals))
		for i, e := range v.Vals {
			n.vals[i], v.Vals[i] = treeOf(e), nil
		}
	}
	return n
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
func joinPath(path, key string) string { return setting.JoinKey(path, key) }

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
	v, err := jsonx.Parse(data, jsonx.Options{MaxDepth: maxDepth, NoDuplicates: true, Prefix: true})
	if err != nil {
		return nil, err
	}
	return treeOf(v), nil
}
