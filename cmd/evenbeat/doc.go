// Command evenbeat serves the Evenbeat browser app or writes it out as
// static files for any HTTPS host, and plans, tabulates and reports from
// the same files the app uses.
//
//	evenbeat serve [-addr 127.0.0.1:8080] [-src DIR]
//	evenbeat build -o DIR [-src DIR]
//	evenbeat plan [-json] [-cylinder NAME] [-priority leads|cut-offs|balanced] [-weight W] [-target-lead MM] [-unit mm|inch] SESSION.json
//	evenbeat events [-json] ENGINE.json
//	evenbeat report [plan's flags] [-dark] SESSION.json -o report.pdf|report.png
//	evenbeat listen [-beats 4] [-session SESSION.json [-position "full forward"]] RECORDING.wav
//
// "serve" builds the WebAssembly program with the Go toolchain this command
// runs under (GOOS=js GOARCH=wasm, -trimpath, stripped, no inlining in
// this module's packages but setting), caching the result under the user
// cache directory keyed by a hash of its inputs, copies wasm_exec.js from
// the same Go release, draws the icons with render, and serves the site
// with the right MIME types and precompressed gzip. "build -o DIR" writes
// the same files (plus .gz copies) to DIR.
//
// "plan", "events" and "report" (files.go) read session and engine files,
// with flags before or after the file; a plan's aims not given as flags
// come from the session's plan_aims. "plan" and "report" run the checks
// the app runs before its plan: the session's warnings and what weakens
// the plan go to stderr ("evenbeat: warning: field: sentence"), and a
// cylinder whose readings block a plan (missing or contradictory
// readings, session.Session.Readiness) is refused with every reason and
// exit status 1, nothing planned or written. The file commands run with a
// soft memory limit (unless GOMEMLIMIT is set), so the largest session
// file (16 MB) is read in a few hundred MB.
//
// "listen" (listen.go) hears the beat in a WAV recording of the exhaust
// (setting/listen) and prints the onsets, the speed, the gaps, the
// evenness and the odd beat; with a session it plans every cylinder with
// the session's aims, takes today's beat in the position named from
// setting/beat and lays the heard beats on it, naming the odd beat's
// cylinder end or saying why it cannot. Its notes go to stderr.
//
// Main (Run/Close) is the whole command as a value; the end-to-end browser
// test reuses it. This package may import setting and its subpackages,
// render, render/raster, render/report, site and the standard library;
// chromedp only in tests.
package main
