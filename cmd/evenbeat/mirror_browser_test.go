package main

import (
	"bytes"
	"context"
	"fmt"
	"image"
	"io"
	"os"
	"regexp"
	"strconv"
	"strings"
	"testing"
	"time"

	"github.com/chromedp/cdproto/cdp"
	"github.com/chromedp/cdproto/emulation"
	"github.com/chromedp/chromedp"

	"evenbeat/render"
	"evenbeat/wasm/ui"
)

// liveRegionJS is the text of the page's hidden live region, which
// screen readers announce (ui.App.Mirror).
const liveRegionJS = `document.getElementById("evenbeat-words").textContent`

// TestPlanInTheLiveRegion opens the demo session file on a phone held
// upright (390x844) and on its side (844x390) and reads the plan from the
// page's live region (which mirrors every screen, the list of engines
// before it too), as a screen reader would: every step, every
// position's and end's lead and cut-off now and after (with the lead's
// +/-), and every note must be those `evenbeat plan` gives for the same
// file, and the region must hold no note the command does not give.
func TestPlanInTheLiveRegion(t *testing.T) {
	if testing.Short() {
		t.Skip("browser test; drop -short to run it")
	}
	needChromium(t)
	want, text, b := demoPlanWords(t)
	m := startServer(t)
	for _, size := range [][2]int64{{phoneW, phoneH}, {phoneH, phoneW}} {
		t.Run(fmt.Sprintf("%dx%d", size[0], size[1]), func(t *testing.T) {
			ctx, closeBrowser := newBrowser(t, t.TempDir(), noTierUp())
			defer closeBrowser()
			orient := chromedp.EmulatePortrait
			if size[0] > size[1] {
				orient = chromedp.EmulateLandscape
			}
			within(t, ctx, 30*time.Second, "emulating the phone", chromedp.EmulateViewport(size[0], size[1],
				chromedp.EmulateScale(phoneScale), chromedp.EmulateMobile, chromedp.EmulateTouch, orient))
			within(t, ctx, 90*time.Second, "opening "+m.URL, chromedpNavigate(m.URL))
			waitFor(t, ctx, 90*time.Second, `window.evenbeatDrawn === "engines"`)
			if got := eval[float64](t, ctx, "innerWidth"); got != float64(size[0]) {
				t.Fatalf("the page is %v CSS px wide; want %d", got, size[0])
			}
			// Every screen is mirrored, the first too.
			waitFor(t, ctx, appAnswer, liveRegionJS+`.startsWith("Engines\n") && `+liveRegionJS+`.includes("Buttons: Brackenfold (slip eccentric) (invented demo); ")`)
			eval[bool](t, ctx, "(window.evenbeatImport("+strconv.Quote(string(b))+"), true)")
			waitFor(t, ctx, 90*time.Second, `window.evenbeatState === "plan" && window.evenbeatPlanText.includes("Plan for Brackenfold")`)
			waitFor(t, ctx, appAnswer, liveRegionJS+`.includes("Next reading: ")`)
			mirror := eval[string](t, ctx, liveRegionJS)
			for _, p := range want.check(mirror) {
				t.Error(p)
			}
			if t.Failed() {
				t.Logf("the live region:\n%s\nevenbeat plan:\n%s", mirror, text)
			}
		})
	}
}

// demoPlanWords returns what `evenbeat plan` says of the demo session
// file, read and as written, and the file.
func demoPlanWords(t *testing.T) (planWords, string, []byte) {
	t.Helper()
	var out bytes.Buffer
	if err := runPlan([]string{demoSessionFile}, &out, io.Discard); err != nil {
		t.Fatal(err)
	}
	b, err := os.ReadFile(demoSessionFile)
	if err != nil {
		t.Fatal(err)
	}
	return parsePlanText(t, out.String()), out.String(), b
}

// planWords is what `evenbeat plan` says of the plan chosen: its steps,
// its table's rows and its notes.
type planWords struct {
	unit  string
	steps []string
	rows  []planRow
	notes []string
}

// planRow is a row of the plan's table: a position's end, its lead now
// with its +/- and after, its cut-off now and after, as printed.
type planRow struct {
	position, end             string
	leadNow, sigma, leadAfter string
	cutNow, cutAfter          string
}

// planRowRE is a row of the table "Events now and after the rounded
// plan" (the position only on a position's first row).
var planRowRE = regexp.MustCompile(`^\s+(?:(\S+(?: \S+)*)\s+)?(front|back)\s+(-?[0-9.]+) (in|mm) \+/- ([0-9.]+)\s+([0-9.]+ %|never \S+)\s+(-?[0-9.]+) (?:in|mm)\s+([0-9.]+ %|never \S+)\s*$`)

// parsePlanText reads the steps, the table and the notes of the plan
// chosen from `evenbeat plan`'s words.
func parsePlanText(t *testing.T, text string) planWords {
	t.Helper()
	var w planWords
	section, position := "", ""
	for _, line := range strings.Split(text, "\n") {
		switch {
		case line == "":
			section = ""
		case strings.HasPrefix(line, "Events now and after the rounded plan"):
			section = "table"
		case line == "Notes:":
			section = "notes"
		case section == "" && len(line) > 3 && line[0] >= '1' && line[0] <= '9' && strings.Contains(line[:3], ". "):
			w.steps = append(w.steps, line)
		case section == "table":
			m := planRowRE.FindStringSubmatch(line)
			if m == nil {
				if !strings.Contains(line, "lead now") {
					t.Fatalf("a row of the plan's table not understood: %q", line)
				}
				continue
			}
			if m[1] != "" {
				position = m[1]
			}
			w.unit = m[4]
			w.rows = append(w.rows, planRow{position, m[2], m[3], m[5], m[7], m[6], m[8]})
		case section == "notes":
			w.notes = append(w.notes, strings.TrimPrefix(line, "- "))
		}
	}
	if len(w.steps) == 0 || len(w.rows) == 0 || len(w.notes) == 0 {
		t.Fatalf("evenbeat plan's words give no steps, table or notes:\n%s", text)
	}
	return w
}

// check lists what the live region's text mirror says otherwise than the
// plan's words: a step, a row or a note missing, a note too many.
func (w planWords) check(mirror string) []string {
	var problems []string
	for _, s := range w.steps {
		if !strings.Contains(mirror, s+"\n") {
			problems = append(problems, "the live region lacks the step "+strconv.Quote(s))
		}
	}
	pct := func(v string) string { return regexp.QuoteMeta(v) }
	for _, r := range w.rows {
		re := regexp.MustCompile(regexp.QuoteMeta(fmt.Sprintf("%s, %s end: lead %s %s +/- %s now, %s %s after; cut-off %s",
			r.position, r.end, r.leadNow, w.unit, r.sigma, r.leadAfter, w.unit, r.cutNow)) +
			`(?: \+/- [0-9.]+)? now, ` + pct(r.cutAfter) + ` after\.\n`)
		if !re.MatchString(mirror) {
			problems = append(problems, fmt.Sprintf("the live region lacks %s, %s end: lead %s +/- %s now, %s after; cut-off %s now, %s after (%s)",
				r.position, r.end, r.leadNow, r.sigma, r.leadAfter, r.cutNow, r.cutAfter, w.unit))
		}
	}
	given := map[string]bool{}
	for _, n := range w.notes {
		given[n] = true
		if !strings.Contains(mirror, "- "+n+"\n") && !strings.Contains(mirror, "Next reading: "+n+"\n") {
			problems = append(problems, "the live region lacks the note "+strconv.Quote(n))
		}
	}
	_, notes, _ := strings.Cut(mirror, "\nNotes:\n")
	for _, line := range strings.Split(notes, "\n") {
		if n, ok := strings.CutPrefix(line, "- "); ok && !given[n] {
			problems = append(problems, "the live region has a note evenbeat plan does not give: "+strconv.Quote(n))
		}
	}
	return problems
}

// TestThemeFollowsTheOS: the page's colour scheme turned dark while the
// app runs (as a phone's does at dusk) turns the app's theme dark at once,
// without a reload: evenbeatTheme says so and the canvas's ground, light
// before, is drawn in the dark theme's background; back to light, light
// again.
func TestThemeFollowsTheOS(t *testing.T) {
	if testing.Short() {
		t.Skip("browser test; drop -short to run it")
	}
	needChromium(t)
	m := startServer(t)
	ctx, _ := newBrowser(t, t.TempDir(), noTierUp())
	scheme := func(s string) chromedp.Action[chromedp.Void] {
		return chromedp.Func(func(ctx context.Context, tg *chromedp.Target) error {
			_, err := cdp.Call(ctx, tg, emulation.SetEmulatedMedia, emulation.SetEmulatedMediaParams{
				Features: []*emulation.MediaFeature{{Name: "prefers-color-scheme", Value: s}}})
			return err
		})
	}
	within(t, ctx, 30*time.Second, "a light colour scheme", scheme("light"))
	within(t, ctx, 90*time.Second, "opening "+m.URL, chromedpNavigate(m.URL))
	waitFor(t, ctx, 90*time.Second, `window.evenbeatDrawn === "engines"`)
	for i, s := range []string{"light", "dark", "light"} {
		th := render.Light()
		if s == "dark" {
			th = render.Dark()
		}
		if i > 0 {
			draws := eval[float64](t, ctx, "window.evenbeatDraws")
			within(t, ctx, 30*time.Second, "a "+s+" colour scheme", scheme(s))
			waitFor(t, ctx, appAnswer, fmt.Sprintf(`window.evenbeatTheme === %q && window.evenbeatDraws > %v`, s, draws))
			time.Sleep(time.Second) // let the frame drawn reach the screen
		} else if got := eval[string](t, ctx, "window.evenbeatTheme"); got != s {
			t.Fatalf("evenbeatTheme = %q under a light colour scheme", got)
		}
		shot := screenshot(t, ctx, fmt.Sprintf("theme-%d-%s", i, s))
		b := shot.Bounds()
		ground := count(shot, image.Rect(0, 0, b.Dx(), b.Dy()), th.Background, 2)
		if ground < b.Dx()*b.Dy()/2 {
			t.Errorf("under a %s colour scheme %d of %d pixels are the %s theme's background %v", s, ground, b.Dx()*b.Dy(), s, th.Background)
		}
	}
}

// TestPlanWordsCheckCanFail runs the live region's check of
// TestPlanInTheLiveRegion natively, on the mirror package ui gives the
// demo session's plan as the phone does: it passes, and fails once a
// figure of the table, a step or a note is changed, or a note is added.
func TestPlanWordsCheckCanFail(t *testing.T) {
	want, _, demo := demoPlanWords(t)
	a := ui.New(ui.Options{})
	a.Resize(phoneW, phoneH)
	if err := a.Import(demo); err != nil {
		t.Fatal(err)
	}
	for range 3 { // the plan drawn, then its other priority's made
		a.Update()
		a.Draw(&capture{w: phoneW, h: phoneH})
	}
	mirror := a.Mirror()
	if ps := want.check(mirror); len(ps) > 0 {
		t.Fatalf("natively, the mirror differs from evenbeat plan: %v\n%s", ps, mirror)
	}
	r := want.rows[len(want.rows)-1]
	for what, bad := range map[string]string{
		"a lead after": strings.Replace(mirror, r.leadAfter+" "+want.unit+" after", "9"+r.leadAfter+" "+want.unit+" after", 1),
		"a step":       strings.Replace(mirror, want.steps[0], want.steps[0]+" twice", 1),
		"a note":       strings.Replace(mirror, want.notes[0], "x"+want.notes[0], 1),
		"a note added": strings.Replace(mirror, "\nNotes:\n", "\nNotes:\n- Oil the motion.\n", 1),
	} {
		if bad == mirror {
			t.Fatalf("%s: the change did not take", what)
		}
		if len(want.check(bad)) == 0 {
			t.Errorf("the check passes with %s changed", what)
		}
	}
}
