package main

import (
	"bytes"
	"context"
	"fmt"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"evenbeat/setting/session/badinput"
)

// TestCatalogueOfBadInput runs every case of the catalogue of bad and
// hostile input (setting/session/badinput: files and flags, issue 13)
// through the command line, as a user would type it. For each: the exit
// status (run's error is what main exits 1 on), that the message names
// the field (its key path) and says it in words, and what to do; that
// nothing is planned, tabulated or written from a refused input, and that
// a refusal for readings that block a plan is the app's (Readiness). An
// input that is unusual but possible plans, and its warning is on stderr.
func TestCatalogueOfBadInput(t *testing.T) {
	sess, err := os.ReadFile(demoSession)
	if err != nil {
		t.Fatal(err)
	}
	eng, err := os.ReadFile(demoEngine)
	if err != nil {
		t.Fatal(err)
	}
	cases, err := badinput.Catalogue(sess, eng)
	if err != nil {
		t.Fatal(err)
	}
	if len(cases) < 40 {
		t.Fatalf("the catalogue holds %d kinds of bad input; the issue asks for at least 40", len(cases))
	}
	dir := t.TempDir()
	for i, c := range cases {
		t.Run(c.Name, func(t *testing.T) {
			path := filepath.Join(dir, "nowhere.json")
			if c.File != nil {
				path = filepath.Join(dir, fmt.Sprintf("case%d.json", i))
				if err := os.WriteFile(path, c.File, 0o644); err != nil {
					t.Fatal(err)
				}
			}
			png := filepath.Join(dir, fmt.Sprintf("case%d.png", i))
			args, file := []string{c.Command}, false
			for _, a := range c.Args {
				switch a {
				case "FILE":
					a, file = path, true
				case "OUT":
					a = png
				}
				args = append(args, a)
			}
			if !file && (c.File != nil || c.Kind != badinput.Flag) {
				args = append(args, path)
			}
			var stdout, stderr bytes.Buffer
			err := run(context.Background(), args, &stdout, &stderr)
			if c.Warns != "" && !strings.Contains(stderr.String(), c.Warns) {
				t.Errorf("stderr lacks the warning %q:\n%s", c.Warns, stderr.String())
			}
			if !c.Refused {
				if err != nil {
					t.Fatalf("refused: %v", err)
				}
				if !strings.Contains(stdout.String(), "Plan for") && !strings.Contains(stdout.String(), "cut-off") {
					t.Errorf("no plan or table written:\n%s", stdout.String())
				}
				return
			}
			if err == nil {
				t.Fatalf("accepted (exit status 0), wrote:\n%s", stdout.String())
			}
			msg := err.Error()
			t.Log(msg)
			if stdout.Len() > 0 {
				t.Errorf("wrote %q on a refusal", stdout.String())
			}
			if _, err := os.Stat(png); !os.IsNotExist(err) {
				t.Errorf("a report was written on a refusal (%v)", err)
			}
			if c.Field != "" && !strings.Contains(msg, c.Field) {
				t.Errorf("the message does not name the field %s", c.Field)
			}
			lower := strings.ToLower(msg)
			for _, w := range c.Words {
				if !strings.Contains(lower, strings.ToLower(w)) {
					t.Errorf("the message does not say %q", w)
				}
			}
			fixed := false
			for _, f := range c.Fix {
				fixed = fixed || strings.Contains(lower, strings.ToLower(f))
			}
			if !fixed {
				t.Errorf("the message does not say what to do (%q)", c.Fix)
			}
			if blocked := strings.Contains(msg, "no plan for the"); blocked != c.Blocked {
				t.Errorf("refused by the plan's readiness: %v, want %v", blocked, c.Blocked)
			}
			if c.Kind != badinput.Flag && (strings.Contains(msg, "NaN") || strings.Contains(msg, "Inf")) {
				t.Errorf("the message shows a non-number") // a flag's may quote what was typed
			}
		})
	}
}
