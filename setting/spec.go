package setting

import (
	"errors"
	"fmt"
	"io"
	"math"
	"slices"
	"sort"
	"strconv"
	"strings"

	"evenbeat/setting/jsonx"
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
//	  "design": {"lead": 0.25, "derived": ["gear.walschaerts.lever.valve_pin"]},
//	  "notches": [{"name": "running", "reverser": 0.4}]
//	}
//
// "design" (optional) is what the drawing asks of the gear (the lead in
// full gear; for Stephenson gear the die's place in full gear) and which
// of the parts DerivableKeys lists were derived from it (Derive) rather
// than measured: a change of a dimension derives those again.
type EngineSpec struct {
	Name      string     `json:"name"`                // what the owner calls the engine
	Invented  bool       `json:"invented"`            // true for demo engines made up for this program
	Notes     string     `json:"notes,omitempty"`     // free text
	Engine    Engine     `json:"engine"`              // crank and cylinder
	Valve     Valve      `json:"valve"`               // valve and ports
	Gear      GearSpec   `json:"gear"`                // the valve gear
	Design    *Design    `json:"design,omitempty"`    // what the drawing asks of the gear, and which parts were derived from it; nil when not given
	Notches   []Notch    `json:"notches,omitempty"`   // named running positions of the reverser, besides full forward, mid and full back
	Cylinders []Cylinder `json:"cylinders,omitempty"` // the cylinders of this design; empty means one
}

// Bounds on an engine's lists: generous for any engine, they keep event
// tables, plans and reports small whatever the file.
const (
	// MaxNotches bounds the named notches besides full forward, mid gear
	// and full back.
	MaxNotches = 40
	// MaxCylinders bounds the cylinders of an engine (and of a session).
	MaxCylinders = 12
)

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
	if s.Design != nil {
		if err := s.Design.validate(s.Gear.Kind); err != nil {
			return within("design", err)
		}
	}
	switch {
	case len(s.Notches) > MaxNotches:
		return &Error{"notches", fmt.Sprintf("The engine has %d notches; an engine holds at most %d (the reverser positions it is run in). Keep the ones the engine is run in.", len(s.Notches), MaxNotches)}
	case len(s.Cylinders) > MaxCylinders:
		return &Error{"cylinders", fmt.Sprintf("The engine has %d cylinders; an engine holds at most %d (engines have one to four). Remove the others.", len(s.Cylinders), MaxCylinders)}
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

// engineFile is how an engine file is read: the rules the session file
// shares, with an engine file's bounds (one is a few kilobytes).
func engineFile() JSONFile {
	return JSONFile{Noun: "engine file", Kind: "an engine file", Opening: `{"name": "...", "engine": {...}, "valve": {...}, "gear": {...}}`,
		MaxBytes: 1 << 20, MaxDepth: 64}
}

// DecodeEngineSpec reads an engine spec from JSON and validates every value.
// Errors are *Error values whose Field is the key path of the value at fault
// ("valve.front.port_width", "gear.walschaerts"), with a sentence saying
// what is wrong. The file is read as JSONFile says: at most 1 MB of UTF-8
// (a byte-order mark is dropped), syntax errors with their line and column,
// a key written twice refused. A key not known is named with the nearest
// known key when it looks like a typing slip.
//
// An engine with a design ("design") may leave out what a setter does not
// measure: every part its gear derives (DerivableKeys), which is then
// derived (Derive, from the design's lead) and listed in the design's
// derived parts, and the keys with a usual value (DefaultKeys). Parts
// given are kept as written. DecodeEngineFile says which were left out.
func DecodeEngineSpec(r io.Reader) (EngineSpec, error) {
	spec, _, err := DecodeEngineFile(r)
	return spec, err
}

// DecodeEngineFile reads an engine file as DecodeEngineSpec does, and
// returns too the keys the file left out under its design, in the order
// read: the parts derived and those taken at their usual value.
func DecodeEngineFile(r io.Reader) (EngineSpec, []string, error) {
	var spec EngineSpec
	v, data, err := engineFile().Read(r)
	if err != nil {
		return spec, nil, err
	}
	if v.Kind != jsonx.Object {
		return spec, nil, &Error{"", fmt.Sprintf("An engine file is one JSON object {...}; this file holds %s.", short(data[v.Start:v.End]))}
	}
	d := specDecoder{data: data, mayOmit: leftOutKeys(v)}
	if err := d.read("", v, &spec); err != nil {
		return EngineSpec{}, nil, err
	}
	if d.wholeErr != nil {
		return EngineSpec{}, nil, d.wholeErr
	}
	if spec.Design != nil && len(d.omitted) > 0 {
		if err := completeDesigned(&spec, d.omitted); err != nil {
			return EngineSpec{}, nil, err
		}
	}
	if err := spec.Validate(); err != nil {
		return spec, nil, err
	}
	return spec, d.omitted, nil
}

// leftOutKeys returns the required keys an engine file may leave out: with
// a design (an object at "design"), the parts its gear derives and those
// with a usual value (DerivableKeys and DefaultKeys of the kind at
// "gear.kind"); none without.
func leftOutKeys(v *jsonx.Value) []string {
	if design := v.Last("design"); design == nil || design.Kind != jsonx.Object {
		return nil
	}
	kind := ""
	if g := v.Last("gear"); g != nil && g.Kind == jsonx.Object {
		if k := g.Last("kind"); k != nil && k.Kind == jsonx.String {
			kind = k.Text
		}
	}
	return append(DerivableKeys(kind), DefaultKeys(kind)...)
}

// Encode writes the spec as indented JSON, after validating it.
func (s EngineSpec) Encode(w io.Writer) error {
	if err := s.Validate(); err != nil {
		return err
	}
	b, err := s.write(&jsonx.Writer{Indent: "  ", EscapeHTML: true})
	if err != nil {
		return err
	}
	_, err = w.Write(append(b, '\n'))
	return err
}

// AppendJSON appends the spec as compact JSON, keys in the engine format's
// order, without validating it (the bytes json.Marshal gave). A number JSON
// cannot hold (NaN, an infinity) or an admission that is neither kind is an
// error.
func (s EngineSpec) AppendJSON(dst []byte) ([]byte, error) {
	b, err := s.write(&jsonx.Writer{EscapeHTML: true})
	if err != nil {
		return dst, err
	}
	return append(dst, b...), nil
}

func (s EngineSpec) write(w *jsonx.Writer) ([]byte, error) {
	writeSpecValue(w, &s)
	return w.Bytes()
}

// specField is one key of the engine format: its name, whether it is
// optional (left out when zero on writing, may be missing on reading), and
// a pointer to the Go value it holds. The tables below, one per type in
// struct order, serve both reading and writing; the json tags on the types
// say the same for encoding/json (a test keeps them agreeing).
type specField struct {
	key      string
	optional bool
	// ptr is *float64, *Reverser, *int, *bool, *string, *Admission or
	// *[]string (a leaf); a pointer to one of the structs specFields
	// lists; *[]Notch or *[]Cylinder; or **SingleEccentric, **Stephenson,
	// **Walschaerts, **Rocker or **Design (an optional object, nil when
	// absent).
	ptr any
}

// specFields lists the keys of the struct ptr points to; nil for a leaf.
func specFields(ptr any) []specField {
	switch p := ptr.(type) {
	case *EngineSpec:
		return []specField{{"name", false, &p.Name}, {"invented", false, &p.Invented}, {"notes", true, &p.Notes},
			{"engine", false, &p.Engine}, {"valve", false, &p.Valve}, {"gear", false, &p.Gear},
			{"design", true, &p.Design}, {"notches", true, &p.Notches}, {"cylinders", true, &p.Cylinders}}
	case *Design:
		return []specField{{"lead", false, &p.Lead}, {"full_gear_share", true, &p.FullGearShare},
			{"derived", true, &p.Derived}}
	case *Notch:
		return []specField{{"name", false, &p.Name}, {"reverser", false, &p.Reverser}}
	case *Cylinder:
		return []specField{{"name", false, &p.Name}, {"crank_angle", false, &p.CrankAngle}}
	case *Engine:
		return []specField{{"crank_radius", false, &p.CrankRadius}, {"rod_length", false, &p.RodLength},
			{"inclination", false, &p.Inclination}, {"offset", false, &p.Offset}}
	case *Valve:
		return []specField{{"admission", false, &p.Admission}, {"front", false, &p.Front}, {"back", false, &p.Back},
			{"liner_diameter", true, &p.LinerDiameter}}
	case *End:
		return []specField{{"steam_lap", false, &p.SteamLap}, {"exhaust_lap", false, &p.ExhaustLap},
			{"port_width", false, &p.PortWidth}, {"port_length", true, &p.PortLength}, {"holes", true, &p.Holes},
			{"hole_diameter", true, &p.HoleDiameter}}
	case *GearSpec:
		return []specField{{"kind", false, &p.Kind}, {"single_eccentric", true, &p.SingleEccentric},
			{"stephenson", true, &p.Stephenson}, {"walschaerts", true, &p.Walschaerts}}
	case *Point:
		return []specField{{"u", false, &p.U}, {"w", false, &p.W}}
	case *Eccentric:
		return []specField{{"throw", false, &p.Throw}, {"advance", false, &p.Advance}, {"rod", false, &p.Rod}}
	case *Rocker:
		return []specField{{"pivot", false, &p.Pivot}, {"drive_arm", false, &p.DriveArm},
			{"valve_arm", false, &p.ValveArm}, {"valve_rod", false, &p.ValveRod}}
	case *SingleEccentric:
		return []specField{{"eccentric", false, &p.Eccentric}, {"slip", false, &p.Slip},
			{"admission", false, &p.Admission}, {"rocker", true, &p.Rocker}, {"guide", false, &p.Guide},
			{"valve_centre_u", false, &p.ValveCentreU}}
	case *ExpansionLink:
		return []specField{{"radius", false, &p.Radius}, {"pin_spacing", false, &p.PinSpacing},
			{"suspension", false, &p.Suspension}}
	case *Stephenson:
		return []specField{{"forward", false, &p.Forward}, {"backward", false, &p.Backward},
			{"crossed", false, &p.Crossed}, {"admission", false, &p.Admission}, {"link", false, &p.Link},
			{"weighshaft", false, &p.Weighshaft}, {"reverse_arm", false, &p.ReverseArm},
			{"mid_arm_angle", false, &p.MidArmAngle}, {"arm_swing", false, &p.ArmSwing},
			{"lifting_link", false, &p.LiftingLink}, {"guide", false, &p.Guide},
			{"valve_centre_u", false, &p.ValveCentreU}}
	case *CombinationLever:
		return []specField{{"valve_pin", false, &p.ValvePin}, {"union_pin", false, &p.UnionPin}}
	case *Walschaerts:
		return []specField{{"return_crank", false, &p.ReturnCrank}, {"return_angle", false, &p.ReturnAngle},
			{"eccentric_rod", false, &p.EccentricRod}, {"trunnion", false, &p.Trunnion},
			{"link_foot", false, &p.LinkFoot}, {"link_radius", false, &p.LinkRadius},
			{"full_gear_die", false, &p.FullGearDie}, {"radius_rod", false, &p.RadiusRod},
			{"lever", false, &p.Lever}, {"union_link", false, &p.UnionLink},
			{"crosshead_arm", false, &p.CrossheadArm}, {"guide", false, &p.Guide},
			{"valve_centre_u", false, &p.ValveCentreU}}
	}
	return nil
}

// specDecoder reads a parsed engine file into Go values, checking each
// value's JSON kind and naming its key path when it is wrong.
type specDecoder struct {
	data []byte // the file, for quoting values as written
	// wholeErr is the first count (Holes) written as a whole number that
	// is not an integer literal ("1.0", "1e2"); it is reported only once
	// everything else reads, where the final decoding used to find it.
	wholeErr error
	// patch says how objects are read: as a file (notPatch), or as part
	// of an RFC 7396 merge patch (EnginePatch), merged into the values
	// there or read afresh where there is no object to merge into.
	patch patchMode
	// mayOmit lists the required keys a file may leave out (a file with
	// a design: DerivableKeys and DefaultKeys), by key path; omitted
	// collects those it did leave out.
	mayOmit, omitted []string
}

// patchMode is how specDecoder reads objects.
type patchMode int

const (
	// notPatch reads a file: every required key must be given.
	notPatch patchMode = iota
	// mergeInto keeps the value of every key the patch leaves out, takes
	// out an optional key the patch sets to null (a required one is then
	// missing), and merges an object into the object already there.
	mergeInto
	// freshObject reads an object the patch puts where there was none:
	// its null members are left out, as merging leaves them out.
	freshObject
)

// read reads v, found at path, into the value ptr points to (a specField
// ptr). A null sets a number, text, list or optional object to zero: in a
// file that is where it already is, as encoding/json leaves it; a patch's
// null takes out the value there.
func (d *specDecoder) read(path string, v *jsonx.Value, ptr any) error {
	at := func(msg string) error {
		return &Error{path, describePath(path) + " " + fmt.Sprintf(msg, short(d.data[v.Start:v.End]))}
	}
	switch p := ptr.(type) {
	case *float64:
		return d.number(v, p, at)
	case *Reverser:
		f := float64(*p)
		err := d.number(v, &f, at)
		*p = Reverser(f)
		return err
	case *int:
		var f float64
		if err := d.number(v, &f, at); err != nil {
			return err
		}
		if f != math.Trunc(f) {
			return at("must be a whole number (got %s).")
		}
		*p = 0
		if v.Kind == jsonx.Number {
			n, err := strconv.ParseInt(v.Text, 10, 0)
			if err != nil && d.wholeErr == nil {
				d.wholeErr = at("must be a whole number written without a point or exponent (got %s).")
			}
			*p = int(n)
		}
	case *bool:
		if v.Kind != jsonx.Bool && v.Kind != jsonx.Null {
			return at("must be true or false (got %s).")
		}
		*p = v.Bool
	case *string:
		if v.Kind != jsonx.String && v.Kind != jsonx.Null {
			return at("must be a quoted text (got %s).")
		}
		*p = v.Text // "" for null
	case *Admission:
		if v.Kind != jsonx.String && v.Kind != jsonx.Null {
			return at("must be a quoted word (got %s).")
		}
		if err := p.UnmarshalText([]byte(v.Text)); err != nil {
			var e *Error
			if errors.As(err, &e) {
				return &Error{path, e.Message}
			}
			return &Error{path, describePath(path) + " is not valid: " + err.Error() + "."}
		}
	case *[]Notch:
		return readList(d, path, v, p, at)
	case *[]Cylinder:
		return readList(d, path, v, p, at)
	case *[]string:
		return readList(d, path, v, p, at)
	case **SingleEccentric:
		return readOptional(d, path, v, p)
	case **Stephenson:
		return readOptional(d, path, v, p)
	case **Walschaerts:
		return readOptional(d, path, v, p)
	case **Rocker:
		return readOptional(d, path, v, p)
	case **Design:
		return readOptional(d, path, v, p)
	default:
		return d.object(path, v, specFields(ptr), at)
	}
	return nil
}

// number reads a JSON number that float64 holds, or null.
func (d *specDecoder) number(v *jsonx.Value, p *float64, at func(string) error) error {
	switch v.Kind {
	case jsonx.Null:
		*p = 0
		return nil
	case jsonx.Number:
		f, err := strconv.ParseFloat(v.Text, 64)
		if err == nil && math.Abs(f) <= maxSpecNumber {
			*p = f
			return nil
		}
		return at("is %s, far beyond any engine (lengths are in mm, angles in degrees); check the number.")
	}
	return at("must be a number (got %s).")
}

// maxSpecNumber bounds every number of an engine file: a kilometre in mm,
// or a thousand turns in degrees, is beyond any engine, so a larger number
// is a slip (and kept out of the geometry, where it would overflow).
const maxSpecNumber = 1e6

// object reads the members of an object. A key not among fields is
// refused first (a misspelt key is named as typed, with the key it looks
// like, before that key is found missing); then the members are read in
// the order of fields, the first wrong or missing one the error.
func (d *specDecoder) object(path string, v *jsonx.Value, fields []specField, at func(string) error) error {
	if v.Kind != jsonx.Object {
		return at("must be an object {...} (got %s).")
	}
	keys := make([]string, len(fields))
	for i, f := range fields {
		keys[i] = f.key
	}
	var unknown []string
	for i, k := range v.Keys {
		// A patch's null for a key that is not there takes nothing out.
		if !slices.Contains(keys, k) && (d.patch == notPatch || v.Vals[i].Kind != jsonx.Null) {
			unknown = append(unknown, k)
		}
	}
	if len(unknown) > 0 {
		sort.Slice(unknown, func(i, j int) bool { return unknown[i] < unknown[j] })
		k := unknown[0]
		if near := NearestKey(k, keys); near != "" {
			return &Error{JoinKey(path, k), fmt.Sprintf("The key %q is not known here; did you mean %q? Correct its name.", k, near)}
		}
		return &Error{JoinKey(path, k), fmt.Sprintf("The key %q is not known here; the keys here are: %s.", k, strings.Join(keys, ", "))}
	}
	for _, f := range fields {
		sub := f.key
		if path != "" {
			sub = path + "." + f.key
		}
		m := v.Last(f.key)
		// Merging, a key the patch leaves out keeps its value; a patch's
		// null takes a key out (reading it sets the value to zero).
		missing := m == nil && d.patch != mergeInto || m != nil && m.Kind == jsonx.Null && d.patch != notPatch
		if missing && !f.optional && d.patch == notPatch && slices.Contains(d.mayOmit, sub) {
			d.omitted = append(d.omitted, sub)
			continue
		}
		if missing && !f.optional {
			return &Error{sub, fmt.Sprintf("%s is missing; add %q with %s%s.", describePath(sub), f.key, valueWords(f.ptr), leftOutWords(sub))}
		}
		if m == nil {
			continue
		}
		if err := d.read(sub, m, f.ptr); err != nil {
			return err
		}
	}
	return nil
}

// valueWords says what a field holds, for a sentence asking for it.
func valueWords(ptr any) string {
	switch ptr.(type) {
	case *float64, *Reverser, *int:
		return "a number"
	case *bool:
		return "true or false"
	case *string:
		return "a text in quotes"
	case *Admission:
		return `"external" or "internal"`
	case *[]Notch, *[]Cylinder, *[]string:
		return "a list [...]"
	}
	return "an object {...}"
}

// readList reads a list of objects, or null.
func readList[T any](d *specDecoder, path string, v *jsonx.Value, list *[]T, at func(string) error) error {
	switch v.Kind {
	case jsonx.Null:
		*list = nil
		return nil
	case jsonx.Array:
	default:
		return at("must be a list [...] (got %s).")
	}
	out := make([]T, len(v.Elems))
	for i, e := range v.Elems {
		// A patch's list replaces the list there whole, read as written.
		if err := d.readAs(notPatch, fmt.Sprintf("%s[%d]", path, i), e, &out[i]); err != nil {
			return err
		}
	}
	*list = out
	return nil
}

// readOptional reads an optional object, nil for null. A patch merges
// into the object there, or reads a new one afresh.
func readOptional[T any](d *specDecoder, path string, v *jsonx.Value, p **T) error {
	if v.Kind == jsonx.Null {
		*p = nil
		return nil
	}
	x := new(T)
	if d.patch == mergeInto && *p != nil {
		// Merge into a copy: the object may be shared with the engine
		// the patch is applied to.
		*x = **p
	}
	if err := d.readAs(d.optionalMode(*p != nil), path, v, x); err != nil {
		return err
	}
	*p = x
	return nil
}

// optionalMode is how to read an optional object: a patch merges into
// the one there, else reads a new one afresh.
func (d *specDecoder) optionalMode(there bool) patchMode {
	if d.patch == mergeInto && !there {
		return freshObject
	}
	return d.patch
}

// readAs reads as read does, with objects read as mode says.
func (d *specDecoder) readAs(mode patchMode, path string, v *jsonx.Value, ptr any) error {
	saved := d.patch
	d.patch = mode
	err := d.read(path, v, ptr)
	d.patch = saved
	return err
}

// writeSpecValue writes the value ptr points to (a specField ptr) as
// encoding/json would: optional members left out when zero.
func writeSpecValue(w *jsonx.Writer, ptr any) {
	switch p := ptr.(type) {
	case *float64:
		w.Float(*p)
	case *Reverser:
		w.Float(float64(*p))
	case *int:
		w.Int(int64(*p))
	case *bool:
		w.Bool(*p)
	case *string:
		w.String(*p)
	case *Admission:
		b, err := p.MarshalText()
		if err != nil {
			w.Fail(fmt.Errorf("json: error calling MarshalText for type setting.Admission: %w", err))
		}
		w.String(string(b))
	case *[]Notch:
		writeList(w, *p)
	case *[]Cylinder:
		writeList(w, *p)
	case *[]string:
		writeList(w, *p)
	case **SingleEccentric:
		writeOptional(w, *p)
	case **Stephenson:
		writeOptional(w, *p)
	case **Walschaerts:
		writeOptional(w, *p)
	case **Rocker:
		writeOptional(w, *p)
	case **Design:
		writeOptional(w, *p)
	default:
		w.BeginObject()
		for _, f := range specFields(ptr) {
			if f.optional && isZeroSpecValue(f.ptr) {
				continue
			}
			w.Key(f.key)
			writeSpecValue(w, f.ptr)
		}
		w.EndObject()
	}
}

func writeList[T any](w *jsonx.Writer, list []T) {
	if list == nil {
		w.Null()
		return
	}
	w.BeginArray()
	for i := range list {
		writeSpecValue(w, &list[i])
	}
	w.EndArray()
}

func writeOptional[T any](w *jsonx.Writer, p *T) {
	if p == nil {
		w.Null()
		return
	}
	writeSpecValue(w, p)
}

// isZeroSpecValue reports whether an optional member is left out: zero,
// empty or nil.
func isZeroSpecValue(ptr any) bool {
	switch p := ptr.(type) {
	case *float64:
		return *p == 0
	case *int:
		return *p == 0
	case *string:
		return *p == ""
	case *[]Notch:
		return len(*p) == 0
	case *[]Cylinder:
		return len(*p) == 0
	case *[]string:
		return len(*p) == 0
	case **SingleEccentric:
		return *p == nil
	case **Stephenson:
		return *p == nil
	case **Walschaerts:
		return *p == nil
	case **Rocker:
		return *p == nil
	case **Design:
		return *p == nil
	}
	return false
}

// describePath names a value in a sentence by its last key in words and its
// whole path: "valve.front.port_width" -> "The port width
// (valve.front.port_width)".
func describePath(p string) string {
	if p == "" {
		return "The engine file"
	}
	last := p[strings.LastIndexAny(p, ".]")+1:]
	words := "The " + strings.ReplaceAll(last, "_", " ")
	switch last {
	case "":
		words = "This entry"
	case "invented", "slip", "crossed":
		// Marks: "The invented (invented)" says nothing.
		words = "The " + last + " mark"
	case "u", "w":
		words = "The " + last + " coordinate"
	}
	return words + " (" + p + ")"
}

// short quotes a JSON value as written for a message, cut to a readable
// length.
func short(raw []byte) string {
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
// anything. It checks that the engine works (WorkChecks: a port that
// never opens in full gear first, then full-gear cut-offs outside 65 to
// 85 %), the rod length in cranks, each end's exhaust clearance, and,
// when the ends are in that band, the mean full-forward-gear cut-off
// against the 75 % a miniature engine starts easily with. A spec that
// does not validate gives no warnings (Validate says what is wrong).
func (s EngineSpec) Warnings() []string {
	invalid, refusals, warnings := s.CheckWork()
	if invalid != nil {
		return nil
	}
	var w []string
	for _, err := range append(refusals, warnings...) {
		var e *Error
		if errors.As(err, &e) {
			w = append(w, e.Message)
		} else {
			w = append(w, err.Error())
		}
	}
	works := len(w) == 0
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
	if err == nil && works {
		f, b := t.Rows[0].Events.Front, t.Rows[0].Events.Back
		if !f.NeverOpens && !b.NeverOpens && !f.NeverCloses && !b.NeverCloses {
			if m := (f.CutOff.StrokePercent + b.CutOff.StrokePercent) / 2; m < fullGearCutOffMin {
				w = append(w, fmt.Sprintf("The full-gear cut-off is %.0f %% of the stroke; at least %.0f %% is usual so that the engine starts easily.", m, fullGearCutOffMin))
			}
		}
	}
	return w
}

// Clone returns a copy of s that shares nothing with it: its lists, gear
// member, rocker and design are copied, so that a change to the copy (a
// set-up edited before it is accepted) leaves s as it was.
func (s EngineSpec) Clone() EngineSpec {
	c := s
	c.Notches = slices.Clone(s.Notches)
	c.Cylinders = slices.Clone(s.Cylinders)
	if s.Design != nil {
		d := *s.Design
		d.Derived = slices.Clone(d.Derived)
		c.Design = &d
	}
	if g := s.Gear.SingleEccentric; g != nil {
		x := *g
		if g.Rocker != nil {
			r := *g.Rocker
			x.Rocker = &r
		}
		c.Gear.SingleEccentric = &x
	}
	if g := s.Gear.Stephenson; g != nil {
		x := *g
		c.Gear.Stephenson = &x
	}
	if g := s.Gear.Walschaerts; g != nil {
		x := *g
		c.Gear.Walschaerts = &x
	}
	return c
}

// Number returns the number at key, an engine-file key path such as
// "engine.rod_length" or "gear.stephenson.forward.advance" (the keys
// DerivableKeys lists among them), so that a part can be read or set by
// the key the file and the design name it by. It is nil when key names no
// number of s: a key the format does not know, a gear member or design
// not given, or a value that is not a number.
func (s *EngineSpec) Number(key string) *float64 {
	var ptr any = s
	for _, part := range strings.Split(key, ".") {
		var next any
		for _, f := range specFields(ptr) {
			if f.key == part {
				next = f.ptr
			}
		}
		switch p := next.(type) {
		case **SingleEccentric:
			next = optionalObject(p)
		case **Stephenson:
			next = optionalObject(p)
		case **Walschaerts:
			next = optionalObject(p)
		case **Rocker:
			next = optionalObject(p)
		case **Design:
			next = optionalObject(p)
		}
		if next == nil {
			return nil
		}
		ptr = next
	}
	f, _ := ptr.(*float64)
	return f
}

// optionalObject returns the object an optional member points to, or an
// untyped nil when it is absent.
func optionalObject[T any](p **T) any {
	if *p == nil {
		return nil
	}
	return *p
}
