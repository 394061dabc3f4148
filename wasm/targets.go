package main

import (
	"evenbeat/setting/jsonx"
	"evenbeat/wasm/ui"
)

// targetsJSON returns the touch targets in CSS px as the JSON list the
// page and the browser tests read: label, x, y, w, h and whether each is a
// chosen option, as {"Label": ..., "X": ..., "Y": ..., "W": ..., "H": ...,
// "On": ...}. A number JSON cannot hold gives "".
func targetsJSON(ts []ui.Target) string {
	w := &jsonx.Writer{EscapeHTML: true}
	w.BeginArray()
	for _, t := range ts {
		w.BeginObject()
		w.Key("Label")
		w.String(t.Label)
		for _, f := range []struct {
			key string
			v   float64
		}{{"X", t.Rect.Min.X}, {"Y", t.Rect.Min.Y}, {"W", t.Rect.W()}, {"H", t.Rect.H()}} {
			w.Key(f.key)
			w.Float(f.v)
		}
		w.Key("On")
		w.Bool(t.On)
		w.EndObject()
	}
	w.EndArray()
	b, _ := w.Bytes()
	return string(b)
}
