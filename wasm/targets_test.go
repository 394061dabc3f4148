package main

import (
	"encoding/json"
	"math"
	"testing"

	"evenbeat/render"
	"evenbeat/wasm/ui"
)

// The list is what json.Marshal wrote before (encoding/json is the
// reference): the page and the browser tests parse it.
func TestTargetsJSONAsEncodingJSON(t *testing.T) {
	type target struct {
		Label      string
		X, Y, W, H float64
		On         bool
	}
	cases := [][]ui.Target{
		nil,
		{{Label: "Next", Rect: render.Rect{Min: render.Point{X: 12.5, Y: 700}, Max: render.Point{X: 378, Y: 748.25}}}},
		{{Label: `Tom's "A & B" <set>`, Rect: render.Rect{Max: render.Point{X: 1e-7, Y: 3e21}}, On: true},
			{Label: "é\u2028", Rect: render.Rect{Min: render.Point{X: -0.1, Y: 1.0 / 3}}}},
	}
	for _, ts := range cases {
		ref := []target{}
		for _, t := range ts {
			ref = append(ref, target{t.Label, t.Rect.Min.X, t.Rect.Min.Y, t.Rect.W(), t.Rect.H(), t.On})
		}
		want, _ := json.Marshal(ref)
		if got := targetsJSON(ts); got != string(want) {
			t.Errorf("got  %s\nwant %s", got, want)
		}
	}
	bad := []ui.Target{{Label: "x", Rect: render.Rect{Max: render.Point{X: math.NaN()}}}}
	if got := targetsJSON(bad); got != "" {
		t.Errorf("NaN gave %q, want \"\"", got)
	}
}
