package main

import (
	"encoding/json"

	"evenbeat/wasm/ui"
)

// targetsJSON returns the touch targets in CSS px as the JSON list the
// page and the browser tests read: label, x, y, w, h and whether each is a
// chosen option.
func targetsJSON(ts []ui.Target) string {
	type target struct {
		Label      string
		X, Y, W, H float64
		On         bool
	}
	out := []target{}
	for _, t := range ts {
		out = append(out, target{t.Label, t.Rect.Min.X, t.Rect.Min.Y, t.Rect.W(), t.Rect.H(), t.On})
	}
	b, _ := json.Marshal(out) // strings and finite numbers always encode
	return string(b)
}
