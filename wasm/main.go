//go:build js

package main

import (
	"syscall/js"

	"github.com/hajimehoshi/ebiten/v2"

	"evenbeat/render"
)

// themeOf is the palette for the page's colour scheme, and its name.
func themeOf(dark bool) (render.Theme, string) {
	if dark {
		return render.Dark(), "dark"
	}
	return render.Light(), "light"
}

func main() {
	// For the figures: when the WebAssembly program started running.
	js.Global().Set("evenbeatGoStart", js.Global().Get("performance").Call("now"))
	st, err := openStore()
	if err != nil {
		// Run without remembering anything; the app says so.
		println(err.Error())
		js.Global().Set("evenbeatStoreError", err.Error())
	}
	dark := js.Global().Call("matchMedia", "(prefers-color-scheme: dark)")
	th, name := themeOf(dark.Get("matches").Bool())
	js.Global().Set("evenbeatTheme", name)
	ebiten.SetScreenClearedEveryFrame(false)
	ebiten.SetWindowTitle("Evenbeat")
	if err := runFlow(st, th, dark); err != nil {
		println(err.Error())
	}
}
