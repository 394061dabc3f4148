package main

import (
	"bytes"
	"context"
	"encoding/json"
	"image/png"
	"math"
	"os"
	"path/filepath"
	"regexp"
	"strconv"
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
		{"weight NaN", []string{"plan", "-weight", "NaN", demoSession}, "flag -weight"},
		{"target lead NaN", []string{"plan", "-target-lead", "NaN", demoSession}, "flag -target-lead"},
		{"target lead beyond a file's", []string{"report", "-o", "x.png", "-target-lead", "26", demoSession}, "flag -target-lead"},
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

// withAims writes the demo session with its plan_aims replaced by aims (a
// JSON object) to a temporary file and returns its path.
func withAims(t *testing.T, aims string) string {
	t.Helper()
	b, err := os.ReadFile(demoSession)
	if err != nil {
		t.Fatal(err)
	}
	i := bytes.Index(b, []byte("\n  \"plan_aims\": {"))
	j := bytes.Index(b, []byte("\n  \"cylinders\": ["))
	if i < 0 || j < i {
		t.Fatal("the demo session has no plan_aims before its cylinders")
	}
	out := append(append(append([]byte{}, b[:i]...), "\n  \"plan_aims\": "+aims+","...), b[j:]...)
	path := filepath.Join(t.TempDir(), "aims.json")
	if err := os.WriteFile(path, out, 0o644); err != nil {
		t.Fatal(err)
	}
	return path
}

// TestPlanAimsFromFile: without -priority and -target-lead the plan takes
// the file's plan_aims; the flags override them; the demo session's aims
// (the defaults written out) plan as its version 1 copy, which has none.
func TestPlanAimsFromFile(t *testing.T) {
	aimed := withAims(t, `{"priority": "cut-offs", "target_lead_mm": 0.3}`)
	plan := func(args ...string) string {
		t.Helper()
		out, err := runCmd(t, append([]string{"plan", "-json", "-cylinder", "left"}, args...)...)
		if err != nil {
			t.Fatalf("plan %q: %v", args, err)
		}
		return out
	}
	fromFile := plan(aimed)
	byFlags := plan("-priority", "cut-offs", "-target-lead", "0.3", demoSession)
	if fromFile != byFlags {
		t.Errorf("the file's aims plan otherwise than the same aims as flags:\n%s\n---\n%s", fromFile, byFlags)
	}
	if !strings.Contains(fromFile, `"priority": "cut-offs"`) {
		t.Errorf("the file's priority was not used:\n%s", fromFile)
	}
	overridden := plan("-priority", "leads", "-target-lead", "-1", aimed)
	plain := plan(demoSession)
	if overridden != plain {
		t.Errorf("-priority leads -target-lead -1 did not override the file's aims:\n%s\n---\n%s", overridden, plain)
	}
	if plain == fromFile {
		t.Error("the aims change nothing in the plan, so this test proves nothing")
	}
	if v1 := plan("../../testdata/sessions/v1/brackenfold-stephenson.json"); v1 != plain {
		t.Errorf("the version 1 demo session plans otherwise than version 2:\n%s\n---\n%s", v1, plain)
	}
}

// TestReportAimsFromFile: the report takes the file's plan_aims too, and
// the flags override them.
func TestReportAimsFromFile(t *testing.T) {
	aimed := withAims(t, `{"priority": "balanced", "lead_share": 0.8, "target_lead_mm": 0.3}`)
	dir := t.TempDir()
	report := func(name string, args ...string) []byte {
		t.Helper()
		out := filepath.Join(dir, name)
		if _, err := runCmd(t, append([]string{"report", "-o", out, "-cylinder", "left"}, args...)...); err != nil {
			t.Fatalf("report %q: %v", args, err)
		}
		b, err := os.ReadFile(out)
		if err != nil {
			t.Fatal(err)
		}
		return b
	}
	fromFile := report("file.png", aimed)
	byFlags := report("flags.png", "-priority", "balanced", "-weight", "0.8", "-target-lead", "0.3", demoSession)
	plain := report("plain.png", demoSession)
	overridden := report("over.png", "-priority", "leads", "-target-lead", "-1", aimed)
	if !bytes.Equal(fromFile, byFlags) {
		t.Error("the report of the file's aims differs from the report of the same aims as flags")
	}
	if bytes.Equal(fromFile, plain) {
		t.Error("the aims change nothing in the report, so this test proves nothing")
	}
	if !bytes.Equal(overridden, plain) {
		t.Error("the flags did not override the file's aims in the report")
	}
}

// TestFlagsAfterTheFile: flags may follow the file, as people type them
// (`plan FILE -json`), or stand on both sides of it; each subcommand then
// writes what it writes with the flags before the file. A second file is
// refused with a sentence naming both.
func TestFlagsAfterTheFile(t *testing.T) {
	dir := t.TempDir()
	cases := []struct {
		name          string
		before, after []string
		outputs       [2]string // files the two forms write, compared too
	}{
		{"plan", []string{"plan", "-json", "-priority", "cut-offs", "-cylinder", "left", demoSession},
			[]string{"plan", demoSession, "-json", "-priority", "cut-offs", "-cylinder", "left"}, [2]string{}},
		{"plan, flags on both sides", []string{"plan", "-unit", "inch", "-target-lead=0.2", demoSession},
			[]string{"plan", "-unit", "inch", demoSession, "-target-lead=0.2"}, [2]string{}},
		{"events", []string{"events", "-json", demoEngine}, []string{"events", demoEngine, "-json"}, [2]string{}},
		{"events after --", []string{"events", "-json", demoEngine}, []string{"events", "-json", "--", demoEngine}, [2]string{}},
		{"report", []string{"report", "-dark", "-priority", "balanced", "-o", filepath.Join(dir, "before.png"), demoSession},
			[]string{"report", demoSession, "-o", filepath.Join(dir, "after.png"), "-dark", "-priority", "balanced"},
			[2]string{filepath.Join(dir, "before.png"), filepath.Join(dir, "after.png")}},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			want, err := runCmd(t, c.before...)
			if err != nil {
				t.Fatalf("%q: %v", c.before, err)
			}
			got, err := runCmd(t, c.after...)
			if err != nil {
				t.Fatalf("%q: %v", c.after, err)
			}
			if c.outputs[0] != "" {
				want = strings.ReplaceAll(want, c.outputs[0], "OUT")
				got = strings.ReplaceAll(got, c.outputs[1], "OUT")
				a, errA := os.ReadFile(c.outputs[0])
				b, errB := os.ReadFile(c.outputs[1])
				if errA != nil || errB != nil || !bytes.Equal(a, b) {
					t.Errorf("%q and %q wrote different files (%v, %v)", c.before, c.after, errA, errB)
				}
			}
			if got != want || got == "" {
				t.Errorf("%q wrote\n%s\n%q wrote\n%s", c.after, got, c.before, want)
			}
		})
	}
	for _, c := range []struct {
		args   []string
		second string
	}{
		{[]string{"plan", demoSession, demoEngine, "-json"}, demoEngine},
		{[]string{"plan", demoSession, "-json", demoEngine}, demoEngine},
		{[]string{"events", "-json", demoEngine, demoSession}, demoSession},
	} {
		out, err := runCmd(t, c.args...)
		if err == nil || !strings.Contains(err.Error(), "reads one") || !strings.Contains(err.Error(), c.second) || out != "" {
			t.Errorf("%q: error %v, output %q; want a refusal naming the second file", c.args, err, out)
		}
	}
}

// TestPlanRunsTheAppsChecks: plan and report run the checks the app runs
// before its plan. A cylinder whose readings contradict (the demo's port
// marks swapped) is refused with the reason and nothing planned or
// written; the warnings of a session that plans go to stderr.
func TestPlanRunsTheAppsChecks(t *testing.T) {
	b, err := os.ReadFile(demoSession)
	if err != nil {
		t.Fatal(err)
	}
	swapped := strings.Replace(string(b), `"front_gauge_mm": 2.6,
            "back_gauge_mm": 7.4`, `"front_gauge_mm": 7.4,
            "back_gauge_mm": 2.6`, 1)
	if swapped == string(b) {
		t.Fatal("the demo session's port marks are not as this test expects")
	}
	path := filepath.Join(t.TempDir(), "swapped.json")
	if err := os.WriteFile(path, []byte(swapped), 0o644); err != nil {
		t.Fatal(err)
	}
	png := filepath.Join(t.TempDir(), "r.png")
	for _, args := range [][]string{{"plan", path}, {"plan", "-json", path}, {"report", "-o", png, path}} {
		var out, errOut bytes.Buffer
		err := run(context.Background(), args, &out, &errOut)
		if err == nil || !strings.Contains(err.Error(), "no plan for the right cylinder") || !strings.Contains(err.Error(), "port marks are the wrong way round") {
			t.Errorf("%q: error %v, want the refusal naming the port marks", args, err)
		}
		if out.Len() > 0 {
			t.Errorf("%q: wrote %q from a blocked session", args, out.String())
		}
	}
	if _, err := os.Stat(png); !os.IsNotExist(err) {
		t.Errorf("a report was written from a blocked session (%v)", err)
	}
	var out, errOut bytes.Buffer
	if err := run(context.Background(), []string{"plan", "-cylinder", "left", demoSession}, &out, &errOut); err != nil {
		t.Fatal(err)
	}
	if !strings.Contains(errOut.String(), "evenbeat: warning: cylinders[0].rounds[0].dead_centre_readings[0]: The lead at front dead centre") ||
		!strings.Contains(errOut.String(), "evenbeat: note: cylinders[1].rounds[0]: There are no readings in back gear") {
		t.Errorf("the demo's warnings and notes are not on stderr:\n%s", errOut.String())
	}
	if strings.Contains(out.String(), "warning") {
		t.Errorf("warnings went to stdout:\n%s", out.String())
	}
}

// A session of two cylinders: plan prints the whole engine after the
// cylinder's plan, four exhausts a turn in every position both cylinders
// plan, their gaps adding to a turn; events prints an engine's beat as
// drawn when it lists its cylinders.
func TestWholeEngineText(t *testing.T) {
	out, err := runCmd(t, "plan", demoSession)
	if err != nil {
		t.Fatal(err)
	}
	i := strings.Index(out, "The whole engine")
	if i < 0 {
		t.Fatalf("plan prints no whole engine:\n%s", out)
	}
	rows := regexp.MustCompile(`(?m)^    (right|left) (front|back) +then +([0-9.]+) -> +([0-9.]+)$`).FindAllStringSubmatch(out[i:], -1)
	if len(rows) != 12 {
		t.Fatalf("%d exhaust rows, want 4 in each of 3 positions:\n%s", len(rows), out[i:])
	}
	for k := 0; k < len(rows); k += 4 {
		sum := 0.0
		for _, r := range rows[k : k+4] {
			v, _ := strconv.ParseFloat(r[3], 64)
			sum += v
		}
		if math.Abs(sum-360) > 0.3 {
			t.Errorf("the gaps of one position add to %.1f degrees, want a turn", sum)
		}
	}
	out, err = runCmd(t, "events", "../../testdata/engines/brackenfold-stephenson.json")
	if err != nil {
		t.Fatal(err)
	}
	if !strings.Contains(out, "As drawn, every cylinder alike") || strings.Count(out, " then ") != 12 {
		t.Errorf("events prints no beat as drawn:\n%s", out)
	}
}
