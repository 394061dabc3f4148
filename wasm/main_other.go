//go:build !js

package main

import (
	"fmt"
	"os"
)

// main explains how to build the app: it only runs in a browser.
func main() {
	fmt.Fprintln(os.Stderr, "Evenbeat's app runs in a browser: build it with GOOS=js GOARCH=wasm, or run `go run ./cmd/evenbeat serve`.")
	os.Exit(2)
}
