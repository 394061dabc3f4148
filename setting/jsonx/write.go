package jsonx

import (
	"math"
	"strconv"
	"strings"
	"unicode/utf8"
)

const hexDigits = "0123456789abcdef"

// AppendString appends s as a JSON string, escaped as encoding/json does:
// '"' and '\\' and control characters escaped (\b \f \n \r \t short, the
// rest \u00XX), invalid UTF-8 as \ufffd, U+2028 and U+2029 as \u2028 and
// \u2029, and with escapeHTML also '<', '>' and '&' as \u003c, \u003e,
// \u0026 (json.Marshal's default; json.Encoder.SetEscapeHTML(false) turns
// it off).
func AppendString(dst []byte, s string, escapeHTML bool) []byte {
	dst = append(dst, '"')
	start := 0
	for i := 0; i < len(s); {
		if b := s[i]; b < utf8.RuneSelf {
			if b >= 0x20 && b != '"' && b != '\\' && !(escapeHTML && (b == '<' || b == '>' || b == '&')) {
				i++
				continue
			}
			dst = append(dst, s[start:i]...)
			switch b {
			case '\\', '"':
				dst = append(dst, '\\', b)
			case '\b':
				dst = append(dst, '\\', 'b')
			case '\f':
				dst = append(dst, '\\', 'f')
			case '\n':
				dst = append(dst, '\\', 'n')
			case '\r':
				dst = append(dst, '\\', 'r')
			case '\t':
				dst = append(dst, '\\', 't')
			default:
				dst = append(dst, '\\', 'u', '0', '0', hexDigits[b>>4], hexDigits[b&0xF])
			}
			i++
			start = i
			continue
		}
		r, size := utf8.DecodeRuneInString(s[i:])
		switch {
		case r == utf8.RuneError && size == 1:
			dst = append(dst, s[start:i]...)
			dst = append(dst, `\ufffd`...)
		case r == '\u2028' || r == '\u2029':
			dst = append(dst, s[start:i]...)
			dst = append(dst, '\\', 'u', '2', '0', '2', hexDigits[r&0xF])
		default:
			i += size
			continue
		}
		i += size
		start = i
	}
	dst = append(dst, s[start:]...)
	return append(dst, '"')
}

// UnsupportedValueError is a number JSON cannot hold (NaN or an
// infinity). Its text is encoding/json's.
type UnsupportedValueError struct{ Value float64 }

// Error reads "json: unsupported value: NaN".
func (e *UnsupportedValueError) Error() string {
	return "json: unsupported value: " + strconv.FormatFloat(e.Value, 'g', -1, 64)
}

// AppendFloat appends f as encoding/json writes a float64: the shortest
// text that reads back the same, in exponent form ("1e-7", "1e+21") only
// below 1e-6 or from 1e21 on. NaN and the infinities give an
// *UnsupportedValueError and dst unchanged.
func AppendFloat(dst []byte, f float64) ([]byte, error) {
	if math.IsNaN(f) || math.IsInf(f, 0) {
		return dst, &UnsupportedValueError{f}
	}
	format := byte('f')
	if a := math.Abs(f); a != 0 && (a < 1e-6 || a >= 1e21) {
		format = 'e'
	}
	dst = strconv.AppendFloat(dst, f, format, -1, 64)
	if format == 'e' {
		// "1e-07" -> "1e-7", as encoding/json writes it.
		if n := len(dst); n >= 4 && dst[n-4] == 'e' && dst[n-3] == '-' && dst[n-2] == '0' {
			dst[n-2] = dst[n-1]
			dst = dst[:n-1]
		}
	}
	return dst, nil
}

// Writer lays out a JSON document value by value: compact, or with each
// member on a line of its own like json.MarshalIndent(v, "", indent). The
// caller calls the methods in a valid order (Key before each member's
// value); the first unsupported number is kept and returned by Bytes.
type Writer struct {
	// EscapeHTML escapes '<', '>' and '&' in strings, as json.Marshal does.
	EscapeHTML bool
	// Indent is the indentation of one level; "" writes compact JSON.
	Indent string

	buf      []byte
	open     []bool // per open array or object: whether it has a member yet
	afterKey bool
	err      error
}

// Bytes returns the document written, or the first error.
func (w *Writer) Bytes() ([]byte, error) {
	if w.err != nil {
		return nil, w.err
	}
	return w.buf, nil
}

// next places a separator and line break before a value or key.
func (w *Writer) next() {
	if w.afterKey {
		w.afterKey = false
		return
	}
	n := len(w.open)
	if n == 0 {
		return
	}
	if w.open[n-1] {
		w.buf = append(w.buf, ',')
	}
	w.open[n-1] = true
	w.newline(n)
}

func (w *Writer) newline(level int) {
	if w.Indent == "" {
		return
	}
	w.buf = append(w.buf, '\n')
	w.buf = append(w.buf, strings.Repeat(w.Indent, level)...)
}

// BeginObject starts an object.
func (w *Writer) BeginObject() { w.begin('{') }

// EndObject ends the object begun last.
func (w *Writer) EndObject() { w.end('}') }

// BeginArray starts an array.
func (w *Writer) BeginArray() { w.begin('[') }

// EndArray ends the array begun last.
func (w *Writer) EndArray() { w.end(']') }

func (w *Writer) begin(c byte) {
	w.next()
	w.buf = append(w.buf, c)
	w.open = append(w.open, false)
}

func (w *Writer) end(c byte) {
	n := len(w.open)
	if w.open[n-1] {
		w.newline(n - 1)
	}
	w.open = w.open[:n-1]
	w.buf = append(w.buf, c)
}

// Key writes an object member's key; its value comes next.
func (w *Writer) Key(k string) {
	w.next()
	w.buf = AppendString(w.buf, k, w.EscapeHTML)
	w.buf = append(w.buf, ':')
	if w.Indent != "" {
		w.buf = append(w.buf, ' ')
	}
	w.afterKey = true
}

// String writes a string.
func (w *Writer) String(s string) {
	w.next()
	w.buf = AppendString(w.buf, s, w.EscapeHTML)
}

// Float writes a number as encoding/json writes a float64.
func (w *Writer) Float(f float64) {
	w.next()
	var err error
	if w.buf, err = AppendFloat(w.buf, f); err != nil {
		w.buf = append(w.buf, "null"...)
		if w.err == nil {
			w.err = err
		}
	}
}

// Int writes a whole number.
func (w *Writer) Int(n int64) {
	w.next()
	w.buf = strconv.AppendInt(w.buf, n, 10)
}

// Number writes a number given as its JSON text, unchanged.
func (w *Writer) Number(text string) {
	w.next()
	w.buf = append(w.buf, text...)
}

// Bool writes true or false.
func (w *Writer) Bool(b bool) {
	w.next()
	w.buf = strconv.AppendBool(w.buf, b)
}

// Null writes null.
func (w *Writer) Null() {
	w.next()
	w.buf = append(w.buf, "null"...)
}

// Fail records err, unless an error is kept already: Bytes returns it.
func (w *Writer) Fail(err error) {
	if w.err == nil {
		w.err = err
	}
}

// Value writes a value read by Parse: keys in their order, numbers as
// written, strings escaped afresh.
func (w *Writer) Value(v *Value) {
	switch v.Kind {
	case Null:
		w.Null()
	case Bool:
		w.Bool(v.Bool)
	case Number:
		w.Number(v.Text)
	case String:
		w.String(v.Text)
	case Array:
		w.BeginArray()
		for _, e := range v.Elems {
			w.Value(e)
		}
		w.EndArray()
	case Object:
		w.BeginObject()
		for i, k := range v.Keys {
			w.Key(k)
			w.Value(v.Vals[i])
		}
		w.EndObject()
	}
}
