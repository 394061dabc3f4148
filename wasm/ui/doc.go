// Package ui is the phone app's screens and flow, free of ebiten and the
// browser so that the whole flow runs and is tested natively: the engines
// list, the engine set-up, the cautions, the measuring steps with the
// on-canvas keypad, the plan with its what-if, the next round and the
// history of rounds.
//
// Set-up of a new engine takes the gear kind, the units and gauge, how
// many cylinders (1 to 3: right, left, middle), then asks what a setter
// measures or reads off the drawing, in the trade's terms (setup.go): the
// stroke, rod, wheel, laps and port (once for both ends unless they
// differ), the lead as drawn, the valve travel or the eccentric's throw,
// the gear's rods and links, the running notch, each adjuster's thread,
// steps a turn and limit; a question with a few answers (the valve's
// admission, open or crossed rods, which way the gauge grows) is one tap.
// Inch lengths are typed as fractions ("1 3/16"). Nothing is taken from
// a demo: what the model needs besides is derived (setting.Derive) and
// shown on the engine's sheet (sheet.go), each value tappable to give
// instead, with the checks that the engine works (EngineSpec.Works). A new
// engine is a session the store keeps once whole; until then its answers
// are a draft (setupflow.go). The sheet, the units and every value can be
// changed at any time from the menu: an edit of the profile
// (session.Edit) that keeps every reading and is recorded in the engine's
// history. A demo engine opened to look at is kept only once changed.
//
// Each cylinder is measured, listed and planned on its
// own, switched by a row of buttons. A round asks the port marks (or the
// laps; a later round may keep an earlier round's marks while the valve
// has not moved on its spindle), the dead centres in the first round, the
// dead-centre readings, then the plan; per reverser position the sweep,
// the cut-offs (as crosshead travel or tyre marks) and feeler openings
// are a tap away (More readings), each a step that may be skipped. The
// steps' words follow the engine (which way the valve moves to crack a
// port) and the display unit. Every reading of any round can be typed
// again from the history; its round's plan is made again. The plan
// screen says when the readings do not fit the engine described
// (plan.Fit.Findings), chooses
// what the plan makes equal (leads, cut-offs in a running notch, or a
// balance with its share), and a target lead, saved in the session file as
// its plan aims (session.PlanAims, file version 2), and drags a what-if
// amount of any adjustment the engine allows.
//
// Every entry is judged by the domain's own checks before it is taken
// (entry.go): a value the session file cannot hold, an engine that does
// not fit together, a steam lap beyond half the valve's travel, a record
// whose readings contradict one another (session.Readiness) is held at its
// field with a sentence in the setter's words and display unit, never a
// key path; a value outside the field's usual range is taken on a second
// Next. Nothing a stray tap makes is permanent (records.go): a round begun
// is stored with its first value, a demo engine with its first change; an
// engine, a round or a reading's record can be deleted, with an Undo bar
// for a few seconds; a file of an engine already here is opened when it
// is the same, else the engines list asks to replace it or keep both. The
// saving state shown is the engine's own and the app's: "Saved" only once
// the store holds what is shown.
//
// The glue's hooks: Options.OnExport and OnImport (with App.Import) for
// the session file, OnName (a text box, then App.Rename), OnShare (the
// report PNG), OnCopy (the plan's words, with App.CopyDone), OnUpdate with
// App.SetUpdateReady (the new-version banner); App.PlanText, PlanTime and
// OtherTime for the page.
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
