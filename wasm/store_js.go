//go:build js

package main

import (
	"errors"
	"fmt"
	"strings"
	"syscall/js"
	"time"
)

// store is a small string key-value store in the browser's IndexedDB. A
// write counts as saved only when its transaction completes, and
// transactions ask for strict durability (flushed to disk before
// "complete"), so a saved entry survives the browser being killed.
type store struct {
	db js.Value
}

const (
	storeDB    = "evenbeat"
	storeTable = "kv"
)

// jsError turns a DOMException-like value into an error whose text says
// what failed and why in words the user can act on, naming the
// exception (QuotaExceededError, ...) so it can be looked up.
func jsError(what string, v js.Value) error {
	if v.IsUndefined() || v.IsNull() {
		return errors.New(what + " failed for a reason the browser did not give")
	}
	name, msg := "", ""
	if n := v.Get("name"); n.Type() == js.TypeString {
		name = n.String()
	}
	if m := v.Get("message"); m.Type() == js.TypeString {
		msg = m.String()
	}
	return errors.New(what + ": " + storeReason(name, msg))
}

// storeReason words an IndexedDB failure by its exception name.
func storeReason(name, msg string) string {
	why := ""
	switch name {
	case "QuotaExceededError":
		why = "the browser's storage for this app is full; free space on the phone or delete old sessions"
	case "UnknownError":
		why = "the browser's database failed, perhaps damaged or on a disk it cannot read"
	case "VersionError":
		why = "the database on this phone was written by a newer version of the app"
	case "InvalidStateError":
		why = "the browser has closed the database"
	case "AbortError", "TransactionInactiveError":
		why = "the browser stopped the write before it finished"
	case "SecurityError", "NotAllowedError":
		why = "the browser does not let this page keep data (as in some private windows)"
	case "DataError", "DataCloneError", "ConstraintError", "ReadOnlyError", "NotFoundError":
		why = "the browser refused the data"
	case "":
		name = "Error"
	}
	if why == "" {
		why = strings.TrimSuffix(msg, ".")
		if why == "" {
			why = "the browser gave no reason"
		}
	}
	return why + " (" + name + ")"
}

// slowStorage is how long the browser's database may take to answer at
// start before the loading screen says it is waiting for it.
const slowStorage = 4 * time.Second

// awaitStorage waits for the browser database's answer on done. While the
// start waits on it for longer than slowStorage (another tab holding the
// database, a busy phone), the loading screen says so and how long it has
// waited, every second, so the page never looks frozen. It never gives up:
// a timeout could start the app without the engines already saved, and a
// save made then could be lost.
func awaitStorage(done <-chan error) error {
	tick := time.NewTicker(time.Second)
	defer tick.Stop()
	start := time.Now()
	for {
		select {
		case err := <-done:
			return err
		case <-tick.C:
			if waited := time.Since(start); waited >= slowStorage {
				showLoading(fmt.Sprintf("Waiting for the browser's storage, where your engines are kept: no answer for %d s. Nothing is lost; Evenbeat starts when it answers. If this goes on, close other Evenbeat tabs or windows, or restart the browser.", int(waited.Seconds())))
			}
		}
	}
}

// showLoading puts text on the page's loading screen (a status region,
// so a screen reader reads it), if the page has one.
func showLoading(text string) {
	if el := js.Global().Get("document").Call("getElementById", "loading"); el.Truthy() {
		el.Set("textContent", text)
	}
}

// openStore opens (creating on first use) the app's database. It blocks
// until the browser answers, so call it before the game loop starts.
//
// A browser that refuses storage (the indexedDB getter or open throws, as
// in some private windows) gives an error, never a panic: the app then
// runs without storage and says so.
func openStore() (st *store, err error) {
	defer func() {
		if r := recover(); r != nil {
			st, err = nil, thrownError("opening the browser database", r)
		}
	}()
	// Through Reflect.get: a getter that throws is caught by Call (a plain
	// Get would let the exception end the program).
	idb := js.Global().Get("Reflect").Call("get", js.Global(), "indexedDB")
	if idb.IsUndefined() || idb.IsNull() {
		return nil, errors.New("opening the browser database: this browser has no IndexedDB")
	}
	req := idb.Call("open", storeDB, 1)
	done := make(chan error, 1)
	var upgrade, success, failure js.Func
	upgrade = js.FuncOf(func(js.Value, []js.Value) any {
		db := req.Get("result")
		if !db.Get("objectStoreNames").Call("contains", storeTable).Bool() {
			db.Call("createObjectStore", storeTable)
		}
		return nil
	})
	answer := func(err error) {
		select {
		case done <- err:
		default: // the first answer counts
		}
	}
	success = js.FuncOf(func(js.Value, []js.Value) any { answer(nil); return nil })
	failure = js.FuncOf(func(js.Value, []js.Value) any {
		answer(jsError("opening the browser database", req.Get("error")))
		return nil
	})
	req.Set("onupgradeneeded", upgrade)
	req.Set("onsuccess", success)
	req.Set("onerror", failure)
	req.Set("onblocked", failure)
	err = awaitStorage(done)
	for _, h := range []string{"onupgradeneeded", "onsuccess", "onerror", "onblocked"} {
		req.Set(h, js.Null()) // a late event must not call a released function
	}
	upgrade.Release()
	success.Release()
	failure.Release()
	if err != nil {
		return nil, err
	}
	return &store{db: req.Get("result")}, nil
}

// Get reads key; ok is false when it was never saved. It blocks until the
// browser answers: call it outside the game loop.
func (s *store) Get(key string) (value string, ok bool, err error) {
	defer func() {
		// A closed database makes transaction() throw.
		if r := recover(); r != nil {
			value, ok, err = "", false, thrownError("reading "+key+" from the browser database", r)
		}
	}()
	tx := s.db.Call("transaction", storeTable, "readonly")
	req := tx.Call("objectStore", storeTable).Call("get", key)
	done := make(chan error, 1)
	success := js.FuncOf(func(js.Value, []js.Value) any { done <- nil; return nil })
	failure := js.FuncOf(func(js.Value, []js.Value) any {
		done <- jsError("reading "+key+" from the browser database", req.Get("error"))
		return nil
	})
	defer success.Release()
	defer failure.Release()
	req.Set("onsuccess", success)
	req.Set("onerror", failure)
	if err = awaitStorage(done); err != nil {
		return "", false, err
	}
	v := req.Get("result")
	if v.Type() != js.TypeString {
		return "", false, nil
	}
	return v.String(), true, nil
}

// Put writes key = value without blocking and calls done (from the browser's
// event loop) when the transaction has completed, with nil, or with the
// reason it failed. Only then is the entry saved.
func (s *store) Put(key, value string, done func(error)) {
	s.write("saving "+key+" in the browser database", done, func(st js.Value) { st.Call("put", value, key) })
}

// Delete removes key without blocking and calls done as Put does, once
// the removal's transaction has completed.
func (s *store) Delete(key string, done func(error)) {
	s.write("deleting "+key+" from the browser database", done, func(st js.Value) { st.Call("delete", key) })
}

// write runs op on the object store in a strict-durability readwrite
// transaction and calls done once: nil when the transaction completed,
// else why not (what names the write).
func (s *store) write(what string, done func(error), op func(st js.Value)) {
	var tx js.Value
	var complete, failure js.Func
	var thrown error // op threw: the abort it causes reports this
	finished := false
	finish := func(err error) {
		if finished { // error and abort both fire on failure
			return
		}
		finished = true
		if !tx.IsUndefined() {
			for _, h := range []string{"oncomplete", "onerror", "onabort"} {
				tx.Set(h, js.Null()) // a late event must not call a released function
			}
		}
		complete.Release()
		failure.Release()
		done(err)
	}
	defer func() {
		r := recover()
		if r == nil {
			return
		}
		err := thrownError(what, r)
		if tx.IsUndefined() {
			finish(err) // transaction() threw: a closed database, say
			return
		}
		// op threw: end the transaction; its abort event reports err.
		thrown = err
		defer func() {
			if recover() != nil {
				finish(err) // already ended
			}
		}()
		tx.Call("abort")
	}()
	tx = s.db.Call("transaction", storeTable, "readwrite", map[string]any{"durability": "strict"})
	complete = js.FuncOf(func(js.Value, []js.Value) any { finish(nil); return nil })
	failure = js.FuncOf(func(js.Value, []js.Value) any {
		if thrown != nil {
			finish(thrown)
		} else {
			finish(jsError(what, tx.Get("error")))
		}
		return nil
	})
	tx.Set("oncomplete", complete)
	tx.Set("onerror", failure)
	tx.Set("onabort", failure)
	op(tx.Call("objectStore", storeTable))
}

// thrownError words what a recovered JavaScript exception says.
func thrownError(what string, r any) error {
	if e, ok := r.(js.Error); ok {
		return jsError(what, e.Value)
	}
	return fmt.Errorf("%s: %v", what, r)
}
