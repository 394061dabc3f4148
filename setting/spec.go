package setting

import (
	"bytes"
	"encoding"
	"encoding/json"
	"errors"
	"fmt"
	"io"
	"math"
	"reflect"
	"sort"
	"strings"
)

// EngineSpec is a whole engine as the tools read and write it: one cylinder's
// crank and cylinder geometry, its valve and its valve gear, with the
// reverser notches the engine is run in. Engines with several cylinders of
// one design list them in Cylinders.
//
// JSON: snake_case keys; every length in mm and every angle in degrees.
// Every key without "omitempty" in its tag is required, unknown keys are
// refused, so a misspelt key never passes silently. An example:
//
//	{
//	  "name": "Example",
//	  "invented": true,
//	  "engine": {"crank_radius": 38, "rod_length": 228, "inclination": 0, "offset": 0},
//	  "valve": {"admission": "external",
//	    "front": {"steam_lap": 3.2, "exhaust_lap": 0, "port_width": 3.2},
//	    "back":  {"steam_lap": 3.2, "exhaust_lap": 0, "port_width": 3.2}},
//	  "gear": {"kind": "walschaerts", "walschaerts": {...}},
//	  "notches": [{"name": "running", "reverser": 0.4}]
//	}
type EngineSpec struct {
	Name      string     `json:"name"`                // what the owner calls the engine
	Invented  bool       `json:"invented"`            // true for demo engines made up for this program
	Notes     string     `json:"notes,omitempty"`     // free text
	Engine    Engine     `json:"engine"`              // crank and cylinder
	Valve     Valve      `json:"valve"`               // valve and ports
	Gear      GearSpec   `json:"gear"`                // the valve gear
	Notches   []Notch    `json:"notches,omitempty"`   // named running positions of the reverser, besides full forward, mid and full back
	Cylinders []Cylinder `json:"cylinders,omitempty"` // the cylinders of this design; empty means one
}

// Notch is a named reverser position ("running notch", "25 %").
type Notch struct {
	Name     string   `json:"name"`
	Reverser Reverser `json:"reverser"` // +1 full forward, 0 mid gear, -1 full back
}

// Cylinder names one of an engine's cylinders of the same design.
type Cylinder struct {
	Name string `json:"name"` // "left", "right", "middle"
	// CrankAngle is how far this cylinder's crank leads the first
	// cylinder's in the forward running direction, degrees (90 for the
	// second of a quartered pair, or -90 when it follows).
	CrankAngle float64 `json:"crank_angle"`
}

// The gear kinds of GearSpec.Kind.
const (
	KindSingleEccentric = "single-eccentric"
	KindStephenson      = "stephenson"
	KindWalschaerts     = "walschaerts"
)

// GearSpec is the valve gear as a tagged union: Kind says which gear, and
// the member of that name (and only that one) holds its dimensions.
//
//	{"kind": "single-eccentric", "single_eccentric": {...}}
//	{"kind": "stephenson", "stephenson": {...}}
//	{"kind": "walschaerts", "walschaerts": {...}}
type GearSpec struct {
	Kind            string           `json:"kind"`
	SingleEccentric *SingleEccentric `json:"single_eccentric,omitempty"`
	Stephenson      *Stephenson      `json:"stephenson,omitempty"`
	Walschaerts     *Walschaerts     `json:"walschaerts,omitempty"`
}

// GearSpecOf wraps a gear value in its GearSpec. Gears other than the three
// the file format knows give an error.
func GearSpecOf(g Gear) (GearSpec, error) {
	switch g := g.(type) {
	case SingleEccentric:
		return GearSpec{Kind: KindSingleEccentric, SingleEccentric: &g}, nil
	case *SingleEccentric:
		return GearSpec{Kind: KindSingleEccentric, SingleEccentric: g}, nil
	case Stephenson:
		return GearSpec{Kind: KindStephenson, Stephenson: &g}, nil
	case *Stephenson:
		return GearSpec{Kind: KindStephenson, Stephenson: g}, nil
	case Walschaerts:
		return GearSpec{Kind: KindWalschaerts, Walschaerts: &g}, nil
	case *Walschaerts:
		return GearSpec{Kind: KindWalschaerts, Walschaerts: g}, nil
	}
	return GearSpec{}, &Error{"gear.kind", fmt.Sprintf("The engine file cannot hold a %T gear.", g)}
}

// member returns the JSON key of the member Kind names, and the gear there
// (nil when absent).
func (g GearSpec) member() (key string, gear Gear, err error) {
	switch g.Kind {
	case KindSingleEccentric:
		if g.SingleEccentric != nil {
			gear = *g.SingleEccentric
		}
		key = "single_eccentric"
	case KindStephenson:
		if g.Stephenson != nil {
			gear = *g.Stephenson
		}
		key = "stephenson"
	case KindWalschaerts:
		if g.Walschaerts != nil {
			gear = *g.Walschaerts
		}
		key = "walschaerts"
	default:
		return "", nil, &Error{"kind", fmt.Sprintf("The gear kind must be %q, %q or %q (got %q).", KindSingleEccentric, KindStephenson, KindWalschaerts, g.Kind)}
	}
	return key, gear, nil
}

// Gear returns the gear the spec holds, checking that Kind names the one
// member given. Errors name the field under "gear" ("kind",
// "walschaerts").
func (g GearSpec) Gear() (Gear, error) {
	key, gear, err := g.member()
	if err != nil {
		return nil, err
	}
	if gear == nil {
		return nil, &Error{key, fmt.Sprintf("The gear kind is %q, so the gear needs a %q object with its dimensions.", g.Kind, key)}
	}
	n := 0
	for _, given := range []bool{g.SingleEccentric != nil, g.Stephenson != nil, g.Walschaerts != nil} {
		if given {
			n++
		}
	}
	if n > 1 {
		return nil, &Error{"kind", fmt.Sprintf("The gear kind is %q, so give only the %q object, not the other gears' too.", g.Kind, key)}
	}
	return gear, nil
}

// gearAdmission returns the admission a gear was laid out for, when it says.
func gearAdmission(g Gear) (Admission, bool) {
	switch g := g.(type) {
	case SingleEccentric:
		return g.Admission, true
	case Stephenson:
		return g.Admission, true
	case Walschaerts:
		if g.Lever.Inside() {
			return Internal, true
		}
		return External, true
	}
	return 0, false
}

// Validate checks every value of the spec: engine, valve, gear against the
// engine (including that its linkage closes all round), notches and
// cylinders. Error fields are key paths from the top of the spec
// ("gear.walschaerts.radius_rod" style; the gear's own checks name their
// field in words after "gear.<kind>.").
func (s EngineSpec) Validate() error {
	if strings.TrimSpace(s.Name) == "" {
		return &Error{"name", "The engine needs a name, so that its readings and plans can be told apart."}
	}
	if err := s.Engine.Validate(); err != nil {
		return within("engine", err)
	}
	if err := s.Valve.Validate(); err != nil {
		return within("valve", err)
	}
	gear, err := s.Gear.Gear()
	if err != nil {
		return within("gear", err)
	}
	key, _, _ := s.Gear.member()
	if err := gear.Validate(s.Engine); err != nil {
		return within("gear."+key, err)
	}
	if a, ok := gearAdmission(gear); ok && a != s.Valve.Admission {
		return &Error{"gear." + key, fmt.Sprintf("The gear is laid out for %s admission but the valve has %s admission; they must agree.", a, s.Valve.Admission)}
	}
	names := make([]string, len(s.Notches))
	for i, n := range s.Notches {
		names[i] = n.Name
		if !(n.Reverser >= -1 && n.Reverser <= 1) {
			return &Error{fmt.Sprintf("notches[%d].reverser", i), fmt.Sprintf("The notch %q must lie between -1 (full back) and +1 (full forward) (got %g).", n.Name, float64(n.Reverser))}
		}
	}
	if err := checkNames("notches", "notch", names); err != nil {
		return err
	}
	names = make([]string, len(s.Cylinders))
	for i, c := range s.Cylinders {
		names[i] = c.Name
		if !(math.Abs(c.CrankAngle) <= 360) {
			return &Error{fmt.Sprintf("cylinders[%d].crank_angle", i), fmt.Sprintf("The crank angle of cylinder %q must lie between -360 and 360 degrees (got %g).", c.Name, c.CrankAngle)}
		}
	}
	return checkNames("cylinders", "cylinder", names)
}

// checkNames checks that every entry of a list has a name of its own.
func checkNames(list, what string, names []string) error {
	seen := map[string]bool{}
	for i, n := range names {
		path := fmt.Sprintf("%s[%d].name", list, i)
		if strings.TrimSpace(n) == "" {
			return &Error{path, fmt.Sprintf("Every %s needs a name.", what)}
		}
		if seen[n] {
			return &Error{path, fmt.Sprintf("Two entries of %s are called %q; give each its own name.", list, n)}
		}
		seen[n] = true
	}
	return nil
}

// DecodeEngineSpec reads an engine spec from JSON and validates every value.
// Errors are *Error values whose Field is the key path of the value at fault
// ("valve.front.port_width", "gear.walschaerts"), with a sentence saying
// what is wrong.
func DecodeEngineSpec(r io.Reader) (EngineSpec, error) {
	var spec EngineSpec
	data, err := io.ReadAll(r)
	if err != nil {
		return spec, &Error{"", fmt.Sprintf("The engine file could not be read: %v.", err)}
	}
	if err := checkJSON("", json.RawMessage(data), reflect.TypeOf(spec)); err != nil {
		return spec, err
	}
	if err := json.Unmarshal(data, &spec); err != nil {
		return spec, &Error{"", fmt.Sprintf("The engine file is not valid: %v.", err)}
	}
	return spec, spec.Validate()
}

// Encode writes the spec as indented JSON, after validating it.
func (s EngineSpec) Encode(w io.Writer) error {
	if err := s.Validate(); err != nil {
		return err
	}
	b, err := json.MarshalIndent(s, "", "  ")
	if err != nil {
		return err
	}
	_, err = w.Write(append(b, '\n'))
	return err
}

var textUnmarshaler = reflect.TypeFor[encoding.TextUnmarshaler]()

// checkJSON walks the raw JSON against the Go type it will be decoded into,
// so that every problem is reported with its key path: a value of the wrong
// JSON kind, an unknown key, a missing required key.
func checkJSON(path string, raw json.RawMessage, t reflect.Type) error {
	raw = bytes.TrimSpace(raw)
	at := func(msg string, args ...any) error {
		return &Error{path, describePath(path) + " " + fmt.Sprintf(msg, args...)}
	}
	if len(raw) == 0 {
		return at("is empty; it must be a JSON object.")
	}
	if t.Kind() == reflect.Pointer {
		if string(raw) == "null" {
			return nil
		}
		t = t.Elem()
	}
	if reflect.PointerTo(t).Implements(textUnmarshaler) {
		var s string
		if json.Unmarshal(raw, &s) != nil {
			return at("must be a quoted word (got %s).", short(raw))
		}
		if err := reflect.New(t).Interface().(encoding.TextUnmarshaler).UnmarshalText([]byte(s)); err != nil {
			var e *Error
			if errors.As(err, &e) {
				return &Error{path, e.Message}
			}
			return at("is not valid: %v.", err)
		}
		return nil
	}
	switch t.Kind() {
	case reflect.Float64, reflect.Float32, reflect.Int, reflect.Int64, reflect.Int32:
		var f float64
		if raw[0] == '"' || json.Unmarshal(raw, &f) != nil {
			return at("must be a number (got %s).", short(raw))
		}
		if t.Kind() != reflect.Float64 && t.Kind() != reflect.Float32 && f != math.Trunc(f) {
			return at("must be a whole number (got %s).", short(raw))
		}
	case reflect.Bool:
		var b bool
		if json.Unmarshal(raw, &b) != nil {
			return at("must be true or false (got %s).", short(raw))
		}
	case reflect.String:
		var s string
		if json.Unmarshal(raw, &s) != nil {
			return at("must be a quoted text (got %s).", short(raw))
		}
	case reflect.Slice:
		var items []json.RawMessage
		if json.Unmarshal(raw, &items) != nil {
			return at("must be a list [...] (got %s).", short(raw))
		}
		for i, it := range items {
			if err := checkJSON(fmt.Sprintf("%s[%d]", path, i), it, t.Elem()); err != nil {
				return err
			}
		}
	case reflect.Struct:
		var obj map[string]json.RawMessage
		if raw[0] != '{' || json.Unmarshal(raw, &obj) != nil {
			return at("must be an object {...} (got %s).", short(raw))
		}
		known := map[string]bool{}
		var keys []string
		for i := range t.NumField() {
			f := t.Field(i)
			name, opts, _ := strings.Cut(f.Tag.Get("json"), ",")
			if !f.IsExported() || name == "-" {
				continue
			}
			if name == "" {
				name = f.Name
			}
			known[name] = true
			keys = append(keys, name)
			sub := name
			if path != "" {
				sub = path + "." + name
			}
			v, ok := obj[name]
			if !ok {
				if !strings.Contains(opts, "omitempty") {
					return &Error{sub, describePath(sub) + " is missing; it must be given."}
				}
				continue
			}
			if err := checkJSON(sub, v, f.Type); err != nil {
				return err
			}
		}
		var unknown []string
		for k := range obj {
			if !known[k] {
				unknown = append(unknown, k)
			}
		}
		if len(unknown) > 0 {
			sort.Strings(unknown)
			sub := unknown[0]
			if path != "" {
				sub = path + "." + sub
			}
			return &Error{sub, fmt.Sprintf("The key %q is not known here; the keys here are: %s.", unknown[0], strings.Join(keys, ", "))}
		}
	}
	return nil
}

// describePath names a value in a sentence by its last key in words and its
// whole path: "valve.front.port_width" -> "The port width
// (valve.front.port_width)".
func describePath(p string) string {
	if p == "" {
		return "The engine file"
	}
	last := p[strings.LastIndexAny(p, ".]")+1:]
	if last == "" {
		last = "entry"
	}
	return "The " + strings.ReplaceAll(last, "_", " ") + " (" + p + ")"
}

// short quotes a JSON value for a message, cut to a readable length.
func short(raw json.RawMessage) string {
	s := string(raw)
	if len(s) > 40 {
		s = s[:37] + "..."
	}
	return s
}

// Plausibility limits for Warnings: typical values, used to warn and never
// to refuse.
const (
	rodCranksLow, rodCranksHigh = 4.0, 10.0 // a rod about 6 cranks long is ordinary (J. Rose, Modern Machine Shop Practice, 1888)
	exhaustClearanceMax         = 25.4 / 16 // mm: exhaust clearance seldom more than 1/16 in (common practice)
	fullGearCutOffMin           = 75.0      // %: full-gear cut-off at least 75 % in miniature for easy starting (common practice)
)

// Warnings returns sentences about values of a valid spec that lie far
// outside what is usual, for the user to confirm; it never refuses
// anything. It checks the rod length in cranks, each end's exhaust
// clearance, and the mean full-forward-gear cut-off. A spec that does not
// validate gives no warnings (Validate says what is wrong).
func (s EngineSpec) Warnings() []string {
	if s.Validate() != nil {
		return nil
	}
	var w []string
	if k := s.Engine.RodLength / s.Engine.CrankRadius; k < rodCranksLow || k > rodCranksHigh {
		w = append(w, fmt.Sprintf("The connecting rod is %.1f cranks long; about 6 is usual. Check the rod length and crank radius.", k))
	}
	for _, end := range [2]CylinderEnd{Front, Back} {
		if c := -s.Valve.End(end).ExhaustLap; c > exhaustClearanceMax {
			w = append(w, fmt.Sprintf("The %s exhaust clearance is %.2f mm; more than %.1f mm is unusual. Check the sign of the exhaust lap (negative means clearance).", end, c, exhaustClearanceMax))
		}
	}
	g, _ := s.Gear.Gear()
	t, err := Table(s.Engine, s.Valve, g, []Notch{{"full forward", 1}}, []Direction{Forward})
	if err == nil {
		f, b := t.Rows[0].Events.Front, t.Rows[0].Events.Back
		if !f.NeverOpens && !b.NeverOpens && !f.NeverCloses && !b.NeverCloses {
			if m := (f.CutOff.StrokePercent + b.CutOff.StrokePercent) / 2; m < fullGearCutOffMin {
				w = append(w, fmt.Sprintf("The full-gear cut-off is %.0f %% of the stroke; at least %.0f %% is usual so that the engine starts easily.", m, fullGearCutOffMin))
			}
		}
	}
	return w
}
