// Command wasm is the Evenbeat browser app: an ebiten game compiled with
// GOOS=js GOARCH=wasm and started by site/index.html.
//
// The app is the measuring flow of package ui (flow_js.go): the engines
// list, set-up, the first-run cautions, readings on the on-canvas keypad,
// the plan and its what-if, with every entry saved through the IndexedDB
// store in strict-durability transactions (store_js.go), the back gesture
// moving back a step (History API), the plan's words mirrored into a
// hidden live region, file export and import, renaming, the report PNG
// shared, and the plan's words copied (copy_js.go).
//
// Input logic (input.go) is plain Go and tested natively; everything
// touching ebiten or syscall/js lives in files built only for js (main.go,
// *_js.go): the ebiten Canvas backend, the pointer queue fed by JavaScript
// listeners, and the store.
//
// Input: pointer events are queued by JavaScript listeners as they happen
// (ebiten polls once per tick and would lose a quick tap on a slow phone),
// with ebiten's touches and mouse as the fallback; keys, touches and mouse
// are folded into intents (tap, drag, confirm) that package ui handles.
//
// The app publishes its state on window for tests and the page:
// evenbeatState (the screen shown), evenbeatDrawn (the screen of the last
// drawn frame), evenbeatFirstFrame and evenbeatFirstScreen (when the first
// frame was drawn and what it showed), evenbeatGoStart (when the program
// started), evenbeatTheme ("light" or "dark"), evenbeatStatus (the saving
// state), evenbeatField (the keypad's field), evenbeatNote (the sentence
// under the keypad's entry: a value held, or asked again), evenbeatTargets (JSON: label
// and rect of every touch target) and evenbeatPlanText (the plan's words);
// the hidden live region #evenbeat-words mirrors every screen in words
// (ui.App.Mirror), and the theme follows the page's colour scheme while
// the app runs.
// The page may hand a session file's text to window.evenbeatImport.
// The app also publishes evenbeatDraws (frames really drawn),
// evenbeatDrawMs (the Go side of those frames, in all), evenbeatPlanMs
// (the last fit, plan and diagrams' model: the time until the plan can be
// drawn), evenbeatOtherMs (its other priority's plan, made on the tick
// after the plan's first frame), evenbeatSettled, evenbeatName, evenbeatNaming,
// evenbeatUpdateReady, evenbeatShare, evenbeatShareDrawMs (the report's
// making, in ms), evenbeatShareSignAt and evenbeatShareFileAt
// (performance.now() at the first frame showing the report's progress
// sign and when its file was ready) and evenbeatStoreError. The page
// (site/index.html) offers a waiting new version through evenbeatOnUpdate
// and evenbeatActivateUpdate, and shares the report (a PDF the app makes)
// in evenbeatShareFile. The engine-name box is
// name_js.go, the report share share_js.go, the update offer update_js.go.
// Listening (listen_js.go) records the microphone through a small
// AudioWorklet, asked for only inside the tap on Start listening, and
// publishes evenbeatListen (where listening has come to), evenbeatHeard
// (the whole engine's words about the beat heard) and evenbeatListenMs
// (the analysis of a recording evenbeatListenSeconds long, in the
// browser).
//
// Units: logical units are CSS pixels, origin top-left, y down, as in
// render; the screen has scale device pixels per logical unit
// (ebiten.Monitor().DeviceScaleFactor()). It may import setting and its
// subpackages (setting/jsonx writes evenbeatTargets), render, package ui
// and, in js files, ebiten and syscall/js.
package main
