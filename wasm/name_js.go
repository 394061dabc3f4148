//go:build js

package main

import (
	"strings"
	"syscall/js"

	"evenbeat/render"
	"evenbeat/wasm/ui"
)

// overClass marks DOM elements shown over the canvas: the pointer queue
// ignores events on them, so a tap on the box never reaches the app below.
const overClass = "evenbeat-over"

// nameBox is the text box for an engine's name, shown over the canvas: a
// labelled input (the phone's keyboard, which the keypad otherwise spares
// the user, is right for words), a line for the app's answer, and Cancel
// and OK. Its styles are in site/index.html (#evenbeat-name-box). Open,
// close and the handlers run on the browser's event loop; the names typed
// are queued for the game loop, which calls App.Rename.
type nameBox struct {
	el, input, msg js.Value
	funcs          []js.Func
}

// openName is the app's OnName: it shows the box with current filled in
// and focused. A box already open is kept.
func (g *flowGame) openName(current string) {
	g.mu.Lock()
	defer g.mu.Unlock()
	if g.name != nil {
		return
	}
	doc := g.window.Get("document")
	el := doc.Call("createElement", "div")
	el.Set("id", "evenbeat-name-box")
	el.Set("className", overClass)
	el.Set("innerHTML", `<form role="dialog" aria-modal="true" aria-labelledby="evenbeat-name-label">`+
		`<label id="evenbeat-name-label" for="evenbeat-name">Engine name</label>`+
		`<input id="evenbeat-name" type="text" maxlength="60" enterkeyhint="done" autocomplete="off" spellcheck="false">`+
		`<p id="evenbeat-name-msg" role="alert"></p>`+
		`<div><button type="button" id="evenbeat-name-cancel">Cancel</button><button type="submit" id="evenbeat-name-ok">OK</button></div>`+
		`</form>`)
	doc.Get("body").Call("appendChild", el)
	b := &nameBox{el: el, input: doc.Call("getElementById", "evenbeat-name"), msg: doc.Call("getElementById", "evenbeat-name-msg")}
	b.input.Set("value", current)
	on := func(target js.Value, event string, f func(ev js.Value)) {
		fn := js.FuncOf(func(_ js.Value, args []js.Value) any { f(args[0]); return nil })
		b.funcs = append(b.funcs, fn)
		target.Call("addEventListener", event, fn)
	}
	on(el.Call("querySelector", "form"), "submit", func(ev js.Value) {
		ev.Call("preventDefault")
		g.mu.Lock()
		g.names = append(g.names, b.input.Get("value").String())
		g.mu.Unlock()
	})
	on(doc.Call("getElementById", "evenbeat-name-cancel"), "click", func(js.Value) { g.closeName() })
	// A press on the dimmed page around the form, or on the form's own
	// background, must not take the focus from the input: the box opens
	// inside the tap's pointerup, and the mousedown a touch browser sends
	// after it lands on the box.
	form := el.Call("querySelector", "form")
	on(el, "mousedown", func(ev js.Value) {
		if t := ev.Get("target"); t.Equal(el) || t.Equal(form) {
			ev.Call("preventDefault")
		}
	})
	on(el, "keydown", func(ev js.Value) {
		if ev.Get("key").String() == "Escape" {
			ev.Call("preventDefault")
			g.closeName()
		}
	})
	g.name = b
	g.window.Set("evenbeatNaming", true)
	b.input.Call("focus")
	b.input.Call("select")
}

// tapInGesture is the pointer queue's onUp: a pointer that went down and
// came up on the rename, import, copy or Start listening button opens the
// name box or the file chooser, writes the clipboard, or starts the
// microphone, at once, inside the browser's event. iOS raises the
// keyboard for a focus, opens a file chooser, and browsers write the
// clipboard and start sound, only inside a user's gesture. The app's own
// handling of the tap, on the next tick, then finds the box open
// (openName keeps it), the chooser opened (chooseFile skips it), the words
// copied (copyWords skips them) or the microphone started (Start does
// nothing twice).
func (g *flowGame) tapInGesture(down, up render.Point) {
	g.mu.Lock()
	// As the app's own hit test: a button scrolled under the top bar is
	// not reached there.
	on := func(label string) bool {
		r, ok := g.gestureAt[label]
		return ok && r.Contains(down) && r.Contains(up) && down.Y >= g.barBottom && up.Y >= g.barBottom
	}
	rename, choose, copies := on(ui.RenameLabel), on(ui.ImportLabel), on(ui.CopyLabel) && g.copyText != ""
	listens := on(ui.StartLabel)
	name, text := g.nameNow, g.copyText
	g.chooserOpened = g.chooserOpened || choose
	g.copiedInGesture = g.copiedInGesture || copies
	g.mu.Unlock()
	switch {
	case rename:
		g.openName(name)
	case choose:
		g.openChooser()
	case copies:
		g.writeClipboard(text)
	case listens:
		g.mic.Start() // the app's own Start on the next tick finds it started
	}
}

// closeName removes the box, if open, and gives the keys back to the
// canvas. It reports whether a box was open.
func (g *flowGame) closeName() bool {
	g.mu.Lock()
	b := g.name
	g.name = nil
	g.names = nil
	g.mu.Unlock()
	if b == nil {
		return false
	}
	b.el.Call("remove")
	for _, f := range b.funcs {
		f.Release()
	}
	g.window.Set("evenbeatNaming", false)
	if c := g.window.Get("document").Call("querySelector", "canvas"); c.Truthy() {
		c.Call("focus")
	}
	return true
}

// renameTick hands the names typed to the app: the box closes on success
// and shows the app's sentence otherwise.
func (g *flowGame) renameTick() {
	g.mu.Lock()
	names, b := g.names, g.name
	g.names = nil
	g.mu.Unlock()
	for _, n := range names {
		err := g.ui.Rename(n)
		if err == nil {
			g.closeName()
			continue
		}
		if b != nil {
			// The app's error names the field; the box's label already does.
			msg := render.Capital(strings.TrimPrefix(err.Error(), "name: "))
			b.msg.Set("textContent", msg)
			b.input.Call("focus")
		}
	}
}
