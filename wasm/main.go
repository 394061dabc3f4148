//go:build js

package main

import (
	"log"
	"syscall/js"

	"github.com/hajimehoshi/ebiten/v2"

	"evenbeat/render"
)

func main() {
	// For the figures: when the WebAssembly program started running.
	js.Global().Set("evenbeatGoStart", js.Global().Get("performance").Call("now"))
	st, err := openStore()
	if err != nil {
		log.Print(err) // run without remembering anything
	}
	acked := false
	if st != nil {
		// Read before the first frame, so a returning user never sees the
		// card flash.
		v, ok, err := st.Get(ackKey)
		if err != nil {
			log.Print(err)
		}
		acked = ok && v == "yes"
	}
	th, name := render.Light(), "light"
	if js.Global().Call("matchMedia", "(prefers-color-scheme: dark)").Get("matches").Bool() {
		th, name = render.Dark(), "dark"
	}
	js.Global().Set("evenbeatTheme", name)
	ebiten.SetScreenClearedEveryFrame(false)
	ebiten.SetWindowTitle("Evenbeat")
	if flowMode() {
		if err := runFlow(st, th); err != nil {
			log.Print(err)
		}
		return
	}
	if err := ebiten.RunGame(newGame(newApp(demoEngine(), th, acked), st)); err != nil {
		log.Print(err)
	}
}
