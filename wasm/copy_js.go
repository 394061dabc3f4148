//go:build js

package main

import (
	"errors"
	"syscall/js"
)

// copyWords is the app's OnCopy: it puts the plan's words on the
// clipboard, unless the tap's own event has just done so (see
// tapInGesture; the clipboard, like a keyboard, wants a user's gesture).
func (g *flowGame) copyWords(text string) {
	g.mu.Lock()
	done := g.copiedInGesture
	g.copiedInGesture = false
	g.mu.Unlock()
	if !done {
		g.writeClipboard(text)
	}
}

// writeClipboard writes text to the clipboard; how it went reaches the
// app on a later tick (copyTick).
func (g *flowGame) writeClipboard(text string) {
	cb := js.Global().Get("navigator").Get("clipboard")
	if !cb.Truthy() || cb.Get("writeText").Type() != js.TypeFunction {
		g.queueCopy(errors.New("this browser offers this page no clipboard"))
		return
	}
	var ok, fail js.Func
	release := func() { ok.Release(); fail.Release() }
	ok = js.FuncOf(func(js.Value, []js.Value) any {
		release()
		g.queueCopy(nil)
		return nil
	})
	fail = js.FuncOf(func(_ js.Value, args []js.Value) any {
		release()
		why := "the browser refused"
		if len(args) > 0 && args[0].Truthy() {
			if n := args[0].Get("name"); n.Type() == js.TypeString {
				why += " (" + n.String() + ")"
			}
		}
		g.queueCopy(errors.New(why))
		return nil
	})
	cb.Call("writeText", text).Call("then", ok, fail)
}

// queueCopy keeps how a copy went for the next tick.
func (g *flowGame) queueCopy(err error) {
	g.mu.Lock()
	g.copies = append(g.copies, err)
	g.mu.Unlock()
}

// copyTick tells the app how the copies went.
func (g *flowGame) copyTick() {
	g.mu.Lock()
	res := g.copies
	g.copies = nil
	g.mu.Unlock()
	for _, err := range res {
		g.ui.CopyDone(err)
	}
}
