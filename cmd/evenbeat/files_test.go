package main

import (
	"bytes"
	"context"
	"encoding/json"
	"image/png"
	"os"
	"path/filepath"
	"strings"
	"testing"
)

const (
	demoSession = "../../testdata/sessions/brackenfold-stephenson.json"
	demoEngine  = "../../testdata/engines/brackenfold-walschaerts.json"
)

// runCmd runs the command line and returns stdout and the error.
func runCmd(t *testing.T, args ...string) (string, error) {
	t.Helper()
	var out, errOut bytes.Buffer
	err := run(context.Background(), args, &out, &errOut)
	return out.String(), err
}

func TestPlanCommandText(t *testing.T) {
	out, err := runCmd(t, "plan", demoSession)
	if err != nil {
		t.Fatal(err)
	}
	for _, want := range []string{"Plan for Brackenfold", "right cylinder", "Events now and after the rounded plan", "Cautions:"} {
		if !strings.Contains(out, want) {
			t.Errorf("plan text lacks %q:\n%s", want, out)
		}
	}
	if strings.Contains(out, "NaN") || strings.Contains(out, "Inf") {
		t.Errorf("plan text holds a non-number:\n%s", out)
	}
}

func TestPlanCommandJSON(t *testing.T) {
	out, err := runCmd(t, "plan", "-json", "-cylinder", "LEFT", "-priority", "cut-offs", demoSession)
	if err != nil {
		t.Fatal(err)
	}
	var p struct {
		Cylinder string            `json:"cylinder"`
		Priority string            `json:"priority"`
		Steps    []json.RawMessage `json:"steps"`
	}
	if err := json.Unmarshal([]byte(out), &p); err != nil {
		t.Fatalf("plan -json is not JSON: %v\n%s", err, out)
	}
	if p.Cylinder != "left" || p.Priority != "cut-offs" {
		t.Errorf("cylinder %q priority %q, want left and cut-offs (flags not applied)", p.Cylinder, p.Priority)
	}
}

func TestEventsCommand(t *testing.T) {
	out, err := runCmd(t, "events", demoEngine)
	if err != nil {
		t.Fatal(err)
	}
	if !strings.Contains(out, "full forward") || !strings.Contains(out, "cut-off") {
		t.Errorf("events text lacks the table:\n%s", out)
	}
	js, err := runCmd(t, "events", "-json", demoSession)
	if err != nil {
		t.Fatal(err)
	}
	var tab struct {
		Format string            `json:"format"`
		Rows   []json.RawMessage `json:"rows"`
	}
	if err := json.Unmarshal([]byte(js), &tab); err != nil || tab.Format != "evenbeat-events" || len(tab.Rows) == 0 {
		t.Errorf("events -json of a session file: %v, %+v", err, tab)
	}
}

func TestReportCommand(t *testing.T) {
	out := filepath.Join(t.TempDir(), "report.png")
	if _, err := runCmd(t, "report", demoSession, "-o", out); err != nil {
		t.Fatal(err)
	}
	f, err := os.Open(out)
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	cfg, err := png.DecodeConfig(f)
	if err != nil {
		t.Fatalf("report is not a PNG: %v", err)
	}
	if cfg.Width != 960 || cfg.Height < 2*cfg.Width {
		t.Errorf("report is %dx%d px, want 960 px wide and tall", cfg.Width, cfg.Height)
	}
	if _, err := os.Stat(out + ".part"); !os.IsNotExist(err) {
		t.Errorf("temporary file left behind: %v", err)
	}
}

// Bad input names the flag or file at fault and writes nothing.
func TestFileCommandErrors(t *testing.T) {
	bad := filepath.Join(t.TempDir(), "bad.json")
	if err := os.WriteFile(bad, []byte(`{"format": "evenbeat-session", "version": 9}`), 0o644); err != nil {
		t.Fatal(err)
	}
	cases := []struct {
		name string
		args []string
		want string
	}{
		{"no file", []string{"plan"}, "needs one session file"},
		{"priority", []string{"plan", "-priority", "fast", demoSession}, "-priority"},
		{"weight", []string{"plan", "-weight", "2", demoSession}, "-weight"},
		{"unit", []string{"plan", "-unit", "cubit", demoSession}, "-unit"},
		{"cylinder", []string{"plan", "-cylinder", "middle", demoSession}, "no cylinder \"middle\""},
		{"missing", []string{"plan", "nowhere.json"}, "nowhere.json"},
		{"newer", []string{"plan", bad}, "newer"},
		{"report without -o", []string{"report", demoSession}, "-o"},
		{"events missing", []string{"events"}, "needs one engine file"},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			out, err := runCmd(t, c.args...)
			if err == nil || !strings.Contains(err.Error(), c.want) {
				t.Errorf("error %v, want one saying %q", err, c.want)
			}
			if out != "" {
				t.Errorf("wrote output on error: %q", out)
			}
		})
	}
}
