package ui

import (
	"bytes"
	"errors"
	"fmt"
	"strconv"

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
	// Delete removes key (nothing when it was never stored) and calls done
	// as Put does: nil only once the removal is durable.
	Delete(key string, done func(error))
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
	// pending marks a session opened but never stored (a demo engine
	// looked at): it has no key and is stored on its first change.
	pending bool
	// unencodable is set while the session cannot be written as a file
	// (the reason is the app's failure for its key).
	unencodable bool
}

// saveResult is a store's answer to one write.
type saveResult struct {
	key string
	seq int
	err error
}

// failure is why the last write of a key did not complete, until a later
// write of that key does (seq orders them).
type failure struct {
	say string // the sentence shown
	seq int    // the write that failed
	// encode marks a session that could not be written as a file: over
	// once it can be.
	encode bool
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
		return nil, errors.New("The file has no cylinder to set; add one to its \"cylinders\" list, with its name.")
	}
	return s, nil
}

// sentence turns an error into what the user reads: a setting.Error's
// sentence (which names its field in words; the key path is never shown),
// or the error's text. Key paths quoted inside are put in words by
// App.words.
func sentence(err error) string {
	var se *setting.Error
	if errors.As(err, &se) && se.Message != "" {
		return se.Message
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

// saveStored writes e's session through the store as a whole session
// file when it changed since it was last written; b, when not nil, is
// that file already encoded (by the entry's checks). A session opened and
// never stored (a demo engine) is stored on its first change.
func (a *App) saveStored(e *Stored, b []byte) {
	a.gen++
	if e == nil || e.Session == nil {
		return
	}
	if b == nil {
		var err error
		if b, err = a.encode(e.Session); err != nil {
			e.unencodable = true
			a.fail(e.Key, failure{"Not saved: " + a.inWords(sentence(err)) + " Your entries are still here; export the session file (Menu, Export) to keep a copy.", a.seq, true})
			return
		}
	}
	e.unencodable = false
	if f, ok := a.failed[e.Key]; ok && f.encode {
		delete(a.failed, e.Key) // it can be written again: saving says the rest
	}
	if bytes.Equal(b, e.Raw) {
		if _, ok := a.failed[e.Key]; ok && !e.pending {
			a.put(e.Key, b) // the same bytes, but the last write of them failed
		}
		a.setStatus()
		return
	}
	e.Raw = b
	if e.pending {
		a.keep(e)
		return
	}
	a.put(e.Key, b)
	a.retryFailed()
}

// retryFailed writes again, with a session, the app's own values whose
// last write failed: the list of engines and the cautions' acknowledgement.
func (a *App) retryFailed() {
	if _, ok := a.failed[IndexKey]; ok {
		a.put(IndexKey, encodeIndex(a.index))
	}
	if _, ok := a.failed[AckKey]; ok && a.acked {
		a.put(AckKey, []byte("true"))
	}
}

// keep stores a session held until now (a demo engine changed, an
// import) under a new key, and the list of sessions with it.
func (a *App) keep(e *Stored) {
	e.pending = false
	e.Key = a.newKey()
	a.stored = append(a.stored, e)
	a.index = append(a.index, e.Key)
	a.put(e.Key, e.Raw)
	a.put(IndexKey, encodeIndex(a.index))
}

// newKey returns a session key not in the index, nor of an engine deleted
// in this run (its Undo writes it back).
func (a *App) newKey() string {
	used := map[string]bool{}
	for _, k := range a.index {
		used[k] = true
	}
	n := len(a.index) + 1
	for used[sessionPrefix+strconv.Itoa(n)] || a.retired[sessionPrefix+strconv.Itoa(n)] {
		n++
	}
	return sessionPrefix + strconv.Itoa(n)
}

// put writes one value, counted for the saving state.
func (a *App) put(key string, b []byte) {
	a.write(key, func(done func(error)) { a.opt.Store.Put(key, b, done) })
}

// remove deletes one value from the store, counted for the saving state.
func (a *App) remove(key string) {
	a.write(key, func(done func(error)) { a.opt.Store.Delete(key, done) })
}

// write starts one write of key through op, counted for the saving state;
// the answer is taken in by Update.
func (a *App) write(key string, op func(done func(error))) {
	if a.opt.Store == nil {
		return // New says so
	}
	a.seq++
	a.open++
	seq := a.seq
	a.setStatus()
	op(func(err error) {
		a.mu.Lock()
		a.answers = append(a.answers, saveResult{key, seq, err})
		a.mu.Unlock()
	})
}

// answered takes in the store's answer to one write: a failure is kept
// for its key until a later write of that key succeeds (each write holds
// the whole value); a failure answered after a later write of the key
// succeeded is over already.
func (a *App) answered(r saveResult) {
	if a.failed == nil {
		a.failed, a.okSeq = map[string]failure{}, map[string]int{}
	}
	switch f, ok := a.failed[r.key]; {
	case r.err != nil && a.okSeq[r.key] < r.seq:
		a.failed[r.key] = failure{"Not saved: " + r.err.Error() + ". Your entries are still here; export the session file (Menu, Export) to keep a copy.", r.seq, false}
	case r.err == nil:
		a.okSeq[r.key] = max(a.okSeq[r.key], r.seq)
		if ok && r.seq > f.seq {
			delete(a.failed, r.key)
		}
	}
	a.setStatus()
}

// fail records that the value of key is not saved, with the sentence
// shown while it is the current engine's (or the app's own key's).
func (a *App) fail(key string, f failure) {
	if a.failed == nil {
		a.failed, a.okSeq = map[string]failure{}, map[string]int{}
	}
	a.failed[key] = f
	a.setStatus()
}

// setStatus words the saving state of what is shown: a failure of the
// current engine's session or of the app's own keys (the list of engines,
// the cautions), never another engine's.
func (a *App) setStatus() {
	a.saveErr = a.noStore
	keys := []string{IndexKey, AckKey}
	if a.cur != nil {
		keys = append(keys, a.cur.Key)
	}
	for _, k := range keys {
		if f, ok := a.failed[k]; ok && a.saveErr == "" {
			a.saveErr = f.say
		}
	}
	switch {
	case a.saveErr != "":
		a.status = a.saveErr
	case a.cur != nil && a.cur.pending:
		a.status = "Not saved yet" // nothing changed yet: nothing to keep
	case a.seq == 0:
		a.status = "Not saved yet"
	case a.open == 0:
		a.status = "Saved"
	default:
		a.status = "Saving..."
	}
}
