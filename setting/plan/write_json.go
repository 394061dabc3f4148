//go:build !js

package plan

// The JSON forms are for the command line; the browser build leaves them
// out, so encoding/json (about 100 KB of compressed WebAssembly) never
// reaches the app.

import (
	"encoding/json"
	"io"

	"evenbeat/setting"
	"evenbeat/setting/session"
)

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
