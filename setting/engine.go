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
type Engine struct {
	CrankRadius float64 // mm, axle centre to crank-pin centre
	RodLength   float64 // mm, connecting rod between centres
	Inclination float64 // degrees, front of the cylinder raised above level (drawing only)
	Offset      float64 // mm, cylinder line above (+) or below (-) the axle centre, measured square to the line
}

// Validate checks the geometry and names the field at fault.
func (e Engine) Validate() error {
	switch {
	case !(e.CrankRadius > 0) || math.IsInf(e.CrankRadius, 0):
		return &Error{"crank radius", fmt.Sprintf("The crank radius must be a positive length (got %g mm).", e.CrankRadius)}
	case !(e.RodLength > 0) || math.IsInf(e.RodLength, 0):
		return &Error{"connecting rod length", fmt.Sprintf("The connecting rod length must be a positive length (got %g mm).", e.RodLength)}
	case e.RodLength <= e.CrankRadius:
		return &Error{"connecting rod length", fmt.Sprintf("The connecting rod %g mm is shorter than the crank radius %g mm; it must be longer.", e.RodLength, e.CrankRadius)}
	case math.IsNaN(e.Offset) || math.Abs(e.Offset)+e.CrankRadius >= e.RodLength:
		return &Error{"cylinder offset", fmt.Sprintf("The cylinder offset %g mm is too large: the connecting rod %g mm cannot reach the crank pin all the way round (offset + crank radius must be less than the rod length).", e.Offset, e.RodLength)}
	case math.IsNaN(e.Inclination) || math.Abs(e.Inclination) >= 90:
		return &Error{"cylinder inclination", fmt.Sprintf("The cylinder inclination must be between -90 and 90 degrees (got %g).", e.Inclination)}
	}
	return nil
}

// crankPin returns the crank-pin position in the cylinder-line frame at a
// rotation phi (radians) from the u axis in the forward running direction.
func (e Engine) crankPin(phi float64) (u, w float64) {
	s, c := math.Sincos(phi)
	return e.CrankRadius * c, -e.CrankRadius * s
}

// crosshead returns the crosshead position along the cylinder line (mm from
// the foot of the perpendicular from the axle) at rotation phi (radians).
func (e Engine) crosshead(phi float64) float64 {
	u, w := e.crankPin(phi)
	d := e.Offset - w
	return u + math.Sqrt(e.RodLength*e.RodLength-d*d)
}

// frontRotation returns the rotation (radians, forward running direction,
// from the u axis) at which the crosshead is furthest forward: front dead
// centre. Found numerically by golden-section search on the exact crosshead
// position, so any offset is handled without a closed form.
func (e Engine) frontRotation() float64 {
	return e.extremum(0, +1)
}

// backRotation returns the rotation (radians) of back dead centre, where the
// crosshead is furthest back.
func (e Engine) backRotation() float64 {
	return e.extremum(math.Pi, -1)
}

// extremum finds the rotation near guess where sign*crosshead is largest.
// The crosshead curve has one maximum and one minimum per turn, each within
// a quarter turn of the centred-engine position (offset < rod - crank).
func (e Engine) extremum(guess, sign float64) float64 {
	const invPhi = 0.6180339887498949
	a, b := guess-math.Pi/2, guess+math.Pi/2
	f := func(phi float64) float64 { return -sign * e.crosshead(phi) }
	c, d := b-invPhi*(b-a), a+invPhi*(b-a)
	fc, fd := f(c), f(d)
	for b-a > 1e-12 {
		if fc < fd {
			b, d, fd = d, c, fc
			c = b - invPhi*(b-a)
			fc = f(c)
		} else {
			a, c, fc = c, d, fd
			d = a + invPhi*(b-a)
			fd = f(d)
		}
	}
	return (a + b) / 2
}

// rotation converts a crank angle in degrees from front dead centre to the
// rotation in radians from the u axis.
func (e Engine) rotation(thetaDeg float64) float64 {
	return e.frontRotation() + thetaDeg*math.Pi/180
}

// CrankPin returns the crank-pin centre in the cylinder-line frame (mm) at
// crank angle thetaDeg (degrees from front dead centre, forward running).
func (e Engine) CrankPin(thetaDeg float64) (u, w float64) {
	return e.crankPin(e.rotation(thetaDeg))
}

// CrossheadU returns the crosshead pin's position along the cylinder line in
// the cylinder-line frame (mm from the foot of the perpendicular from the axle
// centre; the crosshead's w is Offset).
func (e Engine) CrossheadU(thetaDeg float64) float64 {
	return e.crosshead(e.rotation(thetaDeg))
}

// BackDeadCentre returns the crank angle of back dead centre in degrees from
// front dead centre: 180 exactly only when the cylinder line passes through
// the axle centre.
func (e Engine) BackDeadCentre() float64 {
	d := (e.backRotation() - e.frontRotation()) * 180 / math.Pi
	return math.Mod(d+720, 360)
}

// Stroke returns the piston stroke in mm (the crosshead's travel between dead
// centres: a little more than twice the crank radius when offset).
func (e Engine) Stroke() float64 {
	return e.crosshead(e.frontRotation()) - e.crosshead(e.backRotation())
}

// PistonFraction returns how far the piston is from its front dead-centre
// position as a fraction of the stroke: 0 at front dead centre, 1 at back.
func (e Engine) PistonFraction(thetaDeg float64) float64 {
	f := e.crosshead(e.frontRotation())
	return (f - e.CrossheadU(thetaDeg)) / e.Stroke()
}
