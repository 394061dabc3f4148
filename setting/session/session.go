package session

import (
	"math"

	"evenbeat/setting"
)

// Format is the value of the file's "format" field.
const Format = "evenbeat-session"

// Version is the session file version this package writes. It reads this
// version and every older one (version 1 is version 2 without
// "plan_aims"); files of a newer version are refused, never half-read.
const Version = 2

// Session is one engine being set: its profile (geometry, what can be
// adjusted and how, how it is measured) and the readings of every cylinder,
// round by round. Lengths are mm, angles degrees.
type Session struct {
	// Name is the user's title for the session ("Autumn overhaul").
	Name string
	// Invented marks demo data: an engine and readings that are made up.
	Invented bool
	// Note is free text.
	Note string
	// DisplayUnit is how lengths are shown and entered; the file always
	// stores mm.
	DisplayUnit Unit
	// Engine is the whole engine as designed: crank geometry, valve and
	// ports, gear, running notches. Cylinders may differ from it (see
	// Cylinder.Differences).
	Engine setting.EngineSpec
	// Measuring describes the wheel, gauge and marks used for the readings.
	Measuring Measuring
	// Adjustments lists what this engine allows to be changed, with limits
	// and the threads and sheaves the changes are made with. The same list
	// serves every cylinder.
	Adjustments []Adjustment
	// Aims are what the setter asks of the plan (file version 2 on); the
	// zero value asks for the plan's defaults.
	Aims PlanAims
	// Cylinders holds each cylinder's dead centres and rounds of readings.
	Cylinders []Cylinder
	// EngineChanges is the history of the engine: every value of the
	// profile (engine, adjustments, measuring set-up, display unit)
	// changed since set-up, oldest first (see Edit).
	EngineChanges []EngineChange
}

// PlanAims are the setter's choices for the plan, kept with the readings so
// that the plan made the next time the session is opened is the same. The
// zero value chooses nothing: the plan's defaults.
type PlanAims struct {
	// Priority is what the plan makes equal front against back:
	// PriorityLeads, PriorityCutOffs or PriorityBalanced; empty when not
	// chosen (equal leads).
	Priority Priority
	// TargetLeadMM, when set, is the lead wanted at both ends in full gear
	// (mm; zero is line and line).
	TargetLeadMM *float64
	// LeadShare is the share of the balance given to leads, more than 0 and
	// at most 1, with PriorityBalanced; 0 when not chosen (one half).
	LeadShare float64
	// RunningNotch names the notch whose cut-offs an equal cut-offs plan
	// makes equal: "full forward" or one of the engine's notches; empty
	// for the engine's first notch.
	RunningNotch string
}

// Bounds of PlanAims.TargetLeadMM: a lead further from zero is a typing
// slip, not an aim.
const (
	MinTargetLeadMM = -5
	MaxTargetLeadMM = 25
)

// Priority is what a plan makes equal, front against back. The values are
// the names package plan gives its priorities.
type Priority string

// The priorities a session may ask for.
const (
	PriorityLeads    Priority = "leads"    // equal leads in every planned reverser position
	PriorityCutOffs  Priority = "cut-offs" // equal cut-offs in the running notch
	PriorityBalanced Priority = "balanced" // leads weighed against cut-offs
)

// IsZero reports whether the aims choose nothing.
func (a PlanAims) IsZero() bool {
	return a.Priority == "" && a.TargetLeadMM == nil && a.LeadShare == 0 && a.RunningNotch == ""
}

// Unit is a display unit for lengths.
type Unit string

// Display units.
const (
	UnitMM   Unit = "mm"   // millimetres
	UnitInch Unit = "inch" // inches, small values shown in thou
)

// Measuring describes the measuring set-up shared by every reading.
type Measuring struct {
	// WheelDiameterMM is the diameter of the tyre where the marks are
	// measured round it (mm, on the tread).
	WheelDiameterMM float64
	// GaugeResolutionMM is the smallest division of the dial gauge (mm;
	// 0.01 for a metric gauge, 0.0254 for a thou gauge).
	GaugeResolutionMM float64
	// GaugeIncreases says which way the valve moves when the gauge reading
	// grows: GaugeFront when the reading grows as the valve moves toward the
	// front cover.
	GaugeIncreases End
	// MarkError is the estimated error of one tyre or degree mark (one
	// standard deviation), in the scale it names.
	MarkError Mark
	// DatumsMatched: every driving wheel's datum mark was made at the
	// same angle (for instance where a square from the frame meets each
	// tyre at the same height), so the dead-centre marks of the cylinders
	// give the angle between their cranks (quartering).
	DatumsMatched bool
}

// End names an end of the cylinder, a port or a dead centre.
type End string

// Ends of the cylinder.
const (
	Front End = "front" // the cylinder-cover end, ahead
	Back  End = "back"  // the gland end, toward the crank
)

// GaugeFront and GaugeBack are the values of Measuring.GaugeIncreases.
const (
	GaugeFront = Front
	GaugeBack  = Back
)

// Direction is the way the wheel was turned while a reading was taken
// (backlash is taken up by turning in the running direction of the gear
// being set).
type Direction string

// Turning directions.
const (
	Forward  Direction = "forward"
	Backward Direction = "backward"
)

// Scale names how a position round the wheel is measured.
type Scale string

// Scales of a mark round the wheel. Both grow as the wheel turns forward:
// number the tyre so that the numbers pass the fixed pointer in increasing
// order when the engine is turned forward.
const (
	// TyreMM is mm measured round the tyre from the cylinder's datum mark.
	TyreMM Scale = "tyre_mm"
	// Deg is degrees of a degree disc (or any angle scale on the axle) from
	// the cylinder's datum.
	Deg Scale = "deg"
)

// Mark is a position round the wheel, or a distance round it, on a scale.
type Mark struct {
	Scale Scale
	Value float64 // mm round the tyre or degrees, as Scale says
}

// AdjustmentKind names a part the setter can change.
type AdjustmentKind string

// Adjustment kinds and the sign of their changes. Lengths in mm, angles in
// degrees.
const (
	// ValveOnSpindle: the valve moved along its spindle (spindle nut, buckle).
	// Positive: valve moved toward the front cover.
	ValveOnSpindle AdjustmentKind = "valve_on_spindle"
	// EccentricAngle: an eccentric sheave turned on the axle. Positive: more
	// advance (turned ahead in the running direction that eccentric drives).
	EccentricAngle AdjustmentKind = "eccentric_angle"
	// EccentricRodLength: an eccentric rod lengthened (positive) or
	// shortened.
	EccentricRodLength AdjustmentKind = "eccentric_rod_length"
	// ReturnCrankAngle (Walschaerts): the return crank turned on the crank
	// pin. Positive: turned in the forward running direction.
	ReturnCrankAngle AdjustmentKind = "return_crank_angle"
	// RadiusRodLength (Walschaerts): the radius rod lengthened (positive).
	RadiusRodLength AdjustmentKind = "radius_rod_length"
	// LiftingLinkLength: the lifting link lengthened (positive).
	LiftingLinkLength AdjustmentKind = "lifting_link_length"
)

// Eccentric names one eccentric of a gear with two (Stephenson).
type Eccentric string

// Eccentrics of a Stephenson gear.
const (
	ForwardEccentric  Eccentric = "forward"
	BackwardEccentric Eccentric = "backward"
)

// Angular reports whether changes of this kind are angles (degrees) rather
// than lengths (mm).
func (k AdjustmentKind) Angular() bool {
	return k == EccentricAngle || k == ReturnCrankAngle
}

// Adjustment is one change this engine allows, its limits and how it is
// made.
type Adjustment struct {
	Kind AdjustmentKind
	// Eccentric names which eccentric, for eccentric angle and rod length
	// on a Stephenson gear; empty for gears with one eccentric.
	Eccentric Eccentric
	// Min and Max bound the change a plan may propose, measured from the
	// state of the latest round: mm, or degrees for angular kinds. Min <= 0
	// <= Max.
	Min, Max float64
	// Thread is the thread the change is made on (length kinds).
	Thread Thread
	// SheaveDiameterMM is the eccentric sheave's diameter, for turning an
	// angle into mm round its rim (EccentricAngle).
	SheaveDiameterMM float64
	// Note is free text.
	Note string
}

// Thread is a screw thread an adjustment is made on: a nut on the valve
// spindle or a rod-end thread.
type Thread struct {
	// PitchMM is the pitch in mm; zero when TPI is given.
	PitchMM float64
	// TPI is threads per inch, for a thread entered in inches; zero when
	// PitchMM is given.
	TPI float64
	// FlatsPerTurn is how many steps one turn can be divided into: 6 for a
	// hex nut, 4 for a square one, 2 for a fork end that must line up every
	// half turn.
	FlatsPerTurn int
}

// Pitch returns the thread's pitch in mm.
func (t Thread) Pitch() float64 {
	if t.TPI > 0 {
		return 25.4 / t.TPI
	}
	return t.PitchMM
}

// Turns returns how many turns of the thread move a part by mm (signed as
// mm).
func (t Thread) Turns(mm float64) float64 {
	return mm / t.Pitch()
}

// Step returns the smallest change the thread can make, in mm: the pitch
// over the flats per turn (0.7 mm / 6 = 0.117 mm for a hex nut on an M4
// thread).
func (t Thread) Step() float64 {
	return t.Pitch() / float64(t.FlatsPerTurn)
}

// Flats returns mm as a whole number of flats (steps of Step), rounded to
// the nearest, signed as mm.
func (t Thread) Flats(mm float64) int {
	return int(math.Round(mm / t.Step()))
}

// RimMM returns how far a mark on the rim of the eccentric sheave moves
// when the sheave is turned deg degrees on the axle: the arc deg x pi x
// SheaveDiameterMM / 360, signed as deg.
func (a Adjustment) RimMM(deg float64) float64 {
	return deg * math.Pi * a.SheaveDiameterMM / 360
}

// Cylinder is one cylinder: its dead centres and its rounds of readings.
type Cylinder struct {
	// Name is unique in the session: "left", "right", "middle"...
	Name string
	// Differences is how this cylinder differs from the engine as a whole:
	// an RFC 7396 JSON Merge Patch of the "engine" object, parsed once as
	// the file is read and applied to Engine's values as they are whenever
	// the cylinder's engine is asked for (CylinderEngine). Empty when the
	// cylinder is as the engine says.
	Differences setting.EnginePatch
	// DeadCentres are found by bracketing tyre marks, per end and turning
	// direction.
	DeadCentres []DeadCentre
	// Rounds are the rounds of readings, oldest first.
	Rounds []Round
	// Note is free text.
	Note string
}

// DeadCentre is a dead centre found from two bracketing marks: the marks
// where the crosshead came to the same place on the slide bar either side
// of the end of its travel. Dead centre is midway between them.
type DeadCentre struct {
	End       End
	Direction Direction // the way the wheel was turned
	Scale     Scale     // scale of both marks
	// First and Second are the marks in the order taken.
	First, Second float64
	Note          string
}

// Round is one round of readings, taken after the adjustments listed.
type Round struct {
	// Date is when the readings were taken: "2026-11-28" or an RFC 3339
	// date and time.
	Date string
	// AdjustmentsBefore are the changes made since the previous round (for
	// the first round: since the engine was assembled, usually none).
	AdjustmentsBefore []Change
	// PortMarks are the gauge readings where each steam edge cracks; nil
	// when not taken this round (or given as Laps).
	PortMarks *PortMarks
	// Laps are the steam laps and the gauge reading at valve centre, the
	// other way to give the steam edges; nil when not given.
	Laps *Laps
	// DeadCentreReadings are gauge readings at the dead centres.
	DeadCentreReadings []DeadCentreReading
	// Sweeps are gauge readings round a turn, one reverser position each.
	Sweeps []Sweep
	// CutOffs are points where the valve just closes a steam port.
	CutOffs []CutOff
	// FeelerOpenings are port openings measured with feelers.
	FeelerOpenings []FeelerOpening
	// Note is free text.
	Note string
}

// Readings returns how many readings the round holds: dead-centre
// readings, sweep readings, cut-offs and feeler openings (port marks and
// laps not counted). A round holds at most MaxRoundReadings.
func (r Round) Readings() int {
	n := len(r.DeadCentreReadings) + len(r.CutOffs) + len(r.FeelerOpenings)
	for _, w := range r.Sweeps {
		n += len(w.Readings)
	}
	return n
}

// Change is an adjustment made before a round.
type Change struct {
	Kind      AdjustmentKind
	Eccentric Eccentric
	// Amount is the change in mm, or degrees for angular kinds, signed as
	// the kind says.
	Amount float64
	Note   string
}

// PortMarks are the dial-gauge readings at which each steam edge of the
// valve is line-on-line with its port edge ("just cracking").
type PortMarks struct {
	FrontGaugeMM float64 // front steam edge
	BackGaugeMM  float64 // back steam edge
	Note         string
}

// Laps give the steam edges as the measured steam laps and the gauge reading
// with the valve central.
type Laps struct {
	FrontMM       float64 // steam lap at the front port
	BackMM        float64 // steam lap at the back port
	CentreGaugeMM float64 // gauge reading with the valve central
	Note          string
}

// ReverserPosition is where the reverser was: a named notch, or a value
// from +1 (full forward) through 0 (mid gear) to -1 (full back).
type ReverserPosition struct {
	// Notch is the notch's name: "full forward", "mid gear", "full back",
	// or one of the engine's running notches. Empty when Value is used.
	Notch string
	// Value is the reverser position when Notch is empty.
	Value setting.Reverser
}

// Built-in notch names.
const (
	FullForward = "full forward"
	MidGear     = "mid gear"
	FullBack    = "full back"
)

// DeadCentreReading is the gauge reading with the crank on a dead centre.
type DeadCentreReading struct {
	End       End
	Reverser  ReverserPosition
	Direction Direction
	GaugeMM   float64
	Note      string
}

// Sweep is a set of gauge readings taken round a turn in one reverser
// position, usually every 15 or 30 degrees.
type Sweep struct {
	Reverser  ReverserPosition
	Direction Direction
	Readings  []SweepReading
	Note      string
}

// SweepReading is one reading of a sweep: a mark round the wheel and the
// gauge reading there.
type SweepReading struct {
	At      Mark
	GaugeMM float64
	Note    string
}

// CutOff is where the valve just closes the steam port of End (the gauge
// back at that end's port mark), given as a mark round the wheel or as the
// crosshead's distance from that end's dead-centre position.
type CutOff struct {
	End       End
	Reverser  ReverserPosition
	Direction Direction
	// At is the mark; its Scale is empty when CrossheadMM is used.
	At Mark
	// CrossheadMM is the crosshead's travel from End's dead-centre position
	// (mm along the slide bar); used when At.Scale is empty.
	CrossheadMM float64
	Note        string
}

// FeelerOpening is a port opening measured directly with feelers, a slide
// valve with the steam-chest cover off.
type FeelerOpening struct {
	Port      End // which steam port
	Reverser  ReverserPosition
	Direction Direction
	// DeadCentre is the dead centre the crank was on; empty when At is used.
	DeadCentre End
	// At is the mark round the wheel when DeadCentre is empty.
	At Mark
	// OpeningMM is the opening; negative when the port was covered by that
	// much (measured with a rule).
	OpeningMM float64
	Note      string
}
