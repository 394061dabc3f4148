package session

import (
	"bytes"
	"encoding/json"
	"errors"
	"fmt"
	"io"
	"math/rand/v2"
	"regexp"
	"strconv"
	"strings"
	"testing"
	"unicode/utf8"

	"evenbeat/setting"
	"evenbeat/setting/jsonx/jsonxtest"
)

// The session file used to be read through encoding/json's token stream.
// That reader is kept here as the reference jsontree.go must match: the
// same files read into the same tree, the same files refused with the same
// sentence. These differences are deliberate, and normalize (or
// compareTreeWithReference) removes them:
//   - Line and column now point at the offending byte (or where the text
//     stops); the token stream often counted only some of the bytes read.
//   - A file cut short inside a list or object said "...: EOF."; every file
//     cut short now says it ends too early.
//   - A non-key right after '{' said only "invalid character 'x'"; it now
//     says "looking for beginning of object key string", as after a comma.
//   - A key written twice is named, with the line of its second time (and
//     an empty key is spelt "", no longer as a list index).
//   - Text after the session says "after its end" (the engine reader
//     shares the sentence).
//   - A UTF-8 byte-order mark is dropped; a file with bytes that are not
//     UTF-8 is refused, asking for the file to be saved as UTF-8 (the
//     reference took them as U+FFFD).

func refReadTree(data []byte) (*node, error) {
	if len(bytes.TrimSpace(data)) == 0 {
		return nil, userError("", "The file is empty; a session file starts with {\"format\": \"evenbeat-session\", ...}.")
	}
	dec := json.NewDecoder(bytes.NewReader(data))
	dec.UseNumber()
	n, err := refReadValue(dec, nil)
	if err != nil {
		return nil, refSyntaxError(data, dec, err)
	}
	if _, err := dec.Token(); err != io.EOF {
		line, col := lineCol(data, dec.InputOffset())
		return nil, userError("", fmt.Sprintf("The file has more text after its end (line %d, column %d); a session file holds one JSON object.", line, col))
	}
	return n, nil
}

var refErrTooDeep = errors.New("lists and objects nested too deeply")

// step is one step of the way to a value: an object key, or a list index.
type step struct {
	key   string
	index int
	list  bool
}

// spell turns steps into a field name: "cylinders[1].name".
func spell(steps []step) string {
	path := ""
	for _, s := range steps {
		if s.list {
			path += "[" + strconv.Itoa(s.index) + "]"
		} else {
			path = joinPath(path, s.key)
		}
	}
	return path
}

func lineCol(data []byte, off int64) (int, int) { return setting.LineCol(data, off) }

type refDupKeyError struct{ path string }

func (e *refDupKeyError) Error() string { return "duplicate key " + e.path }

func refReadValue(dec *json.Decoder, steps []step) (*node, error) {
	if len(steps) > maxDepth {
		return nil, refErrTooDeep
	}
	tok, err := dec.Token()
	if err != nil {
		if err == io.EOF {
			err = io.ErrUnexpectedEOF
		}
		return nil, err
	}
	switch t := tok.(type) {
	case nil:
		return &node{kind: nodeNull}, nil
	case bool:
		return &node{kind: nodeBool, b: t}, nil
	case json.Number:
		return &node{kind: nodeNumber, text: string(t)}, nil
	case string:
		return &node{kind: nodeString, text: t}, nil
	case json.Delim:
		switch t {
		case '[':
			n := &node{kind: nodeArray}
			for dec.More() {
				e, err := refReadValue(dec, append(steps, step{index: len(n.elems), list: true}))
				if err != nil {
					return nil, err
				}
				n.elems = append(n.elems, e)
			}
			if _, err := dec.Token(); err != nil {
				return nil, err
			}
			return n, nil
		case '{':
			n := &node{kind: nodeObject}
			for dec.More() {
				kt, err := dec.Token()
				if err != nil {
					return nil, err
				}
				key, ok := kt.(string)
				if !ok {
					return nil, errors.New("object key is not a string")
				}
				if n.get(key) != nil {
					return nil, &refDupKeyError{path: spell(append(steps, step{key: key}))}
				}
				v, err := refReadValue(dec, append(steps, step{key: key}))
				if err != nil {
					return nil, err
				}
				n.keys = append(n.keys, key)
				n.vals = append(n.vals, v)
			}
			if _, err := dec.Token(); err != nil {
				return nil, err
			}
			return n, nil
		}
	}
	return nil, fmt.Errorf("unexpected token %v", tok)
}

func refSyntaxError(data []byte, dec *json.Decoder, err error) error {
	if errors.Is(err, refErrTooDeep) {
		line, col := lineCol(data, dec.InputOffset())
		return userError("", fmt.Sprintf("The file nests lists and objects more than %d deep (line %d, column %d); it is not a session file.", maxDepth, line, col))
	}
	var dup *refDupKeyError
	if errors.As(err, &dup) {
		return userError(dup.path, "This field is written twice; keep one of them.") // normalize names it
	}
	off := dec.InputOffset()
	var se *json.SyntaxError
	if errors.As(err, &se) {
		off = se.Offset
	}
	line, col := lineCol(data, off)
	if errors.Is(err, io.ErrUnexpectedEOF) {
		return userError("", fmt.Sprintf("The file ends too early (line %d, column %d): it is cut short or a bracket is missing.", line, col))
	}
	msg := strings.TrimPrefix(err.Error(), "json: ")
	return userError("", fmt.Sprintf("The file is not valid JSON at line %d, column %d: %s.", line, col, msg))
}

var (
	refPosition = regexp.MustCompile(`line \d+, column \d+`)
	refTwice    = regexp.MustCompile(`The key "(?:[^"\\]|\\.)*" is written twice here \(the second time on line \d+\); keep one of them\.`)
	refNoKey    = regexp.MustCompile(`(invalid character '(?:[^'\\]|\\.[^']*)')\.$`)
)

// normalize removes the deliberate differences from a message.
func normalize(msg string) string {
	msg = refPosition.ReplaceAllString(msg, "line L, column C")
	msg = refTwice.ReplaceAllString(msg, "This field is written twice; keep one of them.")
	if strings.HasPrefix(msg, "The file is not valid JSON") && strings.HasSuffix(msg, ": EOF.") {
		return "The file ends too early (line L, column C): it is cut short or a bracket is missing."
	}
	return refNoKey.ReplaceAllString(msg, "$1 looking for beginning of object key string.")
}

func compareTreeWithReference(t *testing.T, data []byte) {
	t.Helper()
	got, _, err := readTree(bytes.NewReader(data))
	if !utf8.Valid(bytes.TrimPrefix(data, []byte("\xef\xbb\xbf"))) || bytes.HasPrefix(data, []byte{0xfe, 0xff}) || bytes.HasPrefix(data, []byte{0xff, 0xfe}) {
		// Not UTF-8: refused (unless JSON refuses it first, the UTF-16
		// check looking at the first two bytes only).
		if err == nil || !strings.Contains(err.Error(), "UTF") {
			t.Fatalf("%q: %v, want a refusal asking for UTF-8", data, err)
		}
		return
	}
	data = bytes.TrimPrefix(data, []byte("\xef\xbb\xbf"))
	want, refErr := refReadTree(data)
	if (err == nil) != (refErr == nil) {
		t.Fatalf("%q: error %v, reference %v", data, err, refErr)
	}
	if err != nil {
		if normalize(err.Error()) != normalize(refErr.Error()) {
			t.Fatalf("%q:\n got %v\nwant %v", data, err, refErr)
		}
		return
	}
	if compact(got) != compact(want) {
		t.Fatalf("%q: read %s, reference %s", data, compact(got), compact(want))
	}
}

// sessionMutations break or bend the example session one way each.
var sessionMutations = [][2]string{
	{`{`, `{{`}, {`{`, `{1:2, `}, {`{`, `{,`}, {`{`, `{]`}, {`"format"`, `"format" "x"`}, {`"format"`, `format`},
	{`:`, `::`}, {`:`, ``}, {`,`, `,,`}, {`,`, ``}, {`,`, ` ,}`}, {`[`, `[,`}, {`[`, `[}`}, {`]`, `,]`}, {`]`, ``},
	{`}`, ``}, {`}`, `,}`}, {`"`, `"\x`}, {`"`, `"\u12`}, {`"`, "\"\x01"}, {`"`, "\"\xff"}, {`"`, `"\ud800`},
	{`1`, `01`}, {`1`, `1.`}, {`1`, `-`}, {`1`, `1e`}, {`1`, `1ex`}, {`1`, `1.5e+3`}, {`true`, `tru`}, {`true`, `trux`},
	{`: "`, `: nul, "`}, {`: "`, `: null, "`}, {`"name"`, `"name": 1, "name"`}, {`"readings": [`, `"readings": [[[[[`},
	{`{`, `{"":1,"":2,`}, {`{`, "\u00a0{"}, {`{`, "\ufeff{"}, {`{`, `  {`},
}

func TestTreeMatchesReference(t *testing.T) {
	example := string(readExample(t))
	inputs := []string{testJSON, example, "", " ", "{}", "[]", "1", "{} x", "{} 12", "{} [", "{} }", "{}\n\n}", `{"a":`,
		`{"a":1`, `{"a":1,`, `[`, `{`, `{"a"`, `[1`, `"abc`, "{\"a\":[1,\n2,\n", `{"a" x}`, `{"a":1 "b":2}`,
		strings.Repeat("[", 64) + strings.Repeat("]", 64), strings.Repeat("[", 65) + "1" + strings.Repeat("]", 65),
		strings.Repeat("[", 66) + strings.Repeat("]", 66), strings.Repeat(`{"a":`, 65) + "1" + strings.Repeat("}", 65),
		strings.Repeat("[", 65) + "x", strings.Repeat("[", 65), strings.Repeat("[", 64) + "[}"}
	for _, base := range []string{testJSON, example[:min(len(example), 3000)]} {
		for _, m := range sessionMutations {
			for n := 1; n <= strings.Count(base, m[0]) && n <= 4; n++ {
				inputs = append(inputs, strings.Replace(base, m[0], m[1], n)) // the first n
			}
		}
		for cut := 0; cut < len(base); cut += len(base)/97 + 1 {
			inputs = append(inputs, base[:cut])
		}
	}
	for _, in := range inputs {
		compareTreeWithReference(t, []byte(in))
	}
}

func FuzzTreeMatchesReference(f *testing.F) {
	f.Add([]byte(testJSON))
	f.Add([]byte(`{"a": [1, {"b": "\u00e9"}], "c": null}`))
	f.Fuzz(func(t *testing.T, data []byte) {
		compareTreeWithReference(t, data)
	})
}

// The positions the reference got wrong are now right: the column of the
// offending byte, and the end of the text for a file cut short.
func TestSyntaxErrorPositions(t *testing.T) {
	cases := map[string]string{
		"{\n  \"a\": tru}":           "line 2, column 11",
		"{\n  \"a\": [1,\n    2 3]}": "line 3, column 7",
		"{\"a\": 1,\n  \"b\": [\n":   "line 2, column 9",
		"{\"a\": 1}\n  x":            "line 2, column 3",
	}
	for in, want := range cases {
		_, _, err := readTree(strings.NewReader(in))
		if err == nil || !strings.Contains(err.Error(), want) {
			t.Errorf("%q: %v, want %s", in, err, want)
		}
	}
}

// TestTreeMatchesReferenceOnRandomEdits compares the two readers on
// thousands of byte-level edits of the test session (a fixed seed, so a
// failure repeats).
func TestTreeMatchesReferenceOnRandomEdits(t *testing.T) {
	rng := rand.New(rand.NewPCG(1, 2))
	base := []byte(testJSON)
	for range 3000 {
		b := jsonxtest.Edit(rng, base, 3)
		compareTreeWithReference(t, b)
	}
}
