package main

import (
	"context"
	"errors"
	"flag"
	"fmt"
	"io"
	"net"
	"net/http"
	"os"
	"path/filepath"
	"strings"
	"time"

	"evenbeat/site"
)

// Main is the evenbeat command as a value: it builds the site and serves it.
// Set the fields, call Run, and Close when done; tests reuse it.
type Main struct {
	Addr     string    // listen address, e.g. 127.0.0.1:8080; port 0 picks a free port
	Src      string    // any directory inside the Evenbeat source tree; "" means the working directory
	CacheDir string    // where app builds are kept; "" means os.UserCacheDir()/evenbeat
	Log      io.Writer // progress messages; nil discards them

	// URL is the address the site is served at, set by Run.
	URL string

	toolchain *toolchain // nil means find one (tests may set it)
	server    *http.Server
	served    chan error
}

func (m *Main) log() io.Writer {
	if m.Log == nil {
		return io.Discard
	}
	return m.Log
}

// Bundle builds the complete site from the sources.
func (m *Main) Bundle() (*bundle, error) {
	src := m.Src
	if src == "" {
		src = "."
	}
	root, err := moduleRoot(src)
	if err != nil {
		return nil, err
	}
	tc := m.toolchain
	if tc == nil {
		t, err := defaultFinder().find()
		if err != nil {
			return nil, err
		}
		tc = &t
	}
	cache := m.CacheDir
	if cache == "" {
		base, err := os.UserCacheDir()
		if err != nil {
			return nil, fmt.Errorf("finding a cache directory for app builds: %w", err)
		}
		cache = filepath.Join(base, "evenbeat")
	}
	wasm, err := tc.buildWasm(root, cache, m.log())
	if err != nil {
		return nil, err
	}
	wasmExec, err := os.ReadFile(tc.wasmExecPath())
	if err != nil {
		return nil, fmt.Errorf("reading wasm_exec.js of the Go toolchain: %w", err)
	}
	icons := map[string][]byte{}
	for _, size := range iconSizes() {
		png, err := drawIcon(size)
		if err != nil {
			return nil, err
		}
		icons[fmt.Sprintf("icon-%d.png", size)] = png
	}
	return assembleSite(site.Files, wasm, wasmExec, icons)
}

// Run builds the site, starts listening on Addr and serves in the
// background; URL is set when it returns without error.
func (m *Main) Run() error {
	// Listen first: a busy port is reported at once, not after a build.
	ln, err := listen(m.Addr)
	if err != nil {
		return err
	}
	b, err := m.Bundle()
	if err != nil {
		ln.Close()
		return err
	}
	m.URL = "http://" + ln.Addr().String() + "/"
	m.server = &http.Server{Handler: b, ReadHeaderTimeout: 10 * time.Second}
	m.served = make(chan error, 1)
	go func() { m.served <- m.server.Serve(ln) }()
	return nil
}

// Close stops the server at once, dropping open connections.
func (m *Main) Close() error {
	if m.server == nil {
		return nil
	}
	err := m.server.Close()
	if serr := <-m.served; serr != nil && !errors.Is(serr, http.ErrServerClosed) && err == nil {
		err = serr
	}
	m.server = nil
	return err
}

// listen opens addr, explaining a refusal in terms of the -addr flag.
func listen(addr string) (net.Listener, error) {
	if addr == "" {
		addr = defaultAddr
	}
	ln, err := net.Listen("tcp", addr)
	if err != nil {
		return nil, fmt.Errorf("cannot listen on %s (flag -addr): %v. Another program may be using that port; "+
			"stop it or choose another address, e.g. -addr 127.0.0.1:8081", addr, err)
	}
	return ln, nil
}

const defaultAddr = "127.0.0.1:8080"

const usage = `usage:
  evenbeat serve [-addr 127.0.0.1:8080] [-src DIR]   build the app and serve it
  evenbeat build -o DIR [-src DIR]                    write the app as static files for any HTTPS host
  evenbeat plan [-json] [flags] SESSION.json           fit the readings and print what to adjust
  evenbeat events [-json] ENGINE.json                  print the valve-event table of an engine
  evenbeat report SESSION.json -o report.pdf           write the report: .pdf A4 pages, .png one tall picture
  evenbeat listen [-beats 4] [-session S.json] REC.wav print the beat heard in a recording of the exhaust
Flags may come before or after the file.
`

// run is the command line: it parses args and runs one subcommand until ctx
// is done (serve) or the work is finished (build).
func run(ctx context.Context, args []string, stdout, stderr io.Writer) error {
	if len(args) == 0 {
		fmt.Fprint(stderr, usage)
		return errors.New("no command given; use serve, build, plan, events, report or listen")
	}
	switch args[0] {
	case "serve":
		fs := flag.NewFlagSet("serve", flag.ContinueOnError)
		fs.SetOutput(stderr)
		m := &Main{Log: stderr}
		fs.StringVar(&m.Addr, "addr", defaultAddr, "address to listen on (host:port)")
		fs.StringVar(&m.Src, "src", ".", "directory inside the Evenbeat source tree")
		if err := parseFlags(fs, args[1:]); err != nil {
			return err
		}
		if err := m.Run(); err != nil {
			return err
		}
		fmt.Fprintf(stdout, "Evenbeat is served at %s (Ctrl+C stops)\n", m.URL)
		select {
		case <-ctx.Done():
		case err := <-m.served:
			m.served <- err
		}
		return m.Close()
	case "build":
		fs := flag.NewFlagSet("build", flag.ContinueOnError)
		fs.SetOutput(stderr)
		m := &Main{Log: stderr}
		out := fs.String("o", "", "output directory (required)")
		fs.StringVar(&m.Src, "src", ".", "directory inside the Evenbeat source tree")
		if err := parseFlags(fs, args[1:]); err != nil {
			return err
		}
		if *out == "" {
			return errors.New("build needs an output directory: flag -o DIR")
		}
		b, err := m.Bundle()
		if err != nil {
			return err
		}
		if err := b.write(*out); err != nil {
			return err
		}
		fmt.Fprintf(stdout, "Evenbeat (%s) written to %s; host it over HTTPS and open it once on the phone to keep it offline\n", b.Version, *out)
		return nil
	case "plan":
		return runPlan(args[1:], stdout, stderr)
	case "events":
		return runEvents(args[1:], stdout, stderr)
	case "report":
		return runReport(args[1:], stdout, stderr)
	case "listen":
		return runListen(args[1:], stdout, stderr)
	case "help", "-h", "-help", "--help":
		fmt.Fprint(stdout, usage)
		return nil
	}
	fmt.Fprint(stderr, usage)
	return fmt.Errorf("unknown command %q; use serve, build, plan, events, report or listen", args[0])
}

// parseFlags parses and rejects stray arguments.
func parseFlags(fs *flag.FlagSet, args []string) error {
	if err := fs.Parse(args); err != nil {
		return fmt.Errorf("%s: %w", fs.Name(), err)
	}
	if fs.NArg() > 0 {
		return fmt.Errorf("%s: unexpected argument %q (flags: %s)", fs.Name(), fs.Arg(0), flagNames(fs))
	}
	return nil
}

func flagNames(fs *flag.FlagSet) string {
	var names []string
	fs.VisitAll(func(f *flag.Flag) { names = append(names, "-"+f.Name) })
	return strings.Join(names, ", ")
}
