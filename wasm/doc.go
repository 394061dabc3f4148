// Command wasm is the Evenbeat browser app: an ebiten game compiled with
// GOOS=js GOARCH=wasm and started by site/index.html.
//
// Screens and input logic (app.go, input.go) are plain Go and tested
// natively; everything touching ebiten or syscall/js lives in files built
// only for js (main.go, *_js.go): the ebiten Canvas backend, the pointer
// queue fed by JavaScript listeners, and the IndexedDB store.
//
// Units: logical units are CSS pixels, origin top-left, y down, as in
// render; the screen has scale device pixels per logical unit
// (ebiten.Monitor().DeviceScaleFactor()). It may import setting, render
// and, in js files, ebiten and syscall/js.
package main
