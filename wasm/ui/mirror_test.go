package ui

import (
	"fmt"
	"strings"
	"testing"

	"evenbeat/render"
	"evenbeat/setting/session"
)

// TestMirrorReadsEveryScreen: on every screen of the tour (walkTour) the
// words for the page's live region hold the screen's title and every
// paragraph it shows (errors and warnings among them), the value the
// keypad is entering, and the buttons; on the plan, every step, a line
// per position and end with the plan's own leads and cut-offs now and
// after (plan.Plan.Now and After, as the plan's words round them; the
// what-if's after while one is dragged) and every note; on the rounds,
// each round's date, and for the round planned the plan's own leads and
// cut-offs per position.
func TestMirrorReadsEveryScreen(t *testing.T) {
	seen := map[Screen]bool{}
	walkTour(t, phoneW, phoneH, render.Light(), func(name string, a *App) {
		t.Helper()
		m := a.Mirror()
		v := a.layout()
		seen[a.Screen()] = true
		missing := func(what, s string) {
			if !strings.Contains(m, s) {
				t.Errorf("%s: the mirror lacks %s %q:\n%s", name, what, s, m)
			}
		}
		missing("the title", v.title)
		for _, p := range v.paras {
			missing("a paragraph", strings.Join(p.lines, " "))
		}
		if v.entry.W() > 0 {
			missing("the value entered", a.fields[a.fi].Label+":")
		}
		for _, tg := range v.targets {
			if tg.act != nil && !tg.bar {
				missing("a button", tg.Label)
			}
		}
		switch a.Screen() {
		case Plan:
			mirrorHasPlan(t, name, a, m)
		case Whole:
			if pos, ok := a.wholeBeat().chosen(); ok {
				missing("the beat's figures", render.BeatFigures(pos, a.heardGaps(pos)))
				missing("the gaps today", "Gaps between the exhausts today: "+fixed(pos.Now.Gaps[0], 1)+", ")
			}
		case History:
			for ri, r := range a.Session().Cylinders[a.cyl].Rounds {
				missing("a round", fmt.Sprintf("Round %d, %s.", ri+1, r.Date))
			}
			if a.plannedRound() < 0 {
				break
			}
			// The round planned: the plan's own leads and cut-offs.
			u := a.unit()
			for _, p := range a.plan.Now {
				missing("the round planned's position", fmt.Sprintf("%s: lead front %s, back %s; cut-off front %.1f %%, back %.1f %%.", p.Notch,
					session.FormatLength(p.Front.LeadMM, u), session.FormatLength(p.Back.LeadMM, u), p.Front.CutOffPercent, p.Back.CutOffPercent))
			}
		}
	})
	for _, s := range []Screen{Engines, Gear, Units, Sizes, Adjust, EngineSheet, Cautions, Measure, Readings, Plan, History, Menu, Where, Lead, Whole, Listen} {
		if !seen[s] {
			t.Errorf("the tour never reached %s", s)
		}
	}
}

// mirrorHasPlan checks the plan in the mirror m: the steps, each
// position's and end's lead and cut-off now and after from the plan (the
// what-if's after from its model) and the notes.
func mirrorHasPlan(t *testing.T, name string, a *App, m string) {
	t.Helper()
	sm := a.shownModel()
	p := sm.Plan
	for _, s := range p.Steps {
		if !strings.Contains(m, s.Words) {
			t.Errorf("%s: the mirror lacks the step %q", name, s.Words)
		}
	}
	for _, n := range p.Notes {
		if !strings.Contains(m, n) {
			t.Errorf("%s: the mirror lacks the note %q", name, n)
		}
	}
	u := a.unit()
	bare := func(mm float64) string { return strings.Fields(session.FormatLength(mm, u))[0] }
	for i, now := range p.Now {
		after := p.After[i]
		for k, end := range []string{"front", "back"} {
			n, af := now.Front, after.Front
			if k == 1 {
				n, af = now.Back, after.Back
			}
			leadAfter := bare(af.LeadMM)
			cutAfter := fmt.Sprintf("%.1f %%", af.CutOffPercent)
			if a.what.model != nil { // the what-if's after, from its model
				ev := sm.Positions[i].AfterEvents.Front
				if k == 1 {
					ev = sm.Positions[i].AfterEvents.Back
				}
				leadAfter, cutAfter = bare(ev.Lead), fmt.Sprintf("%.1f %%", ev.CutOff.StrokePercent)
			}
			want := fmt.Sprintf("%s, %s end: lead %s %s +/- %s now, %s %s after; cut-off %.1f %% +/- %.1f now, %s after.",
				now.Notch, end, bare(n.LeadMM), a.unitLabel(), bare(n.LeadSigmaMM), leadAfter, a.unitLabel(), n.CutOffPercent, n.CutOffSigmaPct, cutAfter)
			if !strings.Contains(m, want) {
				t.Errorf("%s: the mirror lacks %q:\n%s", name, want, m)
			}
		}
	}
	if a.what.model != nil && !strings.Contains(m, "After includes the what-if: ") {
		t.Errorf("%s: the mirror does not say that after includes the what-if", name)
	}
}
