// Package site holds the static files of the browser app: the page that
// starts the WebAssembly program, the web app manifest and the service
// worker template. cmd/evenbeat adds the built main.wasm, Go's wasm_exec.js
// and the icons (drawn by render), fills in the service worker's version and
// serves or writes the whole set.
//
// Units: none; the page itself uses CSS px. It imports only the standard
// library (embed).
package site
