package beat

import (
	"fmt"
	"math"

	"evenbeat/setting"
	"evenbeat/setting/session"
)

// Quartering is the angle between one cylinder's crank and the first
// cylinder's, as the bracketed dead centres of both show it. It needs the
// marks of every side counted from datums at the same angle on their
// wheels (for instance where a square from the frame meets each tyre at
// the same height): the marks then give each crank's front dead centre as
// an angle of the axle, and the difference is the angle between them.
type Quartering struct {
	First, Other string // the first cylinder and this one
	// Design is how far the drawing puts this crank ahead of the first
	// (setting.Cylinder.CrankAngle); Measured what the marks put it at;
	// Sigma one standard deviation of Measured (degrees).
	Design, Measured, Sigma float64
	// Error is Measured - Design, in [-180, 180).
	Error float64
	// Told: the error is more than the marks can tell (beyond three
	// times Sigma: the cure is costly, so a false alarm must be rare,
	// about 3 in 1000): the cranks are not at the drawing's angle. No
	// valve adjustment cures that; it is work on the wheels.
	Told bool
}

// Uncertainty returns the +/- to state with Measured and Error: 2.5
// standard deviations, which hold the truth about 99 times in 100.
func (q Quartering) Uncertainty() float64 { return 2.5 * q.Sigma }

// Quarterings returns the quartering of every cylinder after the first
// against the first, when the session's datums are matched
// (Measuring.DatumsMatched; without it the marks of two wheels are
// counted from unrelated places, and nothing is returned). A cylinder
// without a bracketed dead centre is left out. The error of each dead centre is that of the midpoint of two marks
// (one mark's error, Measuring.MarkError, over the square root of two);
// every bracketed dead centre of a cylinder (both ends, both ways) gives
// its front dead centre, the back ones through the back dead centre the
// geometry puts it at. Each wheel's datum is itself a mark, with a
// mark's error, and it counts in full: however many dead centres are
// bracketed, they are all counted from it.
func Quarterings(s *session.Session) ([]Quartering, error) {
	if len(s.Cylinders) < 2 || !s.Measuring.DatumsMatched {
		return nil, nil
	}
	design := map[string]float64{}
	for _, c := range s.Engine.Cylinders {
		design[c.Name] = c.CrankAngle
	}
	type fdc struct {
		deg, sigma, datum float64
		ok                bool
	}
	fdcs := make([]fdc, len(s.Cylinders))
	for i := range s.Cylinders {
		d, sig, ok, err := frontDeadCentre(s, i)
		if err != nil {
			return nil, err
		}
		fdcs[i] = fdc{d, sig, markDeg(s), ok}
	}
	first := s.Cylinders[0].Name
	var out []Quartering
	for i := 1; i < len(s.Cylinders); i++ {
		if !fdcs[0].ok || !fdcs[i].ok {
			continue
		}
		q := Quartering{First: first, Other: s.Cylinders[i].Name}
		q.Design = design[q.Other] - design[first]
		// The crank that leads reaches its front dead centre first: at
		// a smaller mark, since marks grow as the wheel turns forward.
		q.Measured = wrap180(fdcs[0].deg - fdcs[i].deg)
		q.Sigma = math.Sqrt(sq(fdcs[0].sigma) + sq(fdcs[i].sigma) + sq(fdcs[0].datum) + sq(fdcs[i].datum))
		q.Error = wrap180(q.Measured - q.Design)
		q.Measured = q.Design + q.Error
		q.Told = math.Abs(q.Error) > 3*q.Sigma
		out = append(out, q)
	}
	return out, nil
}

// frontDeadCentre returns cylinder i's front dead centre as a mark in
// degrees from its wheel's datum, with its error, from every bracketed
// dead centre it has; ok is false when it has none.
func frontDeadCentre(s *session.Session, i int) (deg, sigma float64, ok bool, err error) {
	c := s.Cylinders[i]
	if len(c.DeadCentres) == 0 {
		return 0, 0, false, nil
	}
	spec, err := s.CylinderEngine(i)
	if err != nil {
		return 0, 0, false, err
	}
	crank, err := spec.Engine.Prepare()
	if err != nil {
		return 0, 0, false, fmt.Errorf("cylinder %s: %w", c.Name, err)
	}
	wheel := s.Measuring.WheelDiameterMM
	one := markDeg(s)
	// Mean of unit vectors, so that marks either side of the datum
	// average right.
	var x, y float64
	for _, dc := range c.DeadCentres {
		d := dc.Mark(wheel).Degrees(wheel)
		if dc.End == session.Back {
			d -= crank.DeadCentre(setting.Back)
		}
		x += math.Cos(d * math.Pi / 180)
		y += math.Sin(d * math.Pi / 180)
	}
	n := float64(len(c.DeadCentres))
	deg = wrap360(math.Atan2(y, x) * 180 / math.Pi)
	return deg, one / math.Sqrt2 / math.Sqrt(n), true, nil
}

// markDeg returns one mark's error in degrees: Measuring.MarkError, or
// 0.25 degrees when it is not given.
func markDeg(s *session.Session) float64 {
	one := math.Abs(s.Measuring.MarkError.Degrees(s.Measuring.WheelDiameterMM))
	if !(one > 0) {
		one = 0.25
	}
	return one
}

func sq(x float64) float64 { return x * x }

func wrap180(x float64) float64 {
	x = wrap360(x + 180)
	return x - 180
}
