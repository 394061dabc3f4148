// Command wasm is the Evenbeat browser app: an ebiten game compiled with
// GOOS=js GOARCH=wasm and started by site/index.html.
//
// Screens and input logic (app.go, input.go) are plain Go and tested
// natively; everything touching ebiten or syscall/js lives in files built
// only for js (main.go, *_js.go): the ebiten Canvas backend, the pointer
// queue fed by JavaScript listeners, and the IndexedDB store.
//
// Input: pointer events are queued by JavaScript listeners as they happen
// (ebiten polls once per tick and would lose a quick tap on a slow phone),
// with ebiten's touches and mouse as the fallback; keys, touches and mouse
// are folded into intents (tap, scroll, confirm) that the screens handle.
// The app publishes its state on window for tests (evenbeatState,
// evenbeatDrawn, evenbeatFirstFrame, evenbeatFirstScreen, evenbeatAck,
// evenbeatBox, evenbeatAckSaved, evenbeatTheme, evenbeatGoStart).
//
// With "?flow" in the page's address the app runs the whole measuring flow
// of package ui instead (flow_js.go): the engines list, set-up, cautions,
// readings on the on-canvas keypad, the plan and its what-if, with every
// entry saved through the IndexedDB store, the back gesture moving back a
// step (History API), the plan's words mirrored into a hidden live region,
// and file export and import. It publishes evenbeatState, evenbeatStatus,
// evenbeatField, evenbeatTargets (JSON: label and rect of every touch
// target) and evenbeatPlanText for tests.
//
// Units: logical units are CSS pixels, origin top-left, y down, as in
// render; the screen has scale device pixels per logical unit
// (ebiten.Monitor().DeviceScaleFactor()). It may import setting, render
// and, in js files, ebiten and syscall/js.
package main
