package jsonx

import (
	"strconv"
	"unicode/utf16"
	"unicode/utf8"
)

// Kind is the kind of a JSON value.
type Kind uint8

// The six kinds of JSON value.
const (
	Null Kind = iota
	Bool
	Number
	String
	Array
	Object
)

// String names the kind as encoding/json's type errors do: "null", "bool",
// "number", "string", "array", "object".
func (k Kind) String() string {
	switch k {
	case Bool:
		return "bool"
	case Number:
		return "number"
	case String:
		return "string"
	case Array:
		return "array"
	case Object:
		return "object"
	}
	return "null"
}

// Value is one JSON value as read.
type Value struct {
	Kind  Kind
	Text  string   // String: the text, unescaped; Number: the number as written
	Bool  bool     // Bool: the value
	Keys  []string // Object: the keys in file order (a repeated key appears twice)
	Vals  []*Value // Object: the values, parallel to Keys
	Elems []*Value // Array: the elements
	// Start and End are the value's byte span in the input: data[Start:End]
	// is the value as written.
	Start, End int
}

// Last returns the value of the last member called key of an object (the
// one encoding/json would keep), or nil.
func (v *Value) Last(key string) *Value {
	for i := len(v.Keys) - 1; i >= 0; i-- {
		if v.Keys[i] == key {
			return v.Vals[i]
		}
	}
	return nil
}

// Options tune Parse. The zero value reads like encoding/json.
type Options struct {
	// MaxDepth refuses, with a *DepthError, a value nested inside more than
	// MaxDepth arrays and objects. 0 means 10000, encoding/json's bound.
	MaxDepth int
	// NoDuplicates refuses, with a *DuplicateKeyError, an object that has
	// the same key twice.
	NoDuplicates bool
	// Prefix reads one value and stops, leaving whatever follows it
	// unread: the Value's End says where it stopped.
	Prefix bool
}

// SyntaxError is input that is not JSON. Msg and Offset are what
// encoding/json reports for the same input.
type SyntaxError struct {
	Msg string // "invalid character 'x' looking for beginning of value"
	// Offset counts the bytes read when the error was found: one past the
	// offending byte, or the input's length when it ended too early.
	Offset int64
	EOF    bool // the input ended before the value did
}

// Error returns Msg.
func (e *SyntaxError) Error() string { return e.Msg }

// Step is one step of the way from the top of a document to a value: an
// object key, or an array index.
type Step struct {
	Key     string
	Index   int
	InArray bool // the step is Index in an array; otherwise Key
}

// DuplicateKeyError is an object with one key twice (Options.NoDuplicates).
type DuplicateKeyError struct {
	Path   []Step // the way to the second one
	Offset int64  // the byte just after the second key
}

// Error names the key.
func (e *DuplicateKeyError) Error() string {
	return "duplicate key " + strconv.Quote(e.Path[len(e.Path)-1].Key)
}

// DepthError is a value nested deeper than Options.MaxDepth.
type DepthError struct {
	Max    int
	Offset int64 // the byte at which the too-deep value was met
}

// Error says how deep is too deep.
func (e *DepthError) Error() string {
	return "lists and objects nested more than " + strconv.Itoa(e.Max) + " deep"
}

// Parse reads one JSON document.
func Parse(data []byte, opt Options) (*Value, error) {
	if opt.MaxDepth <= 0 {
		opt.MaxDepth = 10000
	}
	p := &parser{data: data, opt: opt}
	p.space()
	v, err := p.value()
	if err != nil {
		return nil, err
	}
	if !opt.Prefix {
		p.space()
		if p.i < len(data) {
			return nil, p.fail("after top-level value")
		}
	}
	return v, nil
}

// Valid reports whether data is one JSON document, as json.Valid does.
func Valid(data []byte) bool {
	_, err := Parse(data, Options{})
	return err == nil
}

// parser reads by recursive descent. Its errors follow encoding/json's
// scanner: the same phrase for the same state, the offset one past the
// offending byte, and at the end of input the phrase for a space there
// (what the scanner feeds itself at EOF) or "unexpected end of JSON
// input".
type parser struct {
	data []byte
	i    int
	opt  Options
	path []Step // the way to the value being read, kept only for NoDuplicates and MaxDepth
}

// space skips JSON white space.
func (p *parser) space() {
	for p.i < len(p.data) {
		switch p.data[p.i] {
		case ' ', '\t', '\n', '\r':
			p.i++
		default:
			return
		}
	}
}

// fail reports the byte at p.i in a context; at the end of input, a space
// in that context.
func (p *parser) fail(context string) error {
	if p.i >= len(p.data) {
		return &SyntaxError{Msg: "invalid character ' ' " + context, Offset: int64(len(p.data)), EOF: true}
	}
	msg := "invalid character " + quoteChar(p.data[p.i])
	if context != "" {
		msg += " " + context
	}
	return &SyntaxError{Msg: msg, Offset: int64(p.i + 1)}
}

// end reports input that stopped before the value did.
func (p *parser) end() error {
	return &SyntaxError{Msg: "unexpected end of JSON input", Offset: int64(len(p.data)), EOF: true}
}

// quoteChar formats a byte as encoding/json's messages do.
func quoteChar(c byte) string {
	if c == '\'' {
		return `'\''`
	}
	if c == '"' {
		return `'"'`
	}
	s := strconv.Quote(string(rune(c))) // a byte above 0x7f is shown as the rune of that number, as encoding/json does
	return "'" + s[1:len(s)-1] + "'"
}

// value reads the value starting at p.i (white space already skipped).
func (p *parser) value() (*Value, error) {
	if p.i >= len(p.data) {
		return nil, p.end()
	}
	start := p.i
	switch c := p.data[p.i]; {
	case c == '{':
		return p.object()
	case c == '[':
		return p.array()
	case c == '"':
		s, err := p.str()
		if err != nil {
			return nil, err
		}
		return &Value{Kind: String, Text: s, Start: start, End: p.i}, nil
	case c == '-' || c >= '0' && c <= '9':
		if err := p.number(); err != nil {
			return nil, err
		}
		return &Value{Kind: Number, Text: string(p.data[start:p.i]), Start: start, End: p.i}, nil
	case c == 't':
		return p.literal("true", &Value{Kind: Bool, Bool: true})
	case c == 'f':
		return p.literal("false", &Value{Kind: Bool})
	case c == 'n':
		return p.literal("null", &Value{Kind: Null})
	}
	return nil, p.fail("looking for beginning of value")
}

// literal reads true, false or null into v.
func (p *parser) literal(word string, v *Value) (*Value, error) {
	v.Start = p.i
	p.i++
	for k := 1; k < len(word); k++ {
		if p.i >= len(p.data) || p.data[p.i] != word[k] {
			return nil, p.fail("in literal " + word + " (expecting " + quoteChar(word[k]) + ")")
		}
		p.i++
	}
	v.End = p.i
	return v, nil
}

// deep checks the depth of the children of the container being read.
func (p *parser) deep() error {
	if len(p.path) > p.opt.MaxDepth {
		return &DepthError{Max: p.opt.MaxDepth, Offset: int64(p.i)}
	}
	return nil
}

// object reads {...}; p.i is at the '{'.
func (p *parser) object() (*Value, error) {
	v := &Value{Kind: Object, Start: p.i}
	p.i++
	p.space()
	if p.i < len(p.data) && p.data[p.i] == '}' {
		p.i++
		v.End = p.i
		return v, nil
	}
	for {
		if p.i >= len(p.data) {
			return nil, p.end()
		}
		if p.data[p.i] != '"' {
			return nil, p.fail("looking for beginning of object key string")
		}
		key, err := p.str()
		if err != nil {
			return nil, err
		}
		if p.opt.NoDuplicates {
			for _, k := range v.Keys {
				if k == key {
					return nil, &DuplicateKeyError{Path: append(append([]Step(nil), p.path...), Step{Key: key}), Offset: int64(p.i)}
				}
			}
		}
		p.path = append(p.path, Step{Key: key})
		if err := p.deep(); err != nil {
			return nil, err
		}
		p.space()
		if p.i >= len(p.data) {
			return nil, p.end()
		}
		if p.data[p.i] != ':' {
			return nil, p.fail("after object key")
		}
		p.i++
		p.space()
		val, err := p.value()
		if err != nil {
			return nil, err
		}
		p.path = p.path[:len(p.path)-1]
		v.Keys = append(v.Keys, key)
		v.Vals = append(v.Vals, val)
		more, err := p.more('}', "after object key:value pair")
		if err != nil {
			return nil, err
		}
		if !more {
			v.End = p.i
			return v, nil
		}
	}
}

// array reads [...]; p.i is at the '['.
func (p *parser) array() (*Value, error) {
	v := &Value{Kind: Array, Start: p.i}
	p.i++
	p.space()
	if p.i >= len(p.data) {
		return nil, p.end()
	}
	if p.data[p.i] == ']' {
		p.i++
		v.End = p.i
		return v, nil
	}
	p.path = append(p.path, Step{InArray: true})
	if p.data[p.i] != '}' {
		if err := p.deep(); err != nil {
			return nil, err
		}
	}
	for {
		p.path[len(p.path)-1].Index = len(v.Elems)
		e, err := p.value()
		if err != nil {
			return nil, err
		}
		v.Elems = append(v.Elems, e)
		more, err := p.more(']', "after array element")
		if err != nil {
			return nil, err
		}
		if !more {
			v.End = p.i
			p.path = p.path[:len(p.path)-1]
			return v, nil
		}
	}
}

// more reads what follows a member of an array or object: a comma (true)
// or the closing byte (false).
func (p *parser) more(closing byte, context string) (bool, error) {
	p.space()
	if p.i >= len(p.data) {
		return false, p.end()
	}
	switch p.data[p.i] {
	case ',':
		p.i++
		p.space()
		return true, nil
	case closing:
		p.i++
		return false, nil
	}
	return false, p.fail(context)
}

// number checks the number at p.i and moves past it.
func (p *parser) number() error {
	if p.data[p.i] == '-' {
		p.i++
		if !p.digitHere() {
			return p.fail("in numeric literal")
		}
	}
	if p.data[p.i] == '0' {
		p.i++
	} else {
		p.digits()
	}
	if p.i < len(p.data) && p.data[p.i] == '.' {
		p.i++
		if !p.digitHere() {
			return p.fail("after decimal point in numeric literal")
		}
		p.digits()
	}
	if p.i < len(p.data) && (p.data[p.i] == 'e' || p.data[p.i] == 'E') {
		p.i++
		if p.i < len(p.data) && (p.data[p.i] == '+' || p.data[p.i] == '-') {
			p.i++
		}
		if !p.digitHere() {
			return p.fail("in exponent of numeric literal")
		}
		p.digits()
	}
	return nil
}

func (p *parser) digitHere() bool {
	return p.i < len(p.data) && p.data[p.i] >= '0' && p.data[p.i] <= '9'
}

func (p *parser) digits() {
	for p.digitHere() {
		p.i++
	}
}

// str reads the string at p.i (at its opening quote) and returns its text.
func (p *parser) str() (string, error) {
	p.i++
	start := p.i
	plain := true // no escapes and valid UTF-8: the text is the bytes
	for {
		if p.i >= len(p.data) {
			return "", p.end()
		}
		c := p.data[p.i]
		switch {
		case c == '"':
			raw := p.data[start:p.i]
			p.i++
			if plain {
				return string(raw), nil
			}
			return unquote(raw), nil
		case c == '\\':
			plain = false
			p.i++
			if p.i >= len(p.data) {
				return "", p.fail("in string escape code")
			}
			switch p.data[p.i] {
			case 'b', 'f', 'n', 'r', 't', '\\', '/', '"':
				p.i++
			case 'u':
				p.i++
				for k := 0; k < 4; k++ {
					if p.i >= len(p.data) || hexVal(p.data[p.i]) < 0 {
						return "", p.fail(`in \u hexadecimal character escape`)
					}
					p.i++
				}
			default:
				return "", p.fail("in string escape code")
			}
		case c < 0x20:
			return "", p.fail("in string literal")
		case c < utf8.RuneSelf:
			p.i++
		default:
			r, size := utf8.DecodeRune(p.data[p.i:])
			if r == utf8.RuneError && size == 1 {
				plain = false
			}
			p.i += size
		}
	}
}

// hexVal is the value of a hexadecimal digit, or -1.
func hexVal(c byte) rune {
	switch {
	case c >= '0' && c <= '9':
		return rune(c - '0')
	case c >= 'a' && c <= 'f':
		return rune(c - 'a' + 10)
	case c >= 'A' && c <= 'F':
		return rune(c - 'A' + 10)
	}
	return -1
}

// u4 reads the \uXXXX escape at the start of s, or -1.
func u4(s []byte) rune {
	if len(s) < 6 || s[0] != '\\' || s[1] != 'u' {
		return -1
	}
	var r rune
	for _, c := range s[2:6] {
		h := hexVal(c)
		if h < 0 {
			return -1
		}
		r = r*16 + h
	}
	return r
}

// unquote decodes the checked body of a string as encoding/json does: a
// byte of invalid UTF-8 and a lone surrogate each become U+FFFD.
func unquote(s []byte) string {
	b := make([]byte, 0, len(s)+2*utf8.UTFMax)
	for i := 0; i < len(s); {
		c := s[i]
		switch {
		case c == '\\':
			e := s[i+1]
			i += 2
			switch e {
			case 'b':
				b = append(b, '\b')
			case 'f':
				b = append(b, '\f')
			case 'n':
				b = append(b, '\n')
			case 'r':
				b = append(b, '\r')
			case 't':
				b = append(b, '\t')
			case 'u':
				r := u4(s[i-2:])
				i += 4
				if utf16.IsSurrogate(r) {
					if r2 := utf16.DecodeRune(r, u4(s[i:])); r2 != utf8.RuneError {
						b = utf8.AppendRune(b, r2)
						i += 6
						break
					}
					r = utf8.RuneError
				}
				b = utf8.AppendRune(b, r)
			default: // \\ \/ \"
				b = append(b, e)
			}
		case c < utf8.RuneSelf:
			b = append(b, c)
			i++
		default:
			r, size := utf8.DecodeRune(s[i:])
			b = utf8.AppendRune(b, r)
			i += size
		}
	}
	return string(b)
}
