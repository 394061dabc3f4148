package setting

import (
	"fmt"
	"math"
)

// ExpansionLink is the curved slotted link of a link motion, described in
// its own frame: origin at the middle of the slot's centre line, x square to
// the link away from the slot's centre of curvature (forward, toward the
// valve, when the link hangs upright ahead of the axle), y along the link
// (up when upright).
type ExpansionLink struct {
	Radius     float64 `json:"radius"`      // mm, radius of the slot's centre line; its centre lies behind the link (toward the axle)
	PinSpacing float64 `json:"pin_spacing"` // mm, straight distance between the two eccentric-rod pins, which sit on the slot's centre line
	Suspension Point   `json:"suspension"`  // mm, the suspension pin in the link's frame (U = x, W = y); (0, 0) hangs the link by its middle
}

// pin returns the eccentric-rod pin in the link's frame: upper for side +1.
func (l ExpansionLink) pin(side float64) Point {
	c := l.PinSpacing / 2
	return Point{math.Sqrt(l.Radius*l.Radius-c*c) - l.Radius, side * c}
}

// Stephenson is the Stephenson link motion: forward and backward eccentrics
// whose rods work the two ends of a curved expansion link; the reverser
// lifts or lowers the link (reverse arm on a weighshaft, lifting link to the
// link's suspension pin) past a die block on the valve rod, which slides in
// a straight guide on the line W = Guide.
//
// Rods: the trade calls them open when, with the crank on the dead centre
// farthest from the link (back dead centre for a link ahead of the axle),
// so that both sheaves lie between the axle and the link, the eccentric rods
// do not cross. The forward rod is pinned to whichever end of the link makes
// that true (or untrue, when Crossed). With this reading open rods give more
// lead toward mid gear, as Zeuner's analysis and the tests say.
//
// Reverser: the reverse arm stands at MidArmAngle in mid gear and turns by
// r*ArmSwing degrees; +1 must bring the die block to the forward rod's end
// of the link.
//
// Assembly: the link hangs with its rods running forward from the axle and
// the lifting link on the side of the arm pin (above or below) that the
// suspension pin has in mid gear with the link upright at the guide line;
// each call solves the link's three loop equations by Newton's method from
// that upright position, so no state is carried between calls.
type Stephenson struct {
	Forward      Eccentric     `json:"forward"`   // the eccentric and rod for forward running
	Backward     Eccentric     `json:"backward"`  // the eccentric and rod for back running
	Crossed      bool          `json:"crossed"`   // rods crossed; false for open rods
	Admission    Admission     `json:"admission"` // the valve's admission, which sets where the sheaves sit; must agree with the valve
	Link         ExpansionLink `json:"link"`
	Weighshaft   Point         `json:"weighshaft"`     // mm, weighshaft centre
	ReverseArm   float64       `json:"reverse_arm"`    // mm, weighshaft centre to the lifting-link pin
	MidArmAngle  float64       `json:"mid_arm_angle"`  // degrees anticlockwise from +U (forward) of the reverse arm in mid gear
	ArmSwing     float64       `json:"arm_swing"`      // degrees anticlockwise the arm turns from mid gear to full forward; full back is the same the other way
	LiftingLink  float64       `json:"lifting_link"`   // mm, lifting link between centres
	Guide        float64       `json:"guide"`          // mm, W of the valve rod's guide line (the die block's centre), parallel to the cylinder line
	ValveCentreU float64       `json:"valve_centre_u"` // mm, U of the die-block centre with the valve central: the valve-rod length
}

// Kind names the gear.
func (g Stephenson) Kind() string { return "Stephenson" }

// Validate checks every dimension and that the linkage closes all round.
func (g Stephenson) Validate(e Engine) error {
	l := g.Link
	err := firstError(e.Validate(), checkAdmission(g.Admission), g.Forward.validate("forward eccentric"), g.Backward.validate("backward eccentric"),
		positive("link radius", l.Radius), positive("link pin spacing", l.PinSpacing),
		positive("reverse arm length", g.ReverseArm), positive("lifting link length", g.LiftingLink),
		finiteField("reverse arm mid-gear angle", g.MidArmAngle), finiteField("reverse arm swing", g.ArmSwing),
		finiteField("valve guide height", g.Guide), finiteField("valve central position", g.ValveCentreU))
	if err != nil {
		return err
	}
	switch {
	case l.PinSpacing >= 2*l.Radius:
		return &Error{"link pin spacing", fmt.Sprintf("The link pin spacing %g mm must be less than twice the link radius %g mm.", l.PinSpacing, l.Radius)}
	case !l.Suspension.Finite():
		return &Error{"link suspension pin", "The link suspension pin position must be given in mm."}
	case !g.Weighshaft.Finite():
		return &Error{"weighshaft position", "The weighshaft position must be given in mm."}
	case !(g.ValveCentreU > 0):
		return &Error{"valve central position", fmt.Sprintf("The die block must lie ahead of the axle (valve central position %g mm must be positive).", g.ValveCentreU)}
	}
	return sweepCheck(e, g.Valve)
}

// stephensonPose is the solved linkage.
type stephensonPose struct {
	crank, fwdSheave, backSheave Point
	fwdPin, backPin, suspension  Point
	armPin, centre, die          Point
	angle                        float64 // link rotation, radians anticlockwise from upright
}

// forwardSide returns +1 when the forward rod works the upper end of the
// link, -1 the lower.
func (g Stephenson) forwardSide(e Engine) float64 {
	phi := crankRotation(e, 180) + g.Forward.sheaveAngle(g.sense(), true)
	s := sign(onAxle(g.Forward.Throw, phi).W)
	if g.Crossed {
		s = -s
	}
	return s
}

func (g Stephenson) sense() float64 {
	return -g.Admission.sense()
}

// armPin returns the lifting-link pin on the reverse arm.
func (g Stephenson) armPin(r Reverser) Point {
	a := (g.MidArmAngle + float64(r)*g.ArmSwing) * math.Pi / 180
	return g.Weighshaft.Add(Point{g.ReverseArm, 0}.Rotate(a))
}

// solve places every joint at crank angle thetaDeg.
func (g Stephenson) solve(e Engine, thetaDeg float64, r Reverser) (stephensonPose, error) {
	var p stephensonPose
	if err := checkReverser(r); err != nil {
		return p, err
	}
	phi := crankRotation(e, thetaDeg)
	s := g.sense()
	p.crank = onAxle(e.CrankRadius, phi)
	p.fwdSheave = onAxle(g.Forward.Throw, phi+g.Forward.sheaveAngle(s, true))
	p.backSheave = onAxle(g.Backward.Throw, phi+g.Backward.sheaveAngle(s, false))
	p.armPin = g.armPin(r)

	fs := g.forwardSide(e)
	fLocal, bLocal, sLocal := g.Link.pin(fs), g.Link.pin(-fs), g.Link.Suspension
	// Hang: the lifting link leaves the arm pin upward (+1) or downward (-1)
	// as in mid gear with the link upright at the guide line.
	hang := sign(g.Guide + sLocal.W - g.armPin(0).W)

	// Starting point: upright link whose suspension pin hangs straight from
	// the arm pin, rod pins where rods of their length reach at that height.
	centre := Point{0, p.armPin.W + hang*g.LiftingLink - sLocal.W}
	reach := func(sheave Point, rod float64, local Point) float64 {
		dw := centre.W + local.W - sheave.W
		return sheave.U + math.Sqrt(math.Max(rod*rod-dw*dw, 0)) - local.U
	}
	uf, ub := reach(p.fwdSheave, g.Forward.Rod, fLocal), reach(p.backSheave, g.Backward.Rod, bLocal)
	centre.U = (uf + ub) / 2
	alpha := (uf - ub) / (bLocal.W - fLocal.W) // small-angle tilt that places both pins
	centre.U += alpha * (fLocal.W + bLocal.W) / 2
	// Newton's method on the three loop equations |pin - anchor|^2 = len^2.
	ok := false
	for it := 0; it < 30; it++ {
		sn, cs := math.Sincos(alpha)
		rot := func(q Point) Point { return Point{q.U*cs - q.W*sn, q.U*sn + q.W*cs} }
		var f [3]float64
		var jac [3][3]float64
		eq := func(i int, local, anchor Point, length float64) {
			rq := rot(local)
			d := centre.Add(rq).Sub(anchor)
			f[i] = (d.Dot(d) - length*length) / (2 * length)
			jac[i] = [3]float64{d.U / length, d.W / length, d.Dot(rq.Left()) / length}
		}
		eq(0, fLocal, p.fwdSheave, g.Forward.Rod)
		eq(1, bLocal, p.backSheave, g.Backward.Rod)
		eq(2, sLocal, p.armPin, g.LiftingLink)
		dx, solved := solve3(jac, f)
		if !solved {
			break
		}
		centre.U -= dx[0]
		centre.W -= dx[1]
		alpha -= dx[2]
		if math.Abs(dx[0])+math.Abs(dx[1])+math.Abs(dx[2])*g.Link.Radius < 1e-10 {
			ok = true
			break
		}
	}
	rot := func(q Point) Point { return centre.Add(q.Rotate(alpha)) }
	p.centre, p.angle = centre, alpha
	p.fwdPin, p.backPin, p.suspension = rot(fLocal), rot(bLocal), rot(sLocal)
	if !ok || !p.fwdPin.Finite() || math.Abs(alpha) > math.Pi/3 ||
		p.fwdPin.U < p.fwdSheave.U || p.backPin.U < p.backSheave.U || (p.suspension.W-p.armPin.W)*hang < 0 {
		return p, closeError("lifting link length", "The eccentric rods and lifting link cannot hold the expansion link", thetaDeg)
	}
	var found bool
	p.die, found = circleLine(rot(Point{-g.Link.Radius, 0}), g.Link.Radius, Point{0, g.Guide}, Point{1, 0}, 1)
	if !found {
		return p, closeError("valve guide height", "The expansion link does not reach the valve rod's guide line", thetaDeg)
	}
	return p, nil
}

// solve3 solves the 3x3 system a x = b by Cramer's rule.
func solve3(a [3][3]float64, b [3]float64) ([3]float64, bool) {
	det := func(m [3][3]float64) float64 {
		return m[0][0]*(m[1][1]*m[2][2]-m[1][2]*m[2][1]) -
			m[0][1]*(m[1][0]*m[2][2]-m[1][2]*m[2][0]) +
			m[0][2]*(m[1][0]*m[2][1]-m[1][1]*m[2][0])
	}
	d := det(a)
	if d == 0 || !finite(d) {
		return [3]float64{}, false
	}
	var x [3]float64
	for c := 0; c < 3; c++ {
		m := a
		for r := 0; r < 3; r++ {
			m[r][c] = b[r]
		}
		x[c] = det(m) / d
	}
	return x, true
}

// Valve returns the valve displacement (mm, positive forward) at crank angle
// thetaDeg with the reverser at r.
func (g Stephenson) Valve(e Engine, thetaDeg float64, r Reverser) (float64, error) {
	p, err := g.solve(e, thetaDeg, r)
	if err != nil {
		return 0, err
	}
	return p.die.U - g.ValveCentreU, nil
}

// Pose returns every joint of the gear at crank angle thetaDeg.
func (g Stephenson) Pose(e Engine, thetaDeg float64, r Reverser) (Pose, error) {
	p, err := g.solve(e, thetaDeg, r)
	if err != nil {
		return Pose{}, err
	}
	var b poseBuilder
	axle := b.joint("axle", Point{})
	b.bar("crank", axle, b.joint("crank pin", p.crank))
	fs := b.joint("forward eccentric sheave centre", p.fwdSheave)
	bs := b.joint("backward eccentric sheave centre", p.backSheave)
	b.bar("forward eccentric", axle, fs)
	b.bar("backward eccentric", axle, bs)
	fp := b.joint("forward rod pin", p.fwdPin)
	bp := b.joint("backward rod pin", p.backPin)
	b.bar("forward eccentric rod", fs, fp)
	b.bar("backward eccentric rod", bs, bp)
	lower, upper, radius := bp, fp, g.Link.Radius
	if p.fwdPin.Sub(p.backPin).Dot(Point{0, 1}.Rotate(p.angle)) < 0 {
		lower, upper = fp, bp
	}
	b.arc("expansion link", lower, upper, radius)
	c := b.joint("link middle", p.centre)
	sp := b.joint("link suspension pin", p.suspension)
	b.bar("link hanger", c, sp)
	ws := b.joint("weighshaft", g.Weighshaft)
	ap := b.joint("reverse arm pin", p.armPin)
	b.bar("reverse arm", ws, ap)
	b.bar("lifting link", ap, sp)
	b.joint("die block", p.die)
	b.p.Valve = p.die.U - g.ValveCentreU
	return b.p, nil
}
