//go:build js

package main

import (
	"errors"
	"fmt"
	"syscall/js"
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

// jsError turns a DOMException-like value into an error.
func jsError(what string, v js.Value) error {
	if v.IsUndefined() || v.IsNull() {
		return errors.New(what)
	}
	return errors.New(what + ": " + v.Get("name").String() + ": " + v.Get("message").String())
}

// openStore opens (creating on first use) the app's database. It blocks
// until the browser answers, so call it before the game loop starts.
func openStore() (*store, error) {
	idb := js.Global().Get("indexedDB")
	if idb.IsUndefined() || idb.IsNull() {
		return nil, errors.New("this browser has no IndexedDB")
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
	success = js.FuncOf(func(js.Value, []js.Value) any { done <- nil; return nil })
	failure = js.FuncOf(func(js.Value, []js.Value) any {
		done <- jsError("opening the browser database", req.Get("error"))
		return nil
	})
	req.Set("onupgradeneeded", upgrade)
	req.Set("onsuccess", success)
	req.Set("onerror", failure)
	req.Set("onblocked", failure)
	err := <-done
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
	if err := <-done; err != nil {
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
	defer func() {
		// A closed database makes transaction() throw.
		if r := recover(); r != nil {
			done(fmt.Errorf("saving %s in the browser database: %v", key, r))
		}
	}()
	tx := s.db.Call("transaction", storeTable, "readwrite", map[string]any{"durability": "strict"})
	var complete, failure js.Func
	finished := false
	finish := func(err error) {
		if finished { // error and abort both fire on failure
			return
		}
		finished = true
		complete.Release()
		failure.Release()
		done(err)
	}
	complete = js.FuncOf(func(js.Value, []js.Value) any { finish(nil); return nil })
	failure = js.FuncOf(func(js.Value, []js.Value) any {
		finish(jsError("saving "+key+" in the browser database", tx.Get("error")))
		return nil
	})
	tx.Set("oncomplete", complete)
	tx.Set("onerror", failure)
	tx.Set("onabort", failure)
	tx.Call("objectStore", storeTable).Call("put", value, key)
}
