// Command evenbeat builds the browser app and serves it, or writes it as
// static files for any HTTPS host.
//
// "serve" builds the WebAssembly program with the Go toolchain this command
// runs under (GOOS=js GOARCH=wasm, -trimpath, stripped, no inlining in
// this module's packages), caching the result
// under the user cache directory keyed by a hash of its inputs, copies
// wasm_exec.js from the same Go release, draws the icons with render, and
// serves the site with the right MIME types and precompressed gzip.
// "build -o DIR" writes the same files (plus .gz copies) to DIR.
//
// Main (Run/Close) is the whole command as a value; the end-to-end browser
// test reuses it. This package may import setting, render, render/raster,
// site and the standard library; chromedp only in tests.
package main
