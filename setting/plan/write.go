package plan

import (
	"encoding/json"
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

// jsonPlan is the JSON form of a plan (see the package doc).
type jsonPlan struct {
	Format  string `json:"format"`
	Version int    `json:"version"`
	Unit    string `json:"display_unit"`
	*Plan
}

// PlanFormat and PlanVersion name the JSON form WriteJSON writes.
const (
	PlanFormat  = "evenbeat-plan"
	PlanVersion = 1
)

// WriteJSON writes a plan as indented JSON: every amount signed in mm or
// degrees with its sign convention beside it, the rounded workshop form
// and words, today's and the predicted events. Lengths in the JSON are
// always mm; unit only chooses the units of the words. A value that is not
// a finite number is an error, never written.
func WriteJSON(w io.Writer, p *Plan, unit session.Unit) error {
	if p == nil {
		return &setting.Error{Field: "plan", Message: "There is no plan to write."}
	}
	q := *p
	q.Steps = withWords(p.Steps, unit)
	if p.Other != nil {
		o := *p.Other
		o.Steps = withWords(o.Steps, unit)
		q.Other = &o
	}
	if unit == "" {
		unit = session.UnitMM
	}
	data, err := json.MarshalIndent(jsonPlan{PlanFormat, PlanVersion, string(unit), &q}, "", "  ")
	if err != nil {
		return &setting.Error{Field: "plan", Message: "The plan holds a value that is not a number and cannot be written: " + err.Error()}
	}
	_, err = w.Write(append(data, '\n'))
	return err
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

// jsonEnd is one end's events in the events JSON.
type jsonEnd struct {
	LeadMM             float64 `json:"lead_mm"`
	AdmissionBeforeDeg float64 `json:"admission_before_deg"`
	AdmissionDeg       float64 `json:"admission_crank_deg"`
	CutOffPercent      float64 `json:"cut_off_percent"`
	CutOffDeg          float64 `json:"cut_off_crank_deg"`
	ReleasePercent     float64 `json:"release_percent"`
	CompressionPercent float64 `json:"compression_percent"`
	MaxOpeningMM       float64 `json:"max_opening_mm"`
	NeverOpens         bool    `json:"never_opens,omitempty"`
	NeverCloses        bool    `json:"never_closes,omitempty"`
}

type jsonRow struct {
	Notch         string  `json:"notch"`
	Reverser      float64 `json:"reverser"`
	Direction     string  `json:"direction"`
	ValveTravelMM float64 `json:"valve_travel_mm"`
	Front         jsonEnd `json:"front"`
	Back          jsonEnd `json:"back"`
}

// WriteEventsJSON writes an engine's event table as JSON:
//
//	{"format": "evenbeat-events", "version": 1, "engine": NAME,
//	 "back_dead_centre_deg": 180,
//	 "rows": [{"notch": "full forward", "reverser": 1, "direction": "forward",
//	   "valve_travel_mm": 10.1, "front": {...}, "back": {...}}]}
//
// Each end has lead_mm (+ = open at dead centre), admission_before_deg,
// admission_crank_deg and cut_off_crank_deg (crank angle from front dead
// centre, forward running), cut_off_percent, release_percent and
// compression_percent (% of the stroke from that end), max_opening_mm and
// never_opens / never_closes when so.
func WriteEventsJSON(w io.Writer, spec setting.EngineSpec) error {
	t, err := EventTable(spec)
	if err != nil {
		return err
	}
	doc := struct {
		Format   string    `json:"format"`
		Version  int       `json:"version"`
		Engine   string    `json:"engine"`
		Invented bool      `json:"invented"`
		BDC      float64   `json:"back_dead_centre_deg"`
		Rows     []jsonRow `json:"rows"`
	}{Format: "evenbeat-events", Version: 1, Engine: spec.Name, Invented: spec.Invented, BDC: clean(spec.Engine.BackDeadCentre())}
	end := func(e setting.EndEvents) jsonEnd {
		return jsonEnd{LeadMM: clean(e.Lead), AdmissionBeforeDeg: clean(e.LeadAngle), AdmissionDeg: clean(e.Admission.CrankDeg),
			CutOffPercent: clean(e.CutOff.StrokePercent), CutOffDeg: clean(e.CutOff.CrankDeg), ReleasePercent: clean(e.Release.StrokePercent),
			CompressionPercent: clean(e.Compression.StrokePercent), MaxOpeningMM: clean(e.MaxOpening), NeverOpens: e.NeverOpens, NeverCloses: e.NeverCloses}
	}
	for _, r := range t.Rows {
		doc.Rows = append(doc.Rows, jsonRow{Notch: r.Notch.Name, Reverser: float64(r.Notch.Reverser), Direction: r.Events.Direction.String(),
			ValveTravelMM: clean(r.Events.ValveTravel()), Front: end(r.Events.Front), Back: end(r.Events.Back)})
	}
	data, err := json.MarshalIndent(doc, "", "  ")
	if err != nil {
		return &setting.Error{Field: "events", Message: "The events hold a value that is not a number: " + err.Error()}
	}
	_, err = w.Write(append(data, '\n'))
	return err
}
