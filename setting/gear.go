package setting

// Reverser is a reverser position: +1 is full forward gear, 0 mid gear and
// -1 full back gear. Notches lie between. Each gear maps it to its own
// mechanism (die-block position in the link, link lift).
type Reverser float64

// Gear is a valve gear: the linkage from the crank axle to the valve.
// More gears (Baker, Joy, ...) are added by implementing Gear; the event code
// only ever sees the valve-motion function a Gear gives.
type Gear interface {
	// Kind names the gear type in the trade's words ("Walschaerts").
	Kind() string
	// Validate checks the gear's dimensions against the engine. Errors are
	// *Error values naming the field.
	Validate(e Engine) error
	// Valve returns the valve displacement in mm from its central position,
	// positive forward (toward the front cover), at crank angle thetaDeg
	// (degrees from front dead centre in the forward running direction) with
	// the reverser at r. Every call solves the linkage afresh, staying on the
	// branch the gear is assembled in. A linkage that cannot close returns an
	// *Error naming the link and the crank angle.
	Valve(e Engine, thetaDeg float64, r Reverser) (float64, error)
}

// CurveGear is a Gear that also gives its valve at many crank angles in
// one call, faster than Valve angle by angle and equal to its values to
// the linkage tolerance (ValveCurve uses it).
type CurveGear interface {
	Gear
	// ValveCurve fills out (as long as thetaDeg) with the valve
	// displacement at each crank angle with the reverser at r; errors as
	// Valve.
	ValveCurve(e Engine, thetaDeg []float64, r Reverser, out []float64) error
}

// ValveCurve fills out (as long as thetaDeg) with g's valve displacement at
// each crank angle with the reverser at r: in one call when g is a
// CurveGear, else angle by angle.
func ValveCurve(g Gear, e Engine, thetaDeg []float64, r Reverser, out []float64) error {
	if c, ok := g.(CurveGear); ok {
		return c.ValveCurve(e, thetaDeg, r, out)
	}
	for i, th := range thetaDeg {
		v, err := g.Valve(e, th, r)
		if err != nil {
			return err
		}
		out[i] = v
	}
	return nil
}

// PosedGear is a Gear that also gives the solved position of every joint,
// for drawing the motion. Pose and Valve share one solution of the linkage,
// so the drawing always shows the motion the events were found from.
type PosedGear interface {
	Gear
	// Pose returns every joint and link at crank angle thetaDeg with the
	// reverser at r, in the cylinder-line frame (mm); errors as Valve.
	Pose(e Engine, thetaDeg float64, r Reverser) (Pose, error)
}
