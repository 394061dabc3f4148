package main

import (
	"bytes"
	"context"
	"net"
	"strings"
	"testing"
)

func TestCommandLineErrors(t *testing.T) {
	tests := []struct {
		name string
		args []string
		want string // in the error
	}{
		{"no command", nil, "no command"},
		{"unknown command", []string{"deploy"}, `unknown command "deploy"`},
		{"unknown flag", []string{"serve", "-port", "80"}, "-port"},
		{"stray argument", []string{"serve", "extra"}, `unexpected argument "extra"`},
		{"build without -o", []string{"build"}, "-o DIR"},
		{"build bad flag", []string{"build", "-out", "x"}, "-out"},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			var stdout, stderr bytes.Buffer
			err := run(context.Background(), tc.args, &stdout, &stderr)
			if err == nil || !strings.Contains(err.Error(), tc.want) {
				t.Errorf("run(%q) = %v; want an error containing %q", tc.args, err, tc.want)
			}
		})
	}
}

func TestPortInUse(t *testing.T) {
	ln, err := net.Listen("tcp", "127.0.0.1:0")
	if err != nil {
		t.Fatal(err)
	}
	defer ln.Close()
	_, err = listen(ln.Addr().String())
	if err == nil {
		t.Fatal("listening on a busy port succeeded")
	}
	for _, want := range []string{"-addr", ln.Addr().String(), "another"} {
		if !strings.Contains(err.Error(), want) {
			t.Errorf("error %q does not mention %q", err, want)
		}
	}
}

// TestRunReportsBusyPortFirst: a busy port is reported before any build
// (which takes minutes the first time); here the build would fail anyway,
// as Src is outside the source tree.
func TestRunReportsBusyPortFirst(t *testing.T) {
	ln, err := net.Listen("tcp", "127.0.0.1:0")
	if err != nil {
		t.Fatal(err)
	}
	defer ln.Close()
	m := &Main{Addr: ln.Addr().String(), Src: t.TempDir()}
	err = m.Run()
	if err == nil {
		m.Close()
		t.Fatal("Run on a busy port succeeded")
	}
	if !strings.Contains(err.Error(), "-addr") {
		t.Errorf("Run on a busy port: %v; want the -addr error first", err)
	}
}
