package setting

import (
	"bytes"
	"errors"
	"fmt"
	"io"
	"strconv"
	"strings"
	"unicode/utf8"

	"evenbeat/setting/jsonx"
)

// JSONFile says how a file format is read, for the sentences its reader
// gives; the engine reader and the session reader share the rules: a size
// cap, UTF-8 only (a byte-order mark dropped), no key written twice, a
// bounded nesting depth, and syntax errors with their line and column.
type JSONFile struct {
	Noun     string // the file in a sentence's subject: "file", "engine file"
	Kind     string // what such a file is: "a session file", "an engine file"
	Opening  string // how such a file starts, for an empty one: `{"format": ...}`
	MaxBytes int    // the largest file read, a whole number of MB
	MaxDepth int    // the deepest nesting of lists and objects
}

// Read reads the file from r, refusing one larger than MaxBytes, and
// parses it as Parse does.
func (f JSONFile) Read(r io.Reader) (*jsonx.Value, []byte, error) {
	data, err := io.ReadAll(io.LimitReader(r, int64(f.MaxBytes)+1))
	if err != nil {
		return nil, nil, &Error{"", fmt.Sprintf("The %s could not be read: %v.", f.Noun, err)}
	}
	return f.Parse(data)
}

// Parse reads one JSON value from data, which must hold nothing else, and
// returns it with the bytes it was read from (data without a UTF-8
// byte-order mark, which some editors write). A file in UTF-16, or with
// bytes that are not UTF-8, is refused with a sentence saying to save it as
// UTF-8; a key written twice is refused naming it.
func (f JSONFile) Parse(data []byte) (*jsonx.Value, []byte, error) {
	fail := func(format string, args ...any) (*jsonx.Value, []byte, error) {
		return nil, nil, &Error{"", fmt.Sprintf(format, args...)}
	}
	if len(data) > f.MaxBytes {
		return fail("The %s is larger than %d MB; %s is far smaller. Is this the right file?", f.Noun, f.MaxBytes>>20, f.Kind)
	}
	data = bytes.TrimPrefix(data, []byte{0xef, 0xbb, 0xbf}) // a UTF-8 byte-order mark
	if len(bytes.TrimSpace(data)) == 0 {
		return fail("The %s is empty; %s starts with %s.", f.Noun, f.Kind, f.Opening)
	}
	if len(data) > 1 && (data[0] == 0 || data[1] == 0 || data[0] == 0xfe && data[1] == 0xff || data[0] == 0xff && data[1] == 0xfe) {
		return fail("The %s is in UTF-16 (two bytes to a letter); save the file as UTF-8 and open it again.", f.Noun)
	}
	for i := 0; i < len(data); {
		r, n := utf8.DecodeRune(data[i:])
		if r == utf8.RuneError && n == 1 {
			line, col := LineCol(data, int64(i))
			return fail("The %s holds bytes that are not UTF-8 text at line %d, column %d (a name or note typed in another encoding); save the file as UTF-8 and open it again.", f.Noun, line, col)
		}
		i += n
	}
	v, err := jsonx.Parse(data, jsonx.Options{MaxDepth: f.MaxDepth, NoDuplicates: true, Prefix: true})
	if err != nil {
		return nil, nil, f.syntaxError(data, err)
	}
	if rest := bytes.TrimLeft(data[v.End:], " \t\r\n"); len(rest) > 0 {
		line, col := LineCol(data, int64(len(data)-len(rest)))
		return fail("The %s has more text after its end (line %d, column %d); %s holds one JSON object.", f.Noun, line, col, f.Kind)
	}
	return v, data, nil
}

// syntaxError turns a JSON reading error into a sentence with a line and
// column: where the offending byte is, or where the text stops.
func (f JSONFile) syntaxError(data []byte, err error) error {
	var deep *jsonx.DepthError
	if errors.As(err, &deep) {
		line, col := LineCol(data, deep.Offset)
		return &Error{"", fmt.Sprintf("The %s nests lists and objects more than %d deep (line %d, column %d); it is not %s.", f.Noun, f.MaxDepth, line, col, f.Kind)}
	}
	var dup *jsonx.DuplicateKeyError
	if errors.As(err, &dup) {
		path := ""
		for _, s := range dup.Path {
			if s.InArray {
				path += "[" + strconv.Itoa(s.Index) + "]"
			} else {
				path = JoinKey(path, s.Key)
			}
		}
		line, _ := LineCol(data, dup.Offset)
		return &Error{path, fmt.Sprintf("The key %q is written twice here (the second time on line %d); keep one of them.", dup.Path[len(dup.Path)-1].Key, line)}
	}
	var se *jsonx.SyntaxError
	if errors.As(err, &se) && se.EOF {
		line, col := LineCol(data, int64(len(bytes.TrimRight(data, " \t\r\n"))))
		return &Error{"", fmt.Sprintf("The %s ends too early (line %d, column %d): it is cut short or a bracket is missing.", f.Noun, line, col)}
	}
	off := int64(len(data))
	if se != nil {
		off = se.Offset - 1 // the offending byte
	}
	line, col := LineCol(data, off)
	return &Error{"", fmt.Sprintf("The %s is not valid JSON at line %d, column %d: %s.", f.Noun, line, col, err.Error())}
}

// LineCol converts a byte offset in data to a line and a column, both
// counted from 1 (the column in bytes).
func LineCol(data []byte, off int64) (line, col int) {
	off = max(0, min(off, int64(len(data))))
	before := data[:off]
	line = bytes.Count(before, []byte("\n")) + 1
	col = int(off) - bytes.LastIndexByte(before, '\n')
	return line, col
}

// JoinKey appends an object key to a key path ("cylinders[1]" + "name"),
// quoting a key that is not a plain word.
func JoinKey(path, key string) string {
	plain := key != ""
	for _, r := range key {
		plain = plain && (r == '_' || r >= 'a' && r <= 'z' || r >= 'A' && r <= 'Z' || r >= '0' && r <= '9')
	}
	if !plain {
		key = strconv.Quote(key)
	}
	if path == "" {
		return key
	}
	return path + "." + key
}

// NearestKey returns the key of known closest to k when k looks like a
// typing slip of it (at most two letters wrong, missing, extra or swapped,
// ignoring case), else "".
func NearestKey(k string, known []string) string {
	best, bestD := "", 3
	for _, a := range known {
		if d := editDistance(strings.ToLower(k), a); d < bestD {
			best, bestD = a, d
		}
	}
	return best
}

// editDistance is the Levenshtein distance, with a transposition counted as
// one edit.
func editDistance(a, b string) int {
	if len(a) > 64 || len(b) > 64 {
		return 99
	}
	ra, rb := []rune(a), []rune(b)
	prev2 := make([]int, len(rb)+1)
	prev := make([]int, len(rb)+1)
	cur := make([]int, len(rb)+1)
	for j := range prev {
		prev[j] = j
	}
	for i := 1; i <= len(ra); i++ {
		cur[0] = i
		for j := 1; j <= len(rb); j++ {
			cost := 1
			if ra[i-1] == rb[j-1] {
				cost = 0
			}
			cur[j] = min(prev[j]+1, cur[j-1]+1, prev[j-1]+cost)
			if i > 1 && j > 1 && ra[i-1] == rb[j-2] && ra[i-2] == rb[j-1] {
				cur[j] = min(cur[j], prev2[j-2]+1)
			}
		}
		prev2, prev, cur = prev, cur, prev2
	}
	return prev[len(rb)]
}
