package session

import (
	"math"
)

// TyreToDeg converts a distance round the tyre (mm, on the tread) to crank
// degrees for a wheel of the given diameter: 360 / (pi x diameter) degrees
// per mm. A 115 mm wheel gives 0.9965 degrees per mm.
func TyreToDeg(tyreMM, wheelDiameterMM float64) float64 {
	return tyreMM * 360 / (math.Pi * wheelDiameterMM)
}

// DegToTyre converts crank degrees to mm round the tyre of a wheel of the
// given diameter.
func DegToTyre(deg, wheelDiameterMM float64) float64 {
	return deg * math.Pi * wheelDiameterMM / 360
}

// Circumference returns the length of the scale once round: 360 for
// degrees, pi x wheel diameter for mm round the tyre.
func (s Scale) Circumference(wheelDiameterMM float64) float64 {
	if s == TyreMM {
		return math.Pi * wheelDiameterMM
	}
	return 360
}

// Degrees returns the mark in degrees of crank rotation from the datum (not
// reduced to one turn).
func (m Mark) Degrees(wheelDiameterMM float64) float64 {
	if m.Scale == TyreMM {
		return TyreToDeg(m.Value, wheelDiameterMM)
	}
	return m.Value
}

// wrap reduces x to [0, c).
func wrap(x, c float64) float64 {
	x = math.Mod(x, c)
	if x < 0 {
		x += c
	}
	if x >= c { // -tiny + c rounds up to c
		x = 0
	}
	return x
}

// Span returns how far the wheel turned from the first bracketing mark to
// the second, in the scale's units, turning in direction dir on a scale of
// the given circumference: (second - first) reduced to one turn, measured
// forward (or backward when dir is Backward). Zero when the marks coincide.
func Span(first, second, circumference float64, dir Direction) float64 {
	if dir == Backward {
		return wrap(first-second, circumference)
	}
	return wrap(second-first, circumference)
}

// Midway returns the dead centre found from two bracketing marks: the mark
// midway along the arc the wheel turned from first to second in direction
// dir, reduced to [0, circumference). Marks either side of the datum are
// handled: on a 360 scale, 350 then 10 turning forward gives 0, not 180.
func Midway(first, second, circumference float64, dir Direction) float64 {
	half := Span(first, second, circumference, dir) / 2
	if dir == Backward {
		half = -half
	}
	return wrap(first+half, circumference)
}

// Mark returns the dead centre as a mark on its scale, reduced to one turn,
// for a wheel of the given diameter.
func (d DeadCentre) Mark(wheelDiameterMM float64) Mark {
	c := d.Scale.Circumference(wheelDiameterMM)
	return Mark{d.Scale, Midway(d.First, d.Second, c, d.Direction)}
}

// SpanDeg returns the crank angle turned between the two marks, degrees.
func (d DeadCentre) SpanDeg(wheelDiameterMM float64) float64 {
	c := d.Scale.Circumference(wheelDiameterMM)
	return Mark{d.Scale, Span(d.First, d.Second, c, d.Direction)}.Degrees(wheelDiameterMM)
}
