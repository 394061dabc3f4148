// Package ui is the phone app's screens and flow, free of ebiten and the
// browser so that the whole flow runs and is tested natively: the engines
// list, the engine set-up, the cautions, the measuring steps with the
// on-canvas keypad, the plan with its what-if, the next round and the
// history of rounds.
//
// The app draws only through render.Canvas (the ebiten backend in the
// browser, render/recorder in tests) and takes input as plain intents (Tap,
// Drag, Confirm) that the browser glue folds from pointer events and keys.
// Every committed entry is written through the Store interface as the whole
// session file (session.Encode); the app says "saved" only when the store
// reports the write complete. Back moves one step back (the glue calls it
// on the History API's popstate).
//
// Units: logical units are CSS pixels, origin top-left, y down, as in
// render. Lengths are mm inside; the user types them in the session's
// display unit (mm or inch) and session.ParseLength turns them into mm.
//
// Imports: setting and its subpackages, render and the standard library.
// Never ebiten or syscall/js.
package ui
