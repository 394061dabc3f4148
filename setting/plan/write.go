package plan

import (
	"fmt"
	"io"
	"math"
	"strings"

	"evenbeat/setting"
	"evenbeat/setting/session"
)

// WriteText writes a plan for the setter: the steps in working order in
// workshop words, then today's events beside those predicted after the
// rounded steps, the other priority's plan, the notes and the cautions.
// Lengths are shown in unit (mm, or inches for session.UnitInch).
func WriteText(w io.Writer, p *Plan, unit session.Unit) error {
	if p == nil {
		return &setting.Error{Field: "plan", Message: "There is no plan to write."}
	}
	var b strings.Builder
	fmt.Fprintf(&b, "Plan for %s", p.Engine)
	if p.Cylinder != "" {
		fmt.Fprintf(&b, ", %s cylinder", p.Cylinder)
	}
	fmt.Fprintf(&b, " (priority: equal %s)\n\n", strings.TrimSuffix(string(p.Priority), "d"))
	if len(p.Steps) == 0 {
		b.WriteString("No change: nothing the engine allows would make it better.\n")
	}
	for i, s := range p.Steps {
		fmt.Fprintf(&b, "%d. %s\n", i+1, stepWords(s, unit))
	}
	b.WriteString("\nEvents now and after the rounded plan:\n")
	writeStates(&b, p.Now, p.After, unit)
	if p.Other != nil {
		fmt.Fprintf(&b, "\nThe other choice, equal %s:\n", p.Other.Priority)
		if len(p.Other.Steps) == 0 {
			b.WriteString("  no change\n")
		}
		for i, s := range p.Other.Steps {
			fmt.Fprintf(&b, "  %d. %s\n", i+1, stepWords(s, unit))
		}
		writeStates(&b, nil, p.Other.After, unit)
	}
	if len(p.Notes) > 0 {
		b.WriteString("\nNotes:\n")
		for _, n := range p.Notes {
			fmt.Fprintf(&b, "- %s\n", n)
		}
	}
	fmt.Fprintf(&b, "\nThe fit follows the readings to %s (root mean square).\n", fineLength(p.FitRMSMM, unit))
	b.WriteString("\nCautions:\n")
	for _, c := range p.Cautions {
		fmt.Fprintf(&b, "- %s\n", c)
	}
	_, err := io.WriteString(w, b.String())
	return err
}

// writeStates writes the event rows, now beside after when now is given.
func writeStates(b *strings.Builder, now, after []PositionState, unit session.Unit) {
	if now != nil {
		fmt.Fprintf(b, "  %-14s %-5s  %-22s %-12s   %-12s %-12s\n", "position", "end", "lead now", "cut-off now", "lead after", "cut-off after")
	} else {
		fmt.Fprintf(b, "  %-14s %-5s  %-12s %-12s\n", "position", "end", "lead after", "cut-off after")
	}
	for i, a := range after {
		for k, end := range []string{"front", "back"} {
			name := ""
			if k == 0 {
				name = a.Notch
			}
			ea := a.Front
			if k == 1 {
				ea = a.Back
			}
			if now != nil && i < len(now) {
				en := now[i].Front
				if k == 1 {
					en = now[i].Back
				}
				fmt.Fprintf(b, "  %-14s %-5s  %-22s %-12s   %-12s %-12s\n", name, end,
					length(en.LeadMM, unit)+" +/- "+strings.TrimSuffix(strings.TrimSuffix(length(math.Max(en.LeadSigmaMM, 0), unit), " mm"), " in"),
					cutWords(en), length(ea.LeadMM, unit), cutWords(ea))
			} else {
				fmt.Fprintf(b, "  %-14s %-5s  %-12s %-12s\n", name, end, length(ea.LeadMM, unit), cutWords(ea))
			}
		}
	}
}

func cutWords(e EndState) string {
	switch {
	case e.NeverOpens:
		return "never opens"
	case e.NeverCloses:
		return "never closes"
	}
	return fmt.Sprintf("%.1f %%", e.CutOffPercent)
}

func withWords(steps []Step, unit session.Unit) []Step {
	out := make([]Step, len(steps))
	for i, s := range steps {
		s.Words = stepWords(s, unit)
		out[i] = s
	}
	return out
}

// EventTable returns the event table of an engine for the events command:
// full forward, the engine's notches, mid gear and full back, each run the
// way its gear drives.
func EventTable(spec setting.EngineSpec) (setting.EventTable, error) {
	if err := spec.Validate(); err != nil {
		return setting.EventTable{}, err
	}
	g, err := spec.Gear.Gear()
	if err != nil {
		return setting.EventTable{}, err
	}
	ns := []setting.Notch{{Name: session.FullForward, Reverser: 1}}
	ns = append(ns, spec.Notches...)
	ns = append(ns, setting.Notch{Name: session.MidGear, Reverser: 0}, setting.Notch{Name: session.FullBack, Reverser: -1})
	return setting.Table(spec.Engine, spec.Valve, g, ns, nil)
}

// WriteEventsText writes an engine's event table as aligned text (see
// setting.EventTable.Format).
func WriteEventsText(w io.Writer, spec setting.EngineSpec) error {
	t, err := EventTable(spec)
	if err != nil {
		return err
	}
	return t.Format(w)
}
