package ui

import (
	"bytes"
	"errors"
	"fmt"
	"strings"

	"evenbeat/setting"
	"evenbeat/setting/jsonx"
	"evenbeat/setting/session"
)

// Store keeps the app's data: session files and a little state, by key.
// The browser glue implements it with IndexedDB in strict-durability
// transactions; tests with a map.
type Store interface {
	// Get returns the value of key; ok is false when it was never stored.
	// It may block (the app calls it only when starting).
	Get(key string) (value []byte, ok bool, err error)
	// Put writes key = value and calls done once, with nil only when the
	// value is durably stored, or with the reason it is not. done may be
	// called before Put returns or later, from another goroutine.
	Put(key string, value []byte, done func(error))
}

// Store keys.
const (
	// IndexKey holds the JSON list of the keys of every stored session.
	IndexKey = "sessions"
	// AckKey is present once the cautions were acknowledged.
	AckKey = "cautions_acknowledged"
	// sessionPrefix starts each session's key.
	sessionPrefix = "session/"
)

// Stored is one session as the store holds it. A session that cannot be
// read (a newer version, a damaged file) keeps its raw bytes and the
// reason, so it can be exported and is never overwritten. A session stored
// in an older version of the file is read (migrated) into the current
// Session and its Raw bytes are kept as stored: only the user's next
// change writes it back, in the current version, so opening it can never
// destroy the original.
type Stored struct {
	Key     string
	Session *session.Session // nil when Err is set
	Raw     []byte           // the bytes as stored
	Err     string           // why it could not be read, a sentence
}

// saveResult is a store's answer to one write.
type saveResult struct {
	key string
	seq int
	err error
}

// encodeSession returns the session file of s.
func encodeSession(s *session.Session) ([]byte, error) {
	var b bytes.Buffer
	if err := session.Encode(&b, s); err != nil {
		return nil, err
	}
	return b.Bytes(), nil
}

// decodeSession reads a session file: the session, or a sentence naming
// the field at fault.
func decodeSession(b []byte) (*session.Session, error) {
	s, err := session.Decode(bytes.NewReader(b))
	if err != nil {
		return nil, errors.New(sentence(err))
	}
	if len(s.Cylinders) == 0 {
		return nil, errors.New("cylinders: the file has no cylinder to set; add one with its name.")
	}
	return s, nil
}

// sentence turns an error into what the user reads: a setting.Error's
// field and sentence, or the error's text.
func sentence(err error) string {
	var se *setting.Error
	if errors.As(err, &se) {
		if se.Field == "" || strings.Contains(se.Message, se.Field) {
			return se.Message
		}
		return se.Field + ": " + se.Message
	}
	return err.Error()
}

// encodeIndex returns the stored form of the list of session keys: a JSON
// list of strings, null when there are none yet.
func encodeIndex(keys []string) []byte {
	if keys == nil {
		return []byte("null")
	}
	w := &jsonx.Writer{EscapeHTML: true}
	w.BeginArray()
	for _, k := range keys {
		w.String(k)
	}
	w.EndArray()
	b, _ := w.Bytes() // strings always encode
	return b
}

// decodeIndex reads the list of session keys. Its errors say what is
// wrong in encoding/json's words, as the stored list was always read so.
func decodeIndex(raw []byte) ([]string, error) {
	v, err := jsonx.Parse(raw, jsonx.Options{})
	if err != nil {
		return nil, err
	}
	switch v.Kind {
	case jsonx.Null:
		return nil, nil
	case jsonx.Array:
	default:
		return nil, fmt.Errorf("json: cannot unmarshal %s into Go value of type []string", v.Kind)
	}
	keys := make([]string, len(v.Elems))
	for i, e := range v.Elems {
		switch e.Kind {
		case jsonx.String:
			keys[i] = e.Text
		case jsonx.Null:
		default:
			return nil, fmt.Errorf("json: cannot unmarshal %s into Go value of type string", e.Kind)
		}
	}
	return keys, nil
}

// loadAll reads every stored session listed in the index, of any file
// version the session package reads; it writes nothing.
func loadAll(st Store) ([]*Stored, []string, error) {
	raw, ok, err := st.Get(IndexKey)
	if err != nil {
		return nil, nil, fmt.Errorf("The list of saved engines could not be read (%v); nothing was changed.", err)
	}
	if !ok {
		return nil, nil, nil
	}
	keys, err := decodeIndex(raw)
	if err != nil {
		return nil, nil, fmt.Errorf("The list of saved engines is damaged (%v); nothing was changed.", err)
	}
	var out []*Stored
	for _, k := range keys {
		b, ok, err := st.Get(k)
		switch {
		case err != nil:
			out = append(out, &Stored{Key: k, Err: "This engine could not be read from the browser's storage: " + err.Error()})
		case !ok:
			continue // listed before its first write completed
		default:
			e := &Stored{Key: k, Raw: b}
			if s, err := decodeSession(b); err != nil {
				e.Err = "This saved engine cannot be opened: " + err.Error() + " Export it to keep it; it is left as it is."
			} else {
				e.Session = s
			}
			out = append(out, e)
		}
	}
	return out, keys, nil
}
