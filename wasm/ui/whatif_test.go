package ui

import (
	"strings"
	"testing"

	"evenbeat/render"
	"evenbeat/setting/plan"
	"evenbeat/setting/session"
)

// TestWhatIfWordsAsPlan: on the Steps tab a what-if change reads as the
// plan's steps do, in the session's unit: a whole number of steps is
// worded exactly as plan.StepFor words it (turns and flats, mm round the
// rim), which is the plan's own wording of its steps without the plan's
// +/-; an amount between steps gives the amount dragged in words (which
// way the part goes), then the nearest change hands can make. The model follows the amount dragged.
func TestWhatIfWordsAsPlan(t *testing.T) {
	for _, unit := range []session.Unit{session.UnitMM, session.UnitInch} {
		a := planApp(t)
		a.Session().DisplayUnit = unit
		a.makePlan()
		if a.plan == nil || len(a.plan.Steps) == 0 {
			t.Fatalf("%s: the example's plan has no steps (%q)", unit, a.planNote)
		}
		s := a.Session()
		whole := 0
		for i, st := range a.plan.Steps {
			j := adjustmentOf(s.Adjustments, st)
			if j < 0 {
				t.Fatalf("step %d changes no adjustment", i+1)
			}
			adj := s.Adjustments[j]
			// The plan's own words, as StepFor gives them.
			if w := plan.StepFor(adj, st.Amount, unit).Words; withoutSigma(st.Words) != w {
				t.Errorf("%s: plan step %q, StepFor %q", unit, st.Words, w)
			}
			// Twice the plan's change, or half of it at a limit: whole
			// steps again.
			next := plan.StepFor(adj, 2*st.Amount, unit).Amount
			if next == st.Amount {
				next = plan.StepFor(adj, st.Amount/2, unit).Amount
			}
			if next == st.Amount || next == 0 {
				continue
			}
			if err := a.SetWhatIf(i, next); err != nil {
				t.Fatal(err)
			}
			got := whatStep(t, a, adj)
			if want := "What if: " + plan.StepFor(adj, next, unit).Words; got.Words != want {
				t.Errorf("%s: whole steps worded\n %q, want\n %q", unit, got.Words, want)
			}
			if strings.Contains(got.Words, "Nearest by hand") {
				t.Errorf("%s: a whole number of steps is given twice: %q", unit, got.Words)
			}
			whole++
		}
		if whole == 0 {
			t.Errorf("%s: no plan step could be changed by whole steps", unit)
		}
		// Between steps: the amount dragged, then the nearest by hand.
		st := a.plan.Steps[0]
		adj := s.Adjustments[adjustmentOf(s.Adjustments, st)]
		step := plan.StepFor(adj, st.Amount, unit)
		if err := a.SetWhatIf(0, st.Amount*1.37); err != nil {
			t.Fatal(err)
		}
		between := a.what.amounts[adjustmentOf(s.Adjustments, st)]
		near := plan.StepFor(adj, between, unit)
		got := whatStep(t, a, adj)
		want := "What if: " + capitalise(changeWords(adj, between, unit)) + ". Nearest by hand: " + near.Words
		t.Logf("%s: %d steps changed by whole steps; between: %q", unit, whole, got.Words)
		if got.Words != want || got.Amount != between {
			t.Errorf("%s: between steps (plan %v, dragged %v):\n got %q (amount %v)\nwant %q", unit, step.Amount, between, got.Words, got.Amount, want)
		}
		if near.Turns == 0 && near.Flats == 0 && near.RimMM == 0 && near.Amount != 0 {
			t.Errorf("%s: the nearest step has neither flats nor rim mm: %+v", unit, near)
		}
		noNaN(t, a, "what-if words "+string(unit))
	}
}

// withoutSigma returns a plan step's words without the plan's "(+/- ...)"
// after the amount.
func withoutSigma(words string) string {
	i := strings.Index(words, " (+/- ")
	if i < 0 {
		return words
	}
	return words[:i] + words[i+strings.Index(words[i:], ")")+1:]
}

// whatStep returns the what-if plan's step for adj.
func whatStep(t *testing.T, a *App, adj session.Adjustment) plan.Step {
	t.Helper()
	for _, st := range a.what.plan.Steps {
		if st.Kind == adj.Kind && st.Eccentric == adj.Eccentric {
			return st
		}
	}
	t.Fatalf("the what-if plan has no step for %s", adjustmentName(adj))
	return plan.Step{}
}

// Dragging a what-if keeps the balance card's scales: today's bars do
// not seem to move while an amount changes, however far it goes.
func TestWhatIfKeepsTheBalanceScale(t *testing.T) {
	a := planApp(t)
	a.makePlan()
	if a.plan == nil || len(a.plan.Steps) == 0 {
		t.Fatalf("the example's plan has no steps (%q)", a.planNote)
	}
	lead, cut, _, _ := render.BalanceRanges(a.model)
	if err := a.SetWhatIf(0, 20*a.plan.Steps[0].Amount); err != nil {
		t.Fatal(err)
	}
	m := a.shownModel()
	if m == a.model {
		t.Fatal("the what-if made no model of its own")
	}
	l2, c2, _, _ := render.BalanceRanges(m)
	if l2 != lead || c2 != cut {
		t.Errorf("the balance scales moved with the what-if: lead +/-%g -> %g, cut-off +/-%g -> %g", lead, l2, cut, c2)
	}
	m.Scale = nil
	if l3, c3, _, _ := render.BalanceRanges(m); l3 == lead && c3 == cut {
		t.Error("the what-if's own scales equal the plan's: pick a larger amount, or the check above proves nothing")
	}
}
