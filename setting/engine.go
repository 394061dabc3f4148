package setting

import (
	"fmt"
	"math"
)

// Engine is the crank and cylinder geometry of one cylinder, in mm and
// degrees.
//
// The cylinder line is the line the crosshead runs on. Its frame: u along the
// line from the axle toward the front cover, w perpendicular to it, "up"
// (toward the side the top of the wheel is on when the cylinder is level).
// Running forward the top of the wheel moves toward the front, so the crank
// pin leaves front dead centre moving down (toward -w).
//
// The JSON keys are the snake_case names below; lengths in mm, angles in
// degrees.
//
// The geometry methods (CrankPin, CrossheadU, Stroke, ...) assume a valid
// engine and work out the dead centres on every call, from a closed form;
// Prepare validates once and returns a Crank that keeps them, for loops.
type Engine struct {
	CrankRadius float64 `json:"crank_radius"` // mm, axle centre to crank-pin centre
	RodLength   float64 `json:"rod_length"`   // mm, connecting rod between centres
	Inclination float64 `json:"inclination"`  // degrees, front of the cylinder raised above level (drawing only)
	Offset      float64 `json:"offset"`       // mm, cylinder line above (+) or below (-) the axle centre, measured square to the line
}

// MaxEngineMM bounds the crank radius: 100 m, beyond any engine, so that a
// slip (a crank of 1e308) is blamed on the value typed, never on the rod
// found out of proportion with it. (The rod has no such bound: tests take
// rods kilometres long as the infinite rod of published tables.)
const MaxEngineMM = 100000

// Validate checks the geometry and names the field at fault (Field is the
// JSON key: "crank_radius", "rod_length", "offset", "inclination").
func (e Engine) Validate() error {
	switch {
	case !(e.CrankRadius > 0) || math.IsInf(e.CrankRadius, 0):
		return &Error{"crank_radius", fmt.Sprintf("The crank radius must be a positive length (got %g mm).", e.CrankRadius)}
	case e.CrankRadius > MaxEngineMM:
		return &Error{"crank_radius", fmt.Sprintf("The crank radius %g mm is larger than any engine's; give it in mm.", e.CrankRadius)}
	case !(e.RodLength > 0) || math.IsInf(e.RodLength, 0):
		return &Error{"rod_length", fmt.Sprintf("The connecting rod length must be a positive length (got %g mm).", e.RodLength)}
	case e.RodLength <= e.CrankRadius:
		return &Error{"rod_length", fmt.Sprintf("The connecting rod %g mm is shorter than the crank radius %g mm; it must be longer.", e.RodLength, e.CrankRadius)}
	case math.IsNaN(e.Offset) || math.Abs(e.Offset)+e.CrankRadius >= e.RodLength:
		return &Error{"offset", fmt.Sprintf("The cylinder offset %g mm is too large: the connecting rod %g mm cannot reach the crank pin all the way round (offset + crank radius must be less than the rod length).", e.Offset, e.RodLength)}
	case math.IsNaN(e.Inclination) || math.Abs(e.Inclination) >= 90:
		return &Error{"inclination", fmt.Sprintf("The cylinder inclination must be between -90 and 90 degrees (got %g).", e.Inclination)}
	}
	return nil
}

// CylinderEnd names one end of the cylinder: Front is the cover end (ahead),
// Back the gland end (toward the crank).
type CylinderEnd int

// The two ends of the cylinder.
const (
	Front CylinderEnd = iota // the cover end; its dead centre is crank angle 0
	Back                     // the gland end; its dead centre is BackDeadCentre()
)

// String returns "front" or "back".
func (c CylinderEnd) String() string {
	if c == Back {
		return "back"
	}
	return "front"
}

// Direction is the running direction of the engine: Forward turns the crank
// angle upward with time, Backward downward.
type Direction int

// The two running directions.
const (
	Forward  Direction = 1
	Backward Direction = -1
)

// String returns "forward" or "backward".
func (d Direction) String() string {
	if d == Backward {
		return "backward"
	}
	return "forward"
}

// validate rejects anything but Forward and Backward.
func (d Direction) validate() error {
	if d != Forward && d != Backward {
		return &Error{"direction", fmt.Sprintf("The running direction must be forward (1) or backward (-1) (got %d).", int(d))}
	}
	return nil
}

// Crank is an Engine prepared for many evaluations: its dead centres and
// stroke are worked out once, so each per-angle call costs one sine, one
// cosine and one square root. Build it with Engine.Prepare; the zero Crank
// is not usable.
type Crank struct {
	engine         Engine
	front          float64 // rotation of front dead centre, radians from the u axis
	bdc            float64 // crank angle of back dead centre, degrees
	frontU, backU  float64 // crosshead positions at the dead centres, mm
	stroke         float64 // frontU - backU
	rr, offset, ll float64 // crank radius, offset and rod length squared
}

// Prepare validates the engine and returns its prepared form.
func (e Engine) Prepare() (Crank, error) {
	if err := e.Validate(); err != nil {
		return Crank{}, err
	}
	return e.prepare(), nil
}

// prepare builds the Crank without validating.
//
// The dead centres come from the geometry, exactly: at front dead centre the
// crank and rod lie in one straight line, so the crosshead is L+R from the
// axle centre; at back dead centre the rod lies along the crank, so it is
// L-R away. With the crosshead on the line w = Offset, the crosshead
// positions are sqrt((L±R)^2 - Offset^2) and the crank points along (or
// against) the crosshead's direction from the axle. They are 180 degrees
// apart only when Offset is zero.
func (e Engine) prepare() Crank {
	r, l, off := e.CrankRadius, e.RodLength, e.Offset
	uf := math.Sqrt((l+r)*(l+r) - off*off)
	ub := math.Sqrt((l-r)*(l-r) - off*off)
	// crank pin direction (cos phi, -sin phi) is (uf, off)/(l+r) at front,
	// -(ub, off)/(l-r) at back.
	front := math.Atan2(-off, uf)
	back := math.Atan2(off, -ub)
	bdc := math.Mod((back-front)*180/math.Pi+720, 360)
	return Crank{engine: e, front: front, bdc: bdc, frontU: uf, backU: ub, stroke: uf - ub, rr: r, offset: off, ll: l * l}
}

// Engine returns the engine c was prepared from.
func (c Crank) Engine() Engine { return c.engine }

// rotation converts a crank angle in degrees from front dead centre to the
// rotation in radians from the u axis.
func (c Crank) rotation(thetaDeg float64) float64 {
	return c.front + thetaDeg*(math.Pi/180)
}

// CrankPin returns the crank-pin centre in the cylinder-line frame (mm) at
// crank angle thetaDeg (degrees from front dead centre, forward running).
func (c Crank) CrankPin(thetaDeg float64) (u, w float64) {
	s, co := math.Sincos(c.rotation(thetaDeg))
	return c.rr * co, -c.rr * s
}

// CrossheadU returns the crosshead pin's position along the cylinder line
// (mm from the foot of the perpendicular from the axle centre).
func (c Crank) CrossheadU(thetaDeg float64) float64 {
	return c.engine.crosshead(c.rotation(thetaDeg))
}

// BackDeadCentre returns the crank angle of back dead centre in degrees.
func (c Crank) BackDeadCentre() float64 { return c.bdc }

// DeadCentre returns the crank angle in degrees of the given end's dead
// centre: 0 for Front, BackDeadCentre for Back.
func (c Crank) DeadCentre(end CylinderEnd) float64 {
	if end == Back {
		return c.bdc
	}
	return 0
}

// Stroke returns the piston stroke in mm.
func (c Crank) Stroke() float64 { return c.stroke }

// DeadCentreU returns the crosshead position (mm along the cylinder line) at
// the given end's dead centre.
func (c Crank) DeadCentreU(end CylinderEnd) float64 {
	if end == Back {
		return c.backU
	}
	return c.frontU
}

// PistonFraction returns how far the piston is from its front dead-centre
// position as a fraction of the stroke: 0 at front dead centre, 1 at back.
func (c Crank) PistonFraction(thetaDeg float64) float64 {
	return (c.frontU - c.CrossheadU(thetaDeg)) / c.stroke
}

// TravelFrom returns how far the piston is from the given end's dead-centre
// position as a fraction of the stroke: 0 at that end's dead centre, 1 at
// the other. TravelFrom(Front, t) + TravelFrom(Back, t) = 1.
func (c Crank) TravelFrom(end CylinderEnd, thetaDeg float64) float64 {
	f := c.PistonFraction(thetaDeg)
	if end == Back {
		return 1 - f
	}
	return f
}

// StrokeLeaving returns the crank-angle interval [from, to] in degrees
// (0 <= from < to <= 360) swept while the piston moves away from the given
// end's dead centre when running in direction dir: the stroke that end's
// steam drives. Running forward the front stroke is [0, BackDeadCentre];
// running backward it is [BackDeadCentre, 360].
func (c Crank) StrokeLeaving(end CylinderEnd, dir Direction) (from, to float64) {
	if (end == Front) == (dir != Backward) {
		return 0, c.bdc
	}
	return c.bdc, 360
}

// CrankAngleAt is the inverse of TravelFrom: the crank angle (degrees, in
// [0, 360)) at which the piston has travelled fraction of the stroke away
// from the given end's dead centre, on the stroke leaving that end when
// running in direction dir (see StrokeLeaving). fraction is clamped to
// [0, 1]; a NaN fraction or a bad direction is an error.
//
// It is exact: the crosshead position u fixes the crank rotation phi through
// (u - R cos phi)^2 + (Offset + R sin phi)^2 = L^2, which is
// A cos phi + B sin phi = C with A = -2uR, B = 2 Offset R,
// C = L^2 - u^2 - R^2 - Offset^2; its two roots per turn are the two strokes.
func (c Crank) CrankAngleAt(fraction float64, end CylinderEnd, dir Direction) (float64, error) {
	if err := dir.validate(); err != nil {
		return 0, err
	}
	if math.IsNaN(fraction) {
		return 0, &Error{"fraction", "The piston position must be a number between 0 and 1 of the stroke (got NaN)."}
	}
	fraction = math.Max(0, math.Min(1, fraction))
	from, to := c.StrokeLeaving(end, dir)
	if c.TravelFrom(end, from) > 0.5 {
		// the interval starts at the other end's dead centre
		fraction = 1 - fraction
	}
	switch fraction {
	case 0:
		return math.Mod(from, 360), nil
	case 1:
		return math.Mod(to, 360), nil
	}
	// fraction now counts from the dead centre at "from".
	var u float64
	if from == 0 {
		u = c.frontU - fraction*c.stroke
	} else {
		u = c.backU + fraction*c.stroke
	}
	a, b := -2*u*c.rr, 2*c.offset*c.rr
	cc := c.ll - u*u - c.rr*c.rr - c.offset*c.offset
	rho := math.Hypot(a, b)
	alpha := math.Atan2(b, a)
	beta := math.Acos(math.Max(-1, math.Min(1, cc/rho)))
	best, bestDist := from, math.Inf(1)
	for _, phi := range [2]float64{alpha + beta, alpha - beta} {
		t := math.Mod((phi-c.front)*180/math.Pi+720, 360)
		// distance outside [from, to]; 0 inside
		d := math.Max(0, math.Max(from-t, t-to))
		if d < bestDist {
			best, bestDist = t, d
		}
	}
	return math.Max(from, math.Min(to, best)), nil
}

// CrankAngleAtCrosshead returns the crank angle (degrees, in [0, 360)) at
// which the crosshead stands at u (mm along the cylinder line, as
// CrossheadU) on the stroke leaving the given end's dead centre when
// running in direction dir. A position more than a micrometre outside the
// crosshead's travel is an error naming "crosshead".
func (c Crank) CrankAngleAtCrosshead(u float64, end CylinderEnd, dir Direction) (float64, error) {
	if !finiteNum(u) || u < c.backU-1e-3 || u > c.frontU+1e-3 {
		return 0, &Error{"crosshead", fmt.Sprintf("The crosshead position %g mm lies outside its travel, %.3f to %.3f mm from the axle.", u, c.backU, c.frontU)}
	}
	f := (c.frontU - u) / c.stroke
	if end == Back {
		f = 1 - f
	}
	return c.CrankAngleAt(f, end, dir)
}

// CrankPin returns the crank-pin centre in the cylinder-line frame (mm) at
// crank angle thetaDeg (degrees from front dead centre, forward running).
// For many calls on one engine use Prepare.
func (e Engine) CrankPin(thetaDeg float64) (u, w float64) {
	return e.prepare().CrankPin(thetaDeg)
}

// CrossheadU returns the crosshead pin's position along the cylinder line in
// the cylinder-line frame (mm from the foot of the perpendicular from the axle
// centre; the crosshead's w is Offset).
func (e Engine) CrossheadU(thetaDeg float64) float64 {
	return e.prepare().CrossheadU(thetaDeg)
}

// BackDeadCentre returns the crank angle of back dead centre in degrees from
// front dead centre: 180 exactly only when the cylinder line passes through
// the axle centre.
func (e Engine) BackDeadCentre() float64 {
	return e.prepare().bdc
}

// Stroke returns the piston stroke in mm (the crosshead's travel between dead
// centres: a little more than twice the crank radius when offset).
func (e Engine) Stroke() float64 {
	return e.prepare().stroke
}

// PistonFraction returns how far the piston is from its front dead-centre
// position as a fraction of the stroke: 0 at front dead centre, 1 at back.
func (e Engine) PistonFraction(thetaDeg float64) float64 {
	return e.prepare().PistonFraction(thetaDeg)
}

// TravelFrom returns how far the piston is from the given end's dead centre
// as a fraction of the stroke (see Crank.TravelFrom).
func (e Engine) TravelFrom(end CylinderEnd, thetaDeg float64) float64 {
	return e.prepare().TravelFrom(end, thetaDeg)
}

// CrankAngleAt returns the crank angle at which the piston has travelled
// fraction of the stroke from the given end's dead centre, on the stroke
// leaving that end when running in direction dir (see Crank.CrankAngleAt).
// The engine is validated first.
func (e Engine) CrankAngleAt(fraction float64, end CylinderEnd, dir Direction) (float64, error) {
	c, err := e.Prepare()
	if err != nil {
		return 0, err
	}
	return c.CrankAngleAt(fraction, end, dir)
}

// crosshead returns the crosshead position along the cylinder line (mm from
// the foot of the perpendicular from the axle) at rotation phi (radians from
// the u axis in the forward running direction).
func (e Engine) crosshead(phi float64) float64 {
	s, c := math.Sincos(phi)
	d := e.Offset + e.CrankRadius*s
	return e.CrankRadius*c + math.Sqrt(e.RodLength*e.RodLength-d*d)
}
