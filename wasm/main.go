//go:build js

package main

import (
	"syscall/js"

	"github.com/hajimehoshi/ebiten/v2"

	"evenbeat/render"
)

func main() {
	// For the figures: when the WebAssembly program started running.
	js.Global().Set("evenbeatGoStart", js.Global().Get("performance").Call("now"))
	st, err := openStore()
	if err != nil {
		// Run without remembering anything; the app says so.
		println(err.Error())
		js.Global().Set("evenbeatStoreError", err.Error())
	}
	th, name := render.Light(), "light"
	if js.Global().Call("matchMedia", "(prefers-color-scheme: dark)").Get("matches").Bool() {
		th, name = render.Dark(), "dark"
	}
	js.Global().Set("evenbeatTheme", name)
	ebiten.SetScreenClearedEveryFrame(false)
	ebiten.SetWindowTitle("Evenbeat")
	if err := runFlow(st, th); err != nil {
		println(err.Error())
	}
}
