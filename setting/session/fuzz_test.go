package session

import (
	"bytes"
	"errors"
	"math"
	"reflect"
	"strings"
	"testing"

	"evenbeat/setting"
)

// FuzzDecode: any input gives a session or a *setting.Error, never a panic;
// an accepted session holds no NaN or Inf, writes and reads back exactly,
// and its observations, warnings and readiness are computed without NaN,
// Inf or panic. Run: go test -fuzz=FuzzDecode ./setting/session
// (add -fuzzminimizetime=5s: each run decodes and validates a whole engine,
// so minimising a large input for the default minute stalls the search).
func FuzzDecode(f *testing.F) {
	f.Add([]byte(testJSON))
	f.Add([]byte(`{"format": "evenbeat-session", "version": 2}`))
	f.Add([]byte(`{"format": "evenbeat-session", "version": 1e400}`))
	f.Add([]byte(`{"format": "evenbeat-session", "version": 1, "cylinders": [{"name": "x"}]}`))
	f.Add([]byte(strings.Replace(testJSON, `"gauge_mm": 6.9`, `"gauge_mm": 1e308`, 1)))
	f.Add([]byte(strings.Replace(testJSON, `[350.1, 10.3]`, `[99999, -99999]`, 1)))
	f.Add([]byte(strings.Replace(testJSON, `"wheel_diameter_mm": 115`, `"wheel_diameter_mm": 1e-300`, 1)))
	f.Add([]byte(`[[[[[[[[[[[[[[[[[[[[[[[[[[[[[[[[[[[[[[[[`))
	v2 := strings.Replace(testJSON, `"version": 1,`, `"version": 2,`, 1)
	f.Add([]byte(strings.Replace(v2, `"display_unit": "mm",`, `"display_unit": "mm", "plan_aims": {"priority": "balanced", "target_lead_mm": 0.2, "lead_share": 0.6, "running_notch": "full forward"},`, 1)))
	f.Add([]byte(strings.Replace(v2, `"display_unit": "mm",`, `"display_unit": "mm", "plan_aims": {"target_lead_mm": -0},`, 1)))
	f.Add([]byte(strings.TrimSuffix(strings.TrimSpace(v2), "}") + `, "engine_changes": [{"date": "2026-12-01", "key": "engine.design.derived", "before": ["a"], "after": 1.50, "derived": true}, {"date": "2026-12-01", "key": "display_unit", "before": "mm\u00e9"}]}`))
	f.Fuzz(func(t *testing.T, data []byte) {
		s, err := Decode(bytes.NewReader(data))
		if err != nil {
			var e *setting.Error
			if !errors.As(err, &e) || e.Message == "" {
				t.Fatalf("error %T %q is not a *setting.Error with a message", err, err)
			}
			if s != nil {
				t.Fatal("a session came back with the error")
			}
			return
		}
		if path, ok := allFinite(reflect.ValueOf(s), ""); !ok {
			t.Fatalf("accepted a NaN or Inf at %s", path)
		}
		var b bytes.Buffer
		if err := Encode(&b, s); err != nil {
			t.Fatalf("an accepted session cannot be written: %v", err)
		}
		again, err := Decode(bytes.NewReader(b.Bytes()))
		if err != nil {
			t.Fatalf("a written session cannot be read: %v\n%s", err, b.Bytes())
		}
		if !reflect.DeepEqual(s, again) {
			t.Fatalf("decode(encode(s)) != s")
		}
		for ci := range s.Cylinders {
			obs, err := s.Observations(ci)
			if err != nil {
				var e *setting.Error
				if !errors.As(err, &e) {
					t.Fatalf("observations error %T %v", err, err)
				}
			}
			for _, o := range obs {
				if path, ok := allFinite(reflect.ValueOf(o), "observation"); !ok {
					t.Fatalf("NaN or Inf in %s of %s", path, o.Field)
				}
			}
			_ = s.Readiness(ci)
		}
		for _, w := range s.Check() {
			if strings.Contains(w.Message, "NaN") || strings.Contains(w.Message, "Inf") {
				t.Fatalf("warning shows NaN or Inf: %s", w)
			}
		}
	})
}

// allFinite walks v and reports the first float that is NaN or Inf.
func allFinite(v reflect.Value, path string) (string, bool) {
	switch v.Kind() {
	case reflect.Float32, reflect.Float64:
		f := v.Float()
		return path, !math.IsNaN(f) && !math.IsInf(f, 0)
	case reflect.Pointer, reflect.Interface:
		if v.IsNil() {
			return "", true
		}
		return allFinite(v.Elem(), path)
	case reflect.Struct:
		for i := range v.NumField() {
			if p, ok := allFinite(v.Field(i), path+"."+v.Type().Field(i).Name); !ok {
				return p, false
			}
		}
	case reflect.Slice, reflect.Array:
		for i := range v.Len() {
			if p, ok := allFinite(v.Index(i), path+"[]"); !ok {
				return p, false
			}
		}
	}
	return "", true
}

// FuzzReadings puts arbitrary numbers into the readings of an otherwise good
// session, so that accepted sessions with odd values are explored: every
// conversion, warning and readiness check must stay free of NaN, Inf and
// panics. Run: go test -fuzz=FuzzReadings ./setting/session
func FuzzReadings(f *testing.F) {
	f.Add(115.0, 0.5, 350.1, 10.3, 2.0, 8.0, 1.8, 30.3, 44.5, 0.5, 0.01)
	f.Add(1.0, 1.5, 0.0, 0.0, 5.0, 5.0, 5.0, -99999.0, 59.999, -1.0, 10.0)
	f.Add(2500.0, 1e-9, 1e5, -1e5, -1000.0, 1000.0, 0.0, 1e5, 1e-9, 1.0, 1e-12)
	f.Fuzz(func(t *testing.T, wheel, markErr, m1, m2, pmF, pmB, g, tyre, crosshead, rev, res float64) {
		in := testJSON
		for _, r := range []struct{ from, to string }{
			{`"wheel_diameter_mm": 115`, `"wheel_diameter_mm": ` + fmtNum(wheel)},
			{`"mark_error_tyre_mm": 0.5`, `"mark_error_tyre_mm": ` + fmtNum(markErr)},
			{`"gauge_resolution_mm": 0.01`, `"gauge_resolution_mm": ` + fmtNum(res)},
			{`[350.1, 10.3]`, "[" + fmtNum(m1) + ", " + fmtNum(m2) + "]"},
			{`"front_gauge_mm": 2.0, "back_gauge_mm": 8.0`, `"front_gauge_mm": ` + fmtNum(pmF) + `, "back_gauge_mm": ` + fmtNum(pmB)},
			{`"gauge_mm": 1.8}`, `"gauge_mm": ` + fmtNum(g) + `}`},
			{`{"tyre_mm": 30.3, "gauge_mm": 3.9}`, `{"tyre_mm": ` + fmtNum(tyre) + `, "gauge_mm": ` + fmtNum(g) + `}`},
			{`"crosshead_mm": 44.5`, `"crosshead_mm": ` + fmtNum(crosshead)},
			{`"reverser": 1, "direction": "forward", "gauge_mm": 1.78`, `"reverser": ` + fmtNum(rev) + `, "direction": "forward", "gauge_mm": 1.78`},
		} {
			in = strings.Replace(in, r.from, r.to, 1)
		}
		s, err := Decode(strings.NewReader(in))
		if err != nil {
			var e *setting.Error
			if !errors.As(err, &e) {
				t.Fatalf("error %T %v", err, err)
			}
			return
		}
		for ci := range s.Cylinders {
			obs, err := s.Observations(ci)
			if err != nil {
				continue
			}
			for _, o := range obs {
				if path, ok := allFinite(reflect.ValueOf(o), "observation"); !ok {
					t.Fatalf("NaN or Inf in %s of %s", path, o.Field)
				}
				if o.HasCrank && !(o.CrankDeg >= 0 && o.CrankDeg < 360) {
					t.Fatalf("crank %v outside [0, 360) at %s", o.CrankDeg, o.Field)
				}
			}
			leads, _ := s.Leads(ci)
			for _, l := range leads {
				if path, ok := allFinite(reflect.ValueOf(l), "lead"); !ok {
					t.Fatalf("NaN or Inf in %s of %s", path, l.Field)
				}
			}
			for _, p := range s.Readiness(ci) {
				if strings.Contains(p.Message, "NaN") || strings.Contains(p.Message, "Inf") {
					t.Fatalf("problem shows NaN or Inf: %s", p)
				}
			}
		}
		for _, w := range s.Check() {
			if strings.Contains(w.Message, "NaN") || strings.Contains(w.Message, "Inf") {
				t.Fatalf("warning shows NaN or Inf: %s", w)
			}
		}
	})
}
