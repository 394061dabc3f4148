package main

import (
	"bytes"
	"io"
	"math/rand/v2"
	"strings"
	"testing"
	"time"

	"evenbeat/setting/session"
	"evenbeat/setting/trial"
)

// TestPhoneOwnEngine sets up the first of the own engines (ownEngines:
// the slip eccentric, in mm) by taps in Chromium as a 390x844 phone at 3x,
// with the same script TestOwnEnginesByTaps runs natively: the gear, each
// question as the app asks it, the sheet of what was worked out, the
// cautions. The session exported then is the drawing the bench builds its
// engine to; the bench's first round is typed until the app opens its
// plan, whose words must be what `evenbeat plan` prints for the session
// exported after it, and mention nothing of the demo.
func TestPhoneOwnEngine(t *testing.T) {
	ctx := openPhone(t)
	b := &browserApp{T: t, ctx: ctx, hold: 60 * time.Millisecond}
	readyForTouch(t, ctx)
	e := ownEngines()[0]
	start := time.Now()
	setUpOwn(b, e, nil)
	setUp := b.taps
	_, data := exportSession(b)
	s, err := session.Decode(bytes.NewReader(data))
	if err != nil {
		t.Fatal(err)
	}
	pressLabel(b, "Back", true) // from the menu to the round's first reading
	wantScreen(b, "measure")
	sign := 1.0
	if s.Measuring.GaugeIncreases == session.GaugeBack {
		sign = -1
	}
	r := rand.New(rand.NewPCG(e.Seed, 1))
	eng, err := trial.FromDrawing(r, s.Engine, trial.Given{WheelMM: s.Measuring.WheelDiameterMM, ResMM: s.Measuring.GaugeResolutionMM, GaugeSign: sign, Adjustments: s.Adjustments})
	if err != nil {
		t.Fatal(err)
	}
	sim, err := eng.Session(r, trial.DeadCentresRound())
	if err != nil {
		t.Fatal(err)
	}
	typeAsked(b, roundEntries(sim, e.Inch, true))
	t.Logf("%s by %d taps (set-up %d) in %v, the export and the way back to the round besides", e.Name, b.taps, setUp, time.Since(start).Round(time.Second))
	text := waitValue[string](t, ctx, 60*time.Second, "window.evenbeatPlanText")
	if w := demoWords(text); w != "" {
		t.Errorf("the plan's words mention %q:\n%s", w, text)
	}
	file, _ := exportSession(b)
	var out bytes.Buffer
	if err := runPlan([]string{file}, &out, io.Discard); err != nil {
		t.Fatal(err)
	}
	if got, want := planSteps(text), planSteps(out.String()); len(want) == 0 || strings.Join(got, "\n") != strings.Join(want, "\n") {
		t.Errorf("the plan's steps in the browser:\n%s\nwant (evenbeat plan):\n%s\nwhole plan:\n%s", strings.Join(got, "\n"), strings.Join(want, "\n"), text)
	}
}
