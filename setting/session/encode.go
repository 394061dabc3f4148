package session

import (
	"bytes"
	"fmt"
	"io"
	"math"
	"strconv"

	"evenbeat/setting"
)

// Encode writes s as a session file: the current format and version, keys in
// a fixed order, two-space indents, numbers in their shortest exact form,
// and fields at their zero value left out where the format allows. Decoding
// the output gives s back exactly. A value Decode would refuse (NaN or Inf,
// an unknown kind) is an error naming the field; nothing is written then.
func Encode(w io.Writer, s *Session) error {
	if s == nil {
		return userError("", "There is no session to write.")
	}
	e := &encoder{}
	root := e.session(s)
	if e.err != nil {
		return e.err
	}
	var b bytes.Buffer
	root.write(&b, "", "  ")
	b.WriteByte('\n')
	// Never write a file this version cannot read back.
	if _, err := Decode(bytes.NewReader(b.Bytes())); err != nil {
		return err
	}
	_, err := w.Write(b.Bytes())
	return err
}

// encoder builds the tree, keeping the first error.
type encoder struct {
	err *setting.Error
}

// ob builds an object node.
type ob struct {
	e    *encoder
	n    *node
	path string
}

func (e *encoder) obj(path string) ob { return ob{e, &node{kind: nodeObject}, path} }

func (o ob) put(key string, v *node) {
	o.n.keys = append(o.n.keys, key)
	o.n.vals = append(o.n.vals, v)
}

func (o ob) str(key, v string) { o.put(key, &node{kind: nodeString, text: v}) }

// optStr writes v unless it is empty.
func (o ob) optStr(key, v string) {
	if v != "" {
		o.str(key, v)
	}
}

func (o ob) num(key string, v float64) { o.put(key, o.e.num(v, joinPath(o.path, key))) }

func (e *encoder) num(v float64, path string) *node {
	if math.IsNaN(v) || math.IsInf(v, 0) {
		if e.err == nil {
			e.err = userError(path, sentence(path, fmt.Sprintf("must be a number, got %v; it cannot be written.", v)))
		}
		return &node{kind: nodeNumber, text: "0"}
	}
	return &node{kind: nodeNumber, text: fmtNum(v)}
}

// fmtNum formats a number in the shortest form that reads back exactly,
// without an exponent for ordinary sizes.
func fmtNum(v float64) string {
	if v == 0 {
		return "0" // also for -0, which reads back equal
	}
	if a := math.Abs(v); a < 1e-6 || a >= 1e21 {
		return strconv.FormatFloat(v, 'g', -1, 64)
	}
	return strconv.FormatFloat(v, 'f', -1, 64)
}

func (o ob) arr(key string, elems []*node) {
	if len(elems) > 0 {
		o.put(key, &node{kind: nodeArray, elems: elems})
	}
}

// enum checks a value against its allowed set.
func (e *encoder) enum(path, v string, allowed ...string) {
	if e.err == nil && !contains(allowed, v) {
		e.err = userError(path, sentence(path, fmt.Sprintf("must be one of %s, got %q.", quoteList(allowed), v)))
	}
}

func (o ob) enum(key, v string, allowed ...string) {
	o.e.enum(joinPath(o.path, key), v, allowed...)
	o.str(key, v)
}

func (e *encoder) session(s *Session) *node {
	o := e.obj("")
	o.str("format", Format)
	o.put("version", &node{kind: nodeNumber, text: strconv.Itoa(Version)})
	o.optStr("name", s.Name)
	if s.Invented {
		o.put("invented", &node{kind: nodeBool, b: true})
	}
	o.optStr("note", s.Note)
	o.enum("display_unit", string(s.DisplayUnit), string(UnitMM), string(UnitInch))
	eng, err := encodeTree(s.Engine)
	if err != nil {
		if e.err == nil {
			e.err = userError("engine", fmt.Sprintf("The engine cannot be written: %v.", err))
		}
		eng = &node{kind: nodeObject}
	}
	o.put("engine", eng)
	o.put("measuring", e.measuring(s.Measuring))
	var adj []*node
	for i, a := range s.Adjustments {
		adj = append(adj, e.adjustment(a, fmt.Sprintf("adjustments[%d]", i)))
	}
	o.arr("adjustments", adj)
	if !s.Aims.IsZero() {
		o.put("plan_aims", e.aims(s.Aims))
	}
	var cyl []*node
	for i, c := range s.Cylinders {
		cyl = append(cyl, e.cylinder(c, fmt.Sprintf("cylinders[%d]", i)))
	}
	o.put("cylinders", &node{kind: nodeArray, elems: cyl})
	var hist []*node
	for i, c := range s.EngineChanges {
		hist = append(hist, e.engineChange(c, fmt.Sprintf("engine_changes[%d]", i)))
	}
	o.arr("engine_changes", hist)
	return o.n
}

func (e *encoder) aims(a PlanAims) *node {
	o := e.obj("plan_aims")
	if a.Priority != "" {
		o.enum("priority", string(a.Priority), priorities...)
	}
	if a.TargetLeadMM != nil {
		o.num("target_lead_mm", *a.TargetLeadMM)
	}
	if a.LeadShare != 0 {
		o.num("lead_share", a.LeadShare)
	}
	o.optStr("running_notch", a.RunningNotch)
	return o.n
}

func (e *encoder) measuring(m Measuring) *node {
	o := e.obj("measuring")
	o.num("wheel_diameter_mm", m.WheelDiameterMM)
	o.num("gauge_resolution_mm", m.GaugeResolutionMM)
	o.enum("gauge_increases_toward", string(m.GaugeIncreases), string(Front), string(Back))
	e.enum("measuring.mark_error", string(m.MarkError.Scale), string(TyreMM), string(Deg))
	o.num("mark_error_"+string(m.MarkError.Scale), m.MarkError.Value)
	if m.DatumsMatched {
		o.put("datums_matched", &node{kind: nodeBool, b: true})
	}
	return o.n
}

func (e *encoder) adjustment(a Adjustment, path string) *node {
	o := e.obj(path)
	o.enum("kind", string(a.Kind), adjustmentKinds...)
	o.optStr("eccentric", string(a.Eccentric))
	unit := "mm"
	if a.Kind.Angular() {
		unit = "deg"
	}
	o.num("min_"+unit, a.Min)
	o.num("max_"+unit, a.Max)
	if a.Thread != (Thread{}) {
		t := e.obj(path + ".thread")
		if a.Thread.TPI != 0 {
			t.num("tpi", a.Thread.TPI)
		} else {
			t.num("pitch_mm", a.Thread.PitchMM)
		}
		t.put("flats_per_turn", &node{kind: nodeNumber, text: strconv.Itoa(a.Thread.FlatsPerTurn)})
		o.put("thread", t.n)
	}
	if a.SheaveDiameterMM != 0 {
		o.num("sheave_diameter_mm", a.SheaveDiameterMM)
	}
	o.optStr("note", a.Note)
	return o.n
}

func (e *encoder) cylinder(c Cylinder, path string) *node {
	o := e.obj(path)
	o.str("name", c.Name)
	if !c.Differences.IsEmpty() {
		p, err := parseCompact(c.Differences.JSON())
		if err != nil || p.kind != nodeObject {
			if e.err == nil {
				e.err = userError(path+".differences", "The differences must be a JSON object of the engine fields that differ.")
			}
		} else {
			o.put("differences", p)
		}
	}
	var dcs []*node
	for i, dc := range c.DeadCentres {
		p := fmt.Sprintf("%s.dead_centres[%d]", path, i)
		x := e.obj(p)
		x.enum("end", string(dc.End), string(Front), string(Back))
		x.enum("direction", string(dc.Direction), string(Forward), string(Backward))
		e.enum(p+".scale", string(dc.Scale), string(TyreMM), string(Deg))
		x.put("marks_"+string(dc.Scale), &node{kind: nodeArray, elems: []*node{e.num(dc.First, p+".first"), e.num(dc.Second, p+".second")}})
		x.optStr("note", dc.Note)
		dcs = append(dcs, x.n)
	}
	o.arr("dead_centres", dcs)
	var rounds []*node
	for i, r := range c.Rounds {
		rounds = append(rounds, e.round(r, fmt.Sprintf("%s.rounds[%d]", path, i)))
	}
	o.arr("rounds", rounds)
	o.optStr("note", c.Note)
	return o.n
}

// setting writes the reverser and direction of a reading.
func (o ob) setting(r ReverserPosition, d Direction) {
	if r.Notch != "" {
		o.str("reverser", r.Notch)
	} else {
		o.num("reverser", float64(r.Value))
	}
	o.enum("direction", string(d), string(Forward), string(Backward))
}

// mark writes a mark under its scale's key.
func (o ob) mark(m Mark) {
	o.e.enum(joinPath(o.path, "scale"), string(m.Scale), string(TyreMM), string(Deg))
	o.num(string(m.Scale), m.Value)
}

func (e *encoder) round(r Round, path string) *node {
	o := e.obj(path)
	o.str("date", r.Date)
	var ch []*node
	for i, c := range r.AdjustmentsBefore {
		x := e.obj(fmt.Sprintf("%s.adjustments_before[%d]", path, i))
		x.enum("kind", string(c.Kind), adjustmentKinds...)
		x.optStr("eccentric", string(c.Eccentric))
		if c.Kind.Angular() {
			x.num("change_deg", c.Amount)
		} else {
			x.num("change_mm", c.Amount)
		}
		x.optStr("note", c.Note)
		ch = append(ch, x.n)
	}
	o.arr("adjustments_before", ch)
	if p := r.PortMarks; p != nil {
		x := e.obj(path + ".port_marks")
		x.num("front_gauge_mm", p.FrontGaugeMM)
		x.num("back_gauge_mm", p.BackGaugeMM)
		x.optStr("note", p.Note)
		o.put("port_marks", x.n)
	}
	if l := r.Laps; l != nil {
		x := e.obj(path + ".laps")
		x.num("front_lap_mm", l.FrontMM)
		x.num("back_lap_mm", l.BackMM)
		x.num("centre_gauge_mm", l.CentreGaugeMM)
		x.optStr("note", l.Note)
		o.put("laps", x.n)
	}
	var dcr []*node
	for i, d := range r.DeadCentreReadings {
		x := e.obj(fmt.Sprintf("%s.dead_centre_readings[%d]", path, i))
		x.enum("end", string(d.End), string(Front), string(Back))
		x.setting(d.Reverser, d.Direction)
		x.num("gauge_mm", d.GaugeMM)
		x.optStr("note", d.Note)
		dcr = append(dcr, x.n)
	}
	o.arr("dead_centre_readings", dcr)
	var sw []*node
	for i, s := range r.Sweeps {
		p := fmt.Sprintf("%s.sweeps[%d]", path, i)
		x := e.obj(p)
		x.setting(s.Reverser, s.Direction)
		var rd []*node
		for j, g := range s.Readings {
			y := e.obj(fmt.Sprintf("%s.readings[%d]", p, j))
			y.mark(g.At)
			y.num("gauge_mm", g.GaugeMM)
			y.optStr("note", g.Note)
			rd = append(rd, y.n)
		}
		x.put("readings", &node{kind: nodeArray, elems: rd})
		x.optStr("note", s.Note)
		sw = append(sw, x.n)
	}
	o.arr("sweeps", sw)
	var co []*node
	for i, c := range r.CutOffs {
		x := e.obj(fmt.Sprintf("%s.cut_offs[%d]", path, i))
		x.enum("end", string(c.End), string(Front), string(Back))
		x.setting(c.Reverser, c.Direction)
		if c.At.Scale != "" {
			x.mark(c.At)
		} else {
			x.num("crosshead_mm", c.CrossheadMM)
		}
		x.optStr("note", c.Note)
		co = append(co, x.n)
	}
	o.arr("cut_offs", co)
	var fo []*node
	for i, f := range r.FeelerOpenings {
		x := e.obj(fmt.Sprintf("%s.feeler_openings[%d]", path, i))
		x.enum("port", string(f.Port), string(Front), string(Back))
		x.setting(f.Reverser, f.Direction)
		if f.DeadCentre != "" {
			x.enum("dead_centre", string(f.DeadCentre), string(Front), string(Back))
		} else {
			x.mark(f.At)
		}
		x.num("opening_mm", f.OpeningMM)
		x.optStr("note", f.Note)
		fo = append(fo, x.n)
	}
	o.arr("feeler_openings", fo)
	o.optStr("note", r.Note)
	return o.n
}
