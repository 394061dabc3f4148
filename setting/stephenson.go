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
// where both sheaves lie between the axle and the link, the eccentric rods
// do not cross. The forward rod is pinned to whichever end of the link makes
// that true (or untrue, when Crossed). With this reading open rods give more
// lead toward mid gear, as Zeuner's analysis and the tests say, for either
// admission.
//
// Reverser: the reverse arm stands at MidArmAngle in mid gear and turns by
// r*ArmSwing degrees; +1 must bring the die block to the forward rod's end
// of the link.
//
// Assembly: the link hangs with its rods running forward from the axle,
// tilted less than about 64 degrees, and the lifting link runs from the arm
// pin toward the side of the weighshaft the link is on (down when the
// weighshaft is above the link); each call solves the link's three loop
// equations by Newton's method from a start found by a few fixed-point
// passes from the link upright, so no state is carried between calls. The die
// must stay within a fifth of the pin spacing beyond the rod pins.
//
// The valve rod is driven direct (no rocker); a rocker gear would add it
// as SingleEccentric does.
type Stephenson struct {
	Forward      Eccentric     `json:"forward"`        // the eccentric and rod for forward running
	Backward     Eccentric     `json:"backward"`       // the eccentric and rod for back running
	Crossed      bool          `json:"crossed"`        // rods crossed; false for open rods
	Admission    Admission     `json:"admission"`      // the valve's admission, which sets where the sheaves sit; must agree with the valve
	Link         ExpansionLink `json:"link"`           // the expansion link
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
	err := firstError(within("engine", e.Validate()), checkAdmission(g.Admission),
		g.Forward.validate("forward", "forward eccentric"), g.Backward.validate("backward", "backward eccentric"),
		positive("link.radius", "link radius", l.Radius), positive("link.pin_spacing", "link pin spacing", l.PinSpacing),
		positive("reverse_arm", "reverse arm length", g.ReverseArm), positive("lifting_link", "lifting link length", g.LiftingLink),
		finiteField("mid_arm_angle", "reverse arm mid-gear angle", g.MidArmAngle), finiteField("arm_swing", "reverse arm swing", g.ArmSwing),
		finiteField("guide", "valve guide height", g.Guide), finiteField("valve_centre_u", "valve central position", g.ValveCentreU))
	if err != nil {
		return err
	}
	switch {
	case l.PinSpacing >= 2*l.Radius:
		return &Error{"link.pin_spacing", fmt.Sprintf("The link pin spacing %g mm must be less than twice the link radius %g mm.", l.PinSpacing, l.Radius)}
	case !l.Suspension.Finite():
		return &Error{"link.suspension", "The link suspension pin position must be given in mm."}
	case !g.Weighshaft.Finite():
		return &Error{"weighshaft", "The weighshaft position must be given in mm."}
	case !(g.ValveCentreU > 0):
		return &Error{"valve_centre_u", fmt.Sprintf("The die block must lie ahead of the axle (valve central position %g mm must be positive).", g.ValveCentreU)}
	}
	return sweepCheck(e, g.Valve)
}

// stephensonPose is the solved linkage.
type stephensonPose struct {
	crank, fwdSheave, backSheave Point
	fwdPin, backPin, suspension  Point
	armPin, centre, die          Point
	sin, cos                     float64 // of the link's tilt anticlockwise from upright
}

// forwardSide returns +1 when the forward rod works the upper end of the
// link, -1 the lower. On the dead centre where both sheaves face the link
// (the far one for external admission, whose sheaves lead the crank by
// 90 + advance; the near one for internal admission, whose sheaves trail it
// by 90 - advance) the forward sheave stands above the axle at
// W = throw*cos(advance) either way, so open rods take the forward rod to the
// upper end.
func (g Stephenson) forwardSide() float64 {
	if g.Crossed {
		return -1
	}
	return 1
}

func (g Stephenson) sense() float64 {
	return -g.Admission.sense()
}

// armPin returns the lifting-link pin on the reverse arm.
func (g Stephenson) armPin(r Reverser) Point {
	a := (g.MidArmAngle + float64(r)*g.ArmSwing) * math.Pi / 180
	return g.Weighshaft.Add(Point{g.ReverseArm, 0}.Rotate(a))
}

// hang returns -1 when the lifting link runs down from the arm pin to the
// link (the link hangs below the weighshaft), +1 when it runs up.
func (g Stephenson) hang() float64 {
	return sign(g.Guide + g.Link.Suspension.W - g.Weighshaft.W)
}

// stephensonFrame is what stays put while the crank turns with the
// reverser at one place: the sheaves' angles from the crank (as cosine and
// sine), the lifting-link pin on the reverse arm and the link's pins in
// its own frame.
type stephensonFrame struct {
	fwdAngle, backAngle              float64 // radians
	fwdCos, fwdSin, backCos, backSin float64 // with turned: their cosines and sines
	turned                           bool
	armPin                           Point
	fLocal, bLocal, sLocal           Point
	hang                             float64
}

// frame returns the gear's frame with the reverser at r.
func (g *Stephenson) frame(r Reverser) stephensonFrame {
	s := g.sense()
	fs := g.forwardSide()
	f := stephensonFrame{armPin: g.armPin(r), fLocal: g.Link.pin(fs), bLocal: g.Link.pin(-fs), sLocal: g.Link.Suspension, hang: g.hang()}
	f.fwdAngle, f.backAngle = g.Forward.sheaveAngle(s, true), g.Backward.sheaveAngle(s, false)
	return f
}

// turn works out the sheave angles' cosines and sines, for solving at
// many crank angles (one sine and cosine of the crank angle each, not
// one per sheave).
func (f *stephensonFrame) turn() {
	f.fwdSin, f.fwdCos = math.Sincos(f.fwdAngle)
	f.backSin, f.backCos = math.Sincos(f.backAngle)
	f.turned = true
}

// solve places every joint at crank angle thetaDeg (the crank pin only when
// withCrank: Valve does not need it).
func (g *Stephenson) solve(e Engine, thetaDeg float64, r Reverser, withCrank bool) (stephensonPose, error) {
	if err := checkCall(thetaDeg, r); err != nil {
		return stephensonPose{}, err
	}
	f := g.frame(r)
	return g.solveIn(&f, e, thetaDeg, r, withCrank, nil)
}

// linkGuess is a solved link's middle and tilt, to start the next crank
// angle's Newton's method from.
type linkGuess struct {
	centre [3]Point   // the last three angles' link middles, latest first
	sin    [3]float64 // their tilts
	n      int        // how many of them are solved (the latest n)
}

// next extrapolates the link's middle and tilt to the next angle (by
// the parabola through the last three, or the line through two).
func (l *linkGuess) next() (Point, float64) {
	c, s := l.centre, l.sin
	switch l.n {
	case 1:
		return c[0], s[0]
	case 2:
		return c[0].Scale(2).Sub(c[1]), 2*s[0] - s[1]
	}
	return c[0].Sub(c[1]).Scale(3).Add(c[2]), 3*(s[0]-s[1]) + s[2]
}

// push records an angle's link, solved or not.
func (l *linkGuess) push(c Point, s float64, ok bool) {
	if !ok {
		l.n = 0
		return
	}
	l.centre = [3]Point{c, l.centre[0], l.centre[1]}
	l.sin = [3]float64{s, l.sin[0], l.sin[1]}
	l.n = min(l.n+1, 3)
}

// solveIn is solve in frame f (made for reverser r, thetaDeg checked).
// With a solved guess, Newton's method starts from it instead of the
// fixed-point passes; a guess that does not converge falls back to them.
func (g *Stephenson) solveIn(f *stephensonFrame, e Engine, thetaDeg float64, r Reverser, withCrank bool, guess *linkGuess) (stephensonPose, error) {
	var p stephensonPose
	phi := crankRotation(e, thetaDeg)
	if withCrank {
		p.crank = onAxle(e.CrankRadius, phi)
	}
	if f.turned { // onAxle at phi plus each sheave's angle, by the sum formulae
		sp, cp := math.Sincos(phi)
		p.fwdSheave = Point{g.Forward.Throw * (cp*f.fwdCos - sp*f.fwdSin), -g.Forward.Throw * (sp*f.fwdCos + cp*f.fwdSin)}
		p.backSheave = Point{g.Backward.Throw * (cp*f.backCos - sp*f.backSin), -g.Backward.Throw * (sp*f.backCos + cp*f.backSin)}
	} else {
		p.fwdSheave = onAxle(g.Forward.Throw, phi+f.fwdAngle)
		p.backSheave = onAxle(g.Backward.Throw, phi+f.backAngle)
	}
	p.armPin = f.armPin
	fLocal, bLocal, sLocal, hang := f.fLocal, f.bLocal, f.sLocal, f.hang

	// Starting point: the suspension pin hangs straight below (or above)
	// the arm pin, or the link where the last angles' links point; then
	// the rod pins go where rods of their length reach at their heights,
	// the link tilts to meet both, and the lifting link at its slant sets
	// the height, startPasses times from the hanging start (warmPasses from
	// the extrapolated one). This leaves Newton's method one or two steps.
	reach := func(sheave Point, rod, pinW float64) float64 {
		dw := pinW - sheave.W
		return sheave.U + rootPos(rod*rod-dw*dw)
	}
	warm := guess != nil && guess.n > 0
	centre, sa, passes := Point{0, p.armPin.W + hang*g.LiftingLink - sLocal.W}, 0.0, startPasses
	if warm {
		centre, sa = guess.next()
		sa, passes = clamp(sa, 0.8), warmPasses
	}
	ca := math.Sqrt(1 - sa*sa)
	for pass := 0; pass < passes; pass++ {
		qf, qb := turn(fLocal, ca, sa), turn(bLocal, ca, sa)
		pf := reach(p.fwdSheave, g.Forward.Rod, centre.W+qf.W)
		pb := reach(p.backSheave, g.Backward.Rod, centre.W+qb.W)
		sa = clamp((pf-pb-(fLocal.U-bLocal.U)*ca)/(bLocal.W-fLocal.W), 0.8) // the tilt that places both pins
		ca = math.Sqrt(1 - sa*sa)
		qf, qs := turn(fLocal, ca, sa), turn(sLocal, ca, sa)
		centre.U = pf - qf.U
		su := centre.U + qs.U - p.armPin.U
		centre.W = p.armPin.W + hang*rootPos(g.LiftingLink*g.LiftingLink-su*su) - qs.W
	}
	ok := g.newton(&p, fLocal, bLocal, sLocal, &centre, &sa, &ca)
	if guess != nil {
		guess.push(centre, sa, ok)
	}
	place := func(q Point) Point { return centre.Add(turn(q, ca, sa)) }
	p.centre, p.sin, p.cos = centre, sa, ca
	p.fwdPin, p.backPin, p.suspension = place(fLocal), place(bLocal), place(sLocal)
	if !ok || !p.fwdPin.Finite() || p.fwdPin.U < p.fwdSheave.U || p.backPin.U < p.backSheave.U || (p.suspension.W-p.armPin.W)*hang < 0 {
		if warm { // perhaps a poor or wrong start: afresh
			guess.n = 0
			return g.solveIn(f, e, thetaDeg, r, withCrank, guess)
		}
		return p, g.misfit(p, r, fLocal, bLocal, sLocal, thetaDeg)
	}
	var found bool
	p.die, found = circleLine(place(Point{-g.Link.Radius, 0}), g.Link.Radius, Point{0, g.Guide}, Point{1, 0}, 1)
	if !found {
		return p, closeError("guide", "The expansion link does not reach the valve rod's guide line", thetaDeg)
	}
	// The die must stay on the slot: no further from the link's middle than
	// the rod pins by more than a fifth of their spacing.
	if along := p.die.Sub(centre).Dot(Point{-sa, ca}); math.Abs(along) > 0.7*g.Link.PinSpacing {
		return p, closeError("arm_swing", fmt.Sprintf("The die block runs off the end of the expansion link (%.1f mm from its middle, the rod pins %.1f mm)", math.Abs(along), g.Link.PinSpacing/2), thetaDeg)
	}
	return p, nil
}

// newton runs Newton's method on the three loop equations (|pin -
// anchor|^2 - length^2) / 2 = 0 in the link centre and the sine of its
// tilt, from centre and sa, with the sheaves and arm pin placed in p; it
// reports whether it converged with the link less than steeply tilted.
func (g *Stephenson) newton(p *stephensonPose, fLocal, bLocal, sLocal Point, centre *Point, sa, ca *float64) bool {
	for it := 0; it < 20; it++ {
		if !(math.Abs(*sa) < 0.9) {
			return false
		}
		*ca = math.Sqrt(1 - *sa**sa)
		ica := 1 / *ca
		r0, f0 := loopRow(*centre, *ca, *sa, ica, fLocal, p.fwdSheave, g.Forward.Rod)
		r1, f1 := loopRow(*centre, *ca, *sa, ica, bLocal, p.backSheave, g.Backward.Rod)
		r2, f2 := loopRow(*centre, *ca, *sa, ica, sLocal, p.armPin, g.LiftingLink)
		dx, solved := solve3(&[3][3]float64{r0, r1, r2}, &[3]float64{f0, f1, f2})
		if !solved {
			return false
		}
		centre.U -= dx[0]
		centre.W -= dx[1]
		*sa -= dx[2]
		if math.Abs(dx[0])+math.Abs(dx[1])+math.Abs(dx[2])*g.Link.Radius < newtonStep {
			*ca = math.Sqrt(1 - *sa**sa)
			return math.Abs(*sa) < 0.9
		}
	}
	return false
}

// ValveCurve fills out with the valve displacement at each crank angle of
// thetaDeg (len(out) == len(thetaDeg)) with the reverser at r, as Valve
// gives them, only faster: what the reverser fixes is placed once, and
// each angle's link starts from the last one's. A start that does not
// converge is made afresh, so the values are Valve's to the linkage
// tolerance.
func (g Stephenson) ValveCurve(e Engine, thetaDeg []float64, r Reverser, out []float64) error {
	if err := checkCall(0, r); err != nil {
		return err
	}
	f := g.frame(r)
	f.turn()
	var guess linkGuess
	for i, th := range thetaDeg {
		if err := checkCall(th, r); err != nil {
			return err
		}
		v, err := g.valveIn(&f, e, th, r, &guess)
		if err != nil {
			return err
		}
		out[i] = v
	}
	return nil
}

// loopRow returns one loop equation of the link, (|pin - anchor|^2 -
// length^2) / 2, and its derivatives in the link centre's U and W and the
// sine sa of its tilt (ca its cosine, ica = 1/ca), for a pin at local in the
// link's frame.
func loopRow(centre Point, ca, sa, ica float64, local, anchor Point, length float64) ([3]float64, float64) {
	rq := turn(local, ca, sa)
	d := centre.Add(rq).Sub(anchor)
	return [3]float64{d.U, d.W, d.Dot(rq.Left()) * ica}, (d.Dot(d) - length*length) / 2
}

// misfit names the link that stops the expansion link being placed: of
// the two eccentric rods and the lifting link, the one whose length is
// furthest, as a fraction, from the distance it must span with the link
// upright where the reverser wants it (its middle at the valve's central
// position, the die at r times half the pin spacing toward the forward
// rod's end).
func (g *Stephenson) misfit(p stephensonPose, r Reverser, fLocal, bLocal, sLocal Point, thetaDeg float64) error {
	centre := Point{g.ValveCentreU, g.Guide - float64(r)*fLocal.W}
	links := []struct {
		field, what string
		length      float64
		from, pin   Point
	}{
		{"forward.rod", "The forward eccentric rod cannot reach the expansion link", g.Forward.Rod, p.fwdSheave, fLocal},
		{"backward.rod", "The backward eccentric rod cannot reach the expansion link", g.Backward.Rod, p.backSheave, bLocal},
		{"lifting_link", "The lifting link cannot hold the expansion link where the eccentric rods put it", g.LiftingLink, p.armPin, sLocal},
	}
	worst, most := 0, -1.0
	for i, l := range links {
		if m := math.Abs(centre.Add(l.pin).Sub(l.from).Len()-l.length) / l.length; m > most {
			worst, most = i, m
		}
	}
	return closeError(links[worst].field, links[worst].what, thetaDeg)
}

// solve3 solves the 3x3 system a x = b by cofactors.
func solve3(a *[3][3]float64, b *[3]float64) ([3]float64, bool) {
	c00 := a[1][1]*a[2][2] - a[1][2]*a[2][1]
	c01 := a[1][2]*a[2][0] - a[1][0]*a[2][2]
	c02 := a[1][0]*a[2][1] - a[1][1]*a[2][0]
	det := a[0][0]*c00 + a[0][1]*c01 + a[0][2]*c02
	if !(math.Abs(det) > 0 && math.Abs(det) < math.MaxFloat64) {
		return [3]float64{}, false
	}
	c10 := a[0][2]*a[2][1] - a[0][1]*a[2][2]
	c11 := a[0][0]*a[2][2] - a[0][2]*a[2][0]
	c12 := a[0][1]*a[2][0] - a[0][0]*a[2][1]
	c20 := a[0][1]*a[1][2] - a[0][2]*a[1][1]
	c21 := a[0][2]*a[1][0] - a[0][0]*a[1][2]
	c22 := a[0][0]*a[1][1] - a[0][1]*a[1][0]
	k := 1 / det
	return [3]float64{
		(c00*b[0] + c10*b[1] + c20*b[2]) * k,
		(c01*b[0] + c11*b[1] + c21*b[2]) * k,
		(c02*b[0] + c12*b[1] + c22*b[2]) * k,
	}, true
}

// Valve returns the valve displacement (mm, positive forward) at crank angle
// thetaDeg with the reverser at r.
func (g Stephenson) Valve(e Engine, thetaDeg float64, r Reverser) (float64, error) {
	if err := checkCall(thetaDeg, r); err != nil {
		return 0, err
	}
	f := g.frame(r)
	return g.valveIn(&f, e, thetaDeg, r, nil)
}

// valveIn is Valve in frame f (made for reverser r, thetaDeg checked),
// starting from guess as solveIn.
func (g *Stephenson) valveIn(f *stephensonFrame, e Engine, thetaDeg float64, r Reverser, guess *linkGuess) (float64, error) {
	p, err := g.solveIn(f, e, thetaDeg, r, false, guess)
	if err != nil {
		return 0, err
	}
	return valveResult(p.die.U-g.ValveCentreU, thetaDeg)
}

// Pose returns every joint of the gear at crank angle thetaDeg. Joints:
// "axle", "crank pin", "forward eccentric sheave centre", "backward
// eccentric sheave centre", "forward rod pin", "backward rod pin", "link
// middle", "link suspension pin", "weighshaft", "reverse arm pin", "die
// block". Bars: "crank", "forward eccentric", "backward eccentric",
// "forward eccentric rod", "backward eccentric rod", "expansion link" (an
// arc between the rod pins), "link hanger", "reverse arm", "lifting link".
func (g Stephenson) Pose(e Engine, thetaDeg float64, r Reverser) (Pose, error) {
	p, err := g.solve(e, thetaDeg, r, true)
	if err != nil {
		return Pose{}, err
	}
	valve, err := valveResult(p.die.U-g.ValveCentreU, thetaDeg)
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
	if p.fwdPin.Sub(p.backPin).Dot(Point{-p.sin, p.cos}) < 0 {
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
	b.p.Valve = valve
	return b.p, nil
}
