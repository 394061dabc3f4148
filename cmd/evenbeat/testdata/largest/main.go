// Command largest writes the heaviest session file a command can be given
// (badinput.Largest: the demo session grown to 16 MB within every bound of
// the format), for the figures to time `evenbeat report` on. Run from the
// module's root:
//
//	go run ./cmd/evenbeat/testdata/largest -o big.json
package main

import (
	"flag"
	"fmt"
	"os"

	"evenbeat/setting/session/badinput"
)

func main() {
	out := flag.String("o", "", "file to write (required)")
	demo := flag.String("demo", "testdata/sessions/brackenfold-stephenson.json", "the demo session to grow")
	size := flag.Int("size", 16<<20, "bytes to grow it to (at most 16 MB)")
	flag.Parse()
	if err := write(*out, *demo, *size); err != nil {
		fmt.Fprintln(os.Stderr, "largest:", err)
		os.Exit(1)
	}
}

func write(out, demo string, size int) error {
	if out == "" {
		return fmt.Errorf("give the file to write: -o big.json")
	}
	base, err := os.ReadFile(demo)
	if err != nil {
		return err
	}
	b, err := badinput.Largest(base, size)
	if err != nil {
		return err
	}
	return os.WriteFile(out, b, 0o644)
}
