package ui

import (
	"strconv"
	"strings"
	"testing"
)

// TestRoundCountsWhatItNeeds: a round's heading counts the readings the
// plan needs ("1 of 12"), not the optional ones a tap away under More
// readings, which count on their own ("1 of 96 more").
func TestRoundCountsWhatItNeeds(t *testing.T) {
	a := newTestApp(t, newMemStore())
	setUpOwn(t, a, "Stephenson", false, kestrel())
	need := 0
	for _, f := range a.fields {
		if !f.Optional {
			need++
		}
	}
	if need == 0 || need == len(a.fields) {
		t.Fatalf("a first round of %d readings, %d of them needed: the test needs both kinds", len(a.fields), need)
	}
	text := shown(a)
	if want := a.Field() + " (1 of " + strconv.Itoa(need) + ")"; !strings.Contains(text, want) {
		t.Errorf("the first reading's heading is not %q:\n%s", want, text)
	}
	for i, f := range a.fields {
		if f.Optional {
			a.setField(i)
			break
		}
	}
	text = shown(a)
	if want := " (1 of " + strconv.Itoa(len(a.fields)-need) + " more)"; !strings.Contains(text, want) {
		t.Errorf("the first optional reading's heading lacks %q:\n%s", want, text)
	}
}

// shown is the text on a's screen, its lines joined by spaces.
func shown(a *App) string {
	text, _ := drawText(a)
	return strings.Join(strings.Fields(text), " ")
}
