package setting

import (
	"fmt"
	"math"
)

// CombinationLever is the Walschaerts combination lever: three pins in one
// straight line, hanging from the valve-spindle pin. Distances are measured
// along the lever from the radius-rod pin toward the union-link pin.
//
// Where the valve pin goes: at front dead centre the crosshead is at its
// most forward, and in mid gear the link is at the middle of its swing, so
// the valve's whole dead-centre displacement (lap + lead) comes from the
// crosshead through the lever. With the valve pin between the radius-rod pin
// and the union-link pin the valve moves with the crosshead: forward at front
// dead centre, which opens the front port of an internal-admission valve.
// With the valve pin beyond the radius-rod pin (radius-rod pin in the middle)
// the valve moves against the crosshead, as external admission needs.
type CombinationLever struct {
	ValvePin float64 `json:"valve_pin"` // mm, signed: radius-rod pin to valve-spindle pin; positive toward the union-link pin (internal admission), negative beyond the radius-rod pin (external admission)
	UnionPin float64 `json:"union_pin"` // mm, radius-rod pin to union-link pin
}

// Ratio returns (radius-rod pin to valve pin)/(radius-rod pin to union-link
// pin): the fraction of the crosshead's motion the valve receives.
func (c CombinationLever) Ratio() float64 { return math.Abs(c.ValvePin) / c.UnionPin }

// Inside reports whether the lever suits internal admission (valve pin
// between the other two).
func (c CombinationLever) Inside() bool { return c.ValvePin > 0 }

// LeverRatio returns the combination-lever ratio (radius-rod pin to valve
// pin over radius-rod pin to union-link pin) that gives the valve lap + lead
// at each dead centre from the crosshead's motion: (lap + lead) / crank
// radius. All lengths in the same unit.
func LeverRatio(lap, lead, crankRadius float64) (float64, error) {
	if err := positive("crank_radius", "crank radius", crankRadius); err != nil {
		return 0, err
	}
	if !finiteNum(lap) || !finiteNum(lead) || !(lap+lead > 0) {
		return 0, &Error{"steam_lap", fmt.Sprintf("Lap + lead must be a positive length (got %g + %g).", lap, lead)}
	}
	q := (lap + lead) / crankRadius
	if q >= 1 {
		return 0, &Error{"steam_lap", fmt.Sprintf("Lap + lead (%g) must be less than the crank radius (%g).", lap+lead, crankRadius)}
	}
	return q, nil
}

// DesignLever proportions a combination lever for the given lap, lead and
// crank radius (mm) with unionPin mm between the radius-rod and union-link
// pins, the valve pin placed for the admission.
func DesignLever(lap, lead, crankRadius, unionPin float64, insideAdmission bool) (CombinationLever, error) {
	q, err := LeverRatio(lap, lead, crankRadius)
	if err != nil {
		return CombinationLever{}, err
	}
	if err := positive("union_pin", "distance from the radius-rod pin to the union-link pin", unionPin); err != nil {
		return CombinationLever{}, err
	}
	if !insideAdmission {
		q = -q
	}
	return CombinationLever{ValvePin: q * unionPin, UnionPin: unionPin}, nil
}

// Walschaerts is the Walschaerts valve gear.
//
// A return crank on the crank pin drives, through the eccentric rod, the
// foot of an expansion link that rocks on a fixed trunnion. The link's
// curved slot passes through the trunnion, its centre of curvature forward
// (toward the combination lever) by LinkRadius with the link at mid swing.
// The reverser sets the die block's place along the slot: r*FullGearDie mm
// from the trunnion along the slot (the radius rod lifted without slip). The
// radius rod carries the die's motion to the combination lever, which hangs
// from the valve-spindle pin (sliding on the line W = Guide) and takes the
// crosshead's motion at its foot through the union link from an arm on the
// crosshead.
//
// Assembly: the link foot stays on the side of the line return-crank pin ->
// trunnion where it is with the link at mid swing and the return-crank pin
// at the axle centre; the lever hangs downward from the valve-spindle pin,
// with the radius rod running forward from the die and the union link on
// the side of the crosshead arm the lever has in the design. Each call
// solves the link foot by circle intersection and the lever by Newton's
// method on its two loop equations, started from the lever hanging straight
// and refined by a few fixed-point passes, so no state is carried between
// calls.
//
// Which sign of FullGearDie runs the engine forward depends on the return
// crank's side and on the valve pin's side of the lever (the lever turns
// the link's motion round for external admission); a wrong sign shows as
// full forward gear cutting off far outside 70-90 % running forward.
type Walschaerts struct {
	ReturnCrank  float64          `json:"return_crank"`   // mm, crank-pin centre to return-crank pin
	ReturnAngle  float64          `json:"return_angle"`   // degrees, direction of the return crank (crank pin to its pin) ahead of the main crank, forward running sense; see CentreLink
	EccentricRod float64          `json:"eccentric_rod"`  // mm, return-crank pin to link-foot pin
	Trunnion     Point            `json:"trunnion"`       // mm, the link's fixed pivot
	LinkFoot     Point            `json:"link_foot"`      // mm, the link-foot pin relative to the trunnion with the link at mid swing (below it)
	LinkRadius   float64          `json:"link_radius"`    // mm, radius of the slot's centre line
	FullGearDie  float64          `json:"full_gear_die"`  // mm, along the slot from the trunnion to the die in full forward gear: positive above the trunnion
	RadiusRod    float64          `json:"radius_rod"`     // mm, die-block centre to the lever's radius-rod pin
	Lever        CombinationLever `json:"lever"`          // the combination lever
	UnionLink    float64          `json:"union_link"`     // mm, crosshead-arm pin to the lever's union-link pin
	CrossheadArm Point            `json:"crosshead_arm"`  // mm, the union-link pin on the crosshead relative to the crosshead pin
	Guide        float64          `json:"guide"`          // mm, W of the valve-spindle pin's guide line, parallel to the cylinder line
	ValveCentreU float64          `json:"valve_centre_u"` // mm, U of the valve-spindle pin with the valve central: the spindle length
}

// Kind names the gear.
func (g Walschaerts) Kind() string { return "Walschaerts" }

// Validate checks every dimension and that the linkage closes all round.
func (g Walschaerts) Validate(e Engine) error {
	err := firstError(within("engine", e.Validate()),
		positive("return_crank", "return crank radius", g.ReturnCrank), finiteField("return_angle", "return crank angle", g.ReturnAngle),
		positive("eccentric_rod", "eccentric rod length", g.EccentricRod), positive("link_radius", "link radius", g.LinkRadius),
		finiteField("full_gear_die", "full-gear die position", g.FullGearDie), positive("radius_rod", "radius rod length", g.RadiusRod),
		positive("lever.union_pin", "combination lever's union-pin distance", g.Lever.UnionPin),
		finiteField("lever.valve_pin", "combination lever's valve-pin distance", g.Lever.ValvePin),
		positive("union_link", "union link length", g.UnionLink),
		finiteField("guide", "valve guide height", g.Guide), finiteField("valve_centre_u", "valve central position", g.ValveCentreU))
	if err != nil {
		return err
	}
	switch {
	case !g.Trunnion.Finite():
		return &Error{"trunnion", "The link trunnion position must be given in mm."}
	case !g.LinkFoot.Finite() || g.LinkFoot.Len() == 0:
		return &Error{"link_foot", "The link foot must be a distance from the trunnion, given in mm."}
	case !g.CrossheadArm.Finite():
		return &Error{"crosshead_arm", "The crosshead arm position must be given in mm."}
	case g.Lever.ValvePin == 0 || g.Lever.ValvePin >= g.Lever.UnionPin:
		return &Error{"lever.valve_pin", fmt.Sprintf("The valve pin must lie between the radius-rod pin and the union-link pin (internal admission) or beyond the radius-rod pin (external admission); got %g mm with the union pin at %g mm.", g.Lever.ValvePin, g.Lever.UnionPin)}
	case math.Abs(g.FullGearDie) >= g.LinkRadius:
		return &Error{"full_gear_die", fmt.Sprintf("The full-gear die position %g mm must be well inside the link radius %g mm.", g.FullGearDie, g.LinkRadius)}
	}
	return sweepCheck(e, g.Valve)
}

// walschaertsPose is the solved linkage.
type walschaertsPose struct {
	crank, returnPin, foot, die   Point
	radiusPin, valvePin, unionPin Point
	crosshead, crossheadArm       Point
	linkCos, linkSin              float64 // the link's turn from mid swing, anticlockwise
}

// solve places every joint at crank angle thetaDeg.
func (g *Walschaerts) solve(e Engine, thetaDeg float64, r Reverser) (walschaertsPose, error) {
	var p walschaertsPose
	if err := checkCall(thetaDeg, r); err != nil {
		return p, err
	}
	phi := crankRotation(e, thetaDeg)
	p.crank = onAxle(e.CrankRadius, phi)
	p.returnPin = p.crank.Add(onAxle(g.ReturnCrank, phi+g.ReturnAngle*(math.Pi/180)))
	// The slider-crank closes with the crosshead on the line W = Offset
	// (Engine's own relation, from the crank pin already found; a test keeps
	// them equal).
	dw := e.Offset - p.crank.W
	p.crosshead = Point{p.crank.U + math.Sqrt(e.RodLength*e.RodLength-dw*dw), e.Offset}
	p.crossheadArm = p.crosshead.Add(g.CrossheadArm)

	// Link: foot by circle intersection, then the link's turn from mid
	// swing as a cosine and sine, from the foot's two positions.
	footLen2 := g.LinkFoot.Dot(g.LinkFoot)
	var ok bool
	p.foot, ok = circles(p.returnPin, g.EccentricRod, g.Trunnion, math.Sqrt(footLen2), sideOf(Point{}, g.Trunnion, g.Trunnion.Add(g.LinkFoot)))
	if !ok {
		return p, closeError("eccentric_rod", "The eccentric rod cannot reach the link foot", thetaDeg)
	}
	f := p.foot.Sub(g.Trunnion)
	p.linkCos, p.linkSin = g.LinkFoot.Dot(f)/footLen2, g.LinkFoot.Cross(f)/footLen2
	p.die = g.slotPoint(p, float64(r)*g.FullGearDie)

	// Lever: unknowns the valve-pin U (v) and the sine t of the lever's
	// angle from hanging straight down (positive with its foot forward).
	a, k := g.Lever.ValvePin, g.Lever.UnionPin-g.Lever.ValvePin
	// Start: the lever hanging straight, the radius rod and union link
	// reaching its pins at their heights; then again at the lever's slant.
	// This leaves Newton's method one to three steps.
	ahead := sign(g.ValveCentreU - g.Trunnion.U)
	uSide := g.unionSide(e)
	var t, v float64
	for pass, ct := 0, 1.0; pass < startPasses; pass++ {
		aW, uW := g.Guide+a*ct, g.Guide-k*ct
		aU := p.die.U + ahead*rootPos(g.RadiusRod*g.RadiusRod-sq(aW-p.die.W))
		uU := p.crossheadArm.U + uSide*rootPos(g.UnionLink*g.UnionLink-sq(uW-p.crossheadArm.W))
		t = clamp((uU-aU)/g.Lever.UnionPin, 0.9)
		v = aU + t*a
		ct = math.Sqrt(1 - t*t)
	}
	ok = false
	var ct float64
	kr, ku := 1/g.RadiusRod, 1/g.UnionLink
	for it := 0; it < 20; it++ {
		if !(math.Abs(t) < 0.95) {
			break
		}
		ct = math.Sqrt(1 - t*t)
		dr := Point{v - a*t - p.die.U, g.Guide + a*ct - p.die.W}
		du := Point{v + k*t - p.crossheadArm.U, g.Guide - k*ct - p.crossheadArm.W}
		fr := (dr.Dot(dr) - g.RadiusRod*g.RadiusRod) * kr / 2
		fu := (du.Dot(du) - g.UnionLink*g.UnionLink) * ku / 2
		j11, j12 := dr.U*kr, (-a*dr.U-a*t/ct*dr.W)*kr
		j21, j22 := du.U*ku, (k*du.U+k*t/ct*du.W)*ku
		det := j11*j22 - j12*j21
		if det == 0 || !finiteNum(det) {
			break
		}
		dv, dt := (fr*j22-fu*j12)/det, (j11*fu-j21*fr)/det
		v -= dv
		t -= dt
		if math.Abs(dv)+math.Abs(dt)*g.Lever.UnionPin < newtonStep {
			ok = math.Abs(t) < 0.95
			ct = math.Sqrt(1 - t*t)
			break
		}
	}
	p.valvePin = Point{v, g.Guide}
	p.radiusPin = Point{v - a*t, g.Guide + a*ct}
	p.unionPin = Point{v + k*t, g.Guide - k*ct}
	if !ok || !finiteNum(v) || (p.radiusPin.U-p.die.U)*ahead < 0 || (p.unionPin.U-p.crossheadArm.U)*uSide < 0 {
		// Name the link whose length is further from what the lever needs
		// hanging straight with the valve central.
		needR := Point{g.ValveCentreU, g.Guide + a}.Sub(p.die).Len()
		needU := Point{g.ValveCentreU, g.Guide - k}.Sub(p.crossheadArm).Len()
		if math.Abs(needU-g.UnionLink)/g.UnionLink > math.Abs(needR-g.RadiusRod)/g.RadiusRod {
			return p, closeError("union_link", "The union link cannot reach the combination lever", thetaDeg)
		}
		return p, closeError("radius_rod", "The radius rod cannot reach the combination lever", thetaDeg)
	}
	return p, nil
}

// CentreLink returns g with the return crank angle and eccentric rod length
// set so the link stands at the middle of its swing (its foot at
// Trunnion + LinkFoot) at both dead centres: then moving the reverser with
// the engine on either dead centre does not move the valve (common
// practice, no source: the setter's dead-centre test). It keeps the return
// crank radius and searches the angle by Newton's method from g's
// ReturnAngle, so give a value on the intended side (about +-150 degrees
// for a return crank whose pin stands a quarter turn from the crank as seen
// from the axle).
func (g Walschaerts) CentreLink(e Engine) (Walschaerts, error) {
	if err := firstError(within("engine", e.Validate()), positive("return_crank", "return crank radius", g.ReturnCrank), finiteField("return_angle", "return crank angle", g.ReturnAngle)); err != nil {
		return g, err
	}
	foot := g.Trunnion.Add(g.LinkFoot)
	bdc := e.BackDeadCentre()
	pin := func(thetaDeg, rho float64) Point {
		phi := crankRotation(e, thetaDeg)
		return onAxle(e.CrankRadius, phi).Add(onAxle(g.ReturnCrank, phi+rho*math.Pi/180))
	}
	f := func(rho float64) float64 {
		return pin(0, rho).Sub(foot).Len() - pin(bdc, rho).Sub(foot).Len()
	}
	rho := g.ReturnAngle
	for it := 0; it < 50; it++ {
		const h = 1e-6
		fr := f(rho)
		d := (f(rho+h) - f(rho-h)) / (2 * h)
		if d == 0 || !finiteNum(d) {
			break
		}
		step := fr / d
		rho -= clamp(step, 10)
		if math.Abs(step) < 1e-12 {
			g.ReturnAngle = math.Mod(rho+540, 360) - 180
			g.EccentricRod = pin(0, rho).Sub(foot).Len()
			return g, nil
		}
	}
	return g, &Error{"return_angle", "No return crank angle puts the link at the middle of its swing at both dead centres; check the trunnion, link foot and return crank radius."}
}

// unionSide returns +1 when the lever's foot lies ahead of the crosshead arm
// in the design (crosshead at mid-stroke), else -1.
func (g Walschaerts) unionSide(e Engine) float64 {
	return sign(g.ValveCentreU - (e.RodLength + g.CrossheadArm.U))
}

func sq(x float64) float64 { return x * x }

// Valve returns the valve displacement (mm, positive forward) at crank angle
// thetaDeg with the reverser at r.
func (g Walschaerts) Valve(e Engine, thetaDeg float64, r Reverser) (float64, error) {
	p, err := g.solve(e, thetaDeg, r)
	if err != nil {
		return 0, err
	}
	return valveResult(p.valvePin.U-g.ValveCentreU, thetaDeg)
}

// Pose returns every joint of the gear at crank angle thetaDeg. Joints:
// "axle", "crank pin", "return crank pin", "link foot pin", "link
// trunnion", "link top", "link bottom" (the slot's drawn ends), "die block",
// "radius-rod pin", "valve spindle pin", "union-link pin", "crosshead pin",
// "crosshead arm pin". Bars: "crank", "return crank", "eccentric rod",
// "link tail", "expansion link" (an arc), "radius rod", "combination
// lever", "crosshead arm", "union link", "connecting rod".
func (g Walschaerts) Pose(e Engine, thetaDeg float64, r Reverser) (Pose, error) {
	p, err := g.solve(e, thetaDeg, r)
	if err != nil {
		return Pose{}, err
	}
	valve, err := valveResult(p.valvePin.U-g.ValveCentreU, thetaDeg)
	if err != nil {
		return Pose{}, err
	}
	var b poseBuilder
	axle := b.joint("axle", Point{})
	cp := b.joint("crank pin", p.crank)
	b.bar("crank", axle, cp)
	rp := b.joint("return crank pin", p.returnPin)
	b.bar("return crank", cp, rp)
	ft := b.joint("link foot pin", p.foot)
	b.bar("eccentric rod", rp, ft)
	tr := b.joint("link trunnion", g.Trunnion)
	b.bar("link tail", tr, ft)
	span := math.Max(0.3*g.LinkRadius, 1.2*math.Abs(g.FullGearDie)) // slot drawn past the full-gear die both ways
	top := b.joint("link top", g.slotPoint(p, span))
	bottom := b.joint("link bottom", g.slotPoint(p, -span))
	b.arc("expansion link", bottom, top, -g.LinkRadius)
	d := b.joint("die block", p.die)
	rr := b.joint("radius-rod pin", p.radiusPin)
	b.bar("radius rod", d, rr)
	vp := b.joint("valve spindle pin", p.valvePin)
	up := b.joint("union-link pin", p.unionPin)
	if g.Lever.Inside() {
		b.bar("combination lever", rr, up)
	} else {
		b.bar("combination lever", vp, up)
	}
	ch := b.joint("crosshead pin", p.crosshead)
	ca := b.joint("crosshead arm pin", p.crossheadArm)
	b.bar("crosshead arm", ch, ca)
	b.bar("union link", ca, up)
	b.bar("connecting rod", cp, ch)
	b.p.Valve = valve
	return b.p, nil
}

// slotPoint returns the point s mm along the slot's centre line from the
// trunnion, positive above it at mid swing, with the link where p has it.
// At mid swing the slot's centre of curvature lies LinkRadius ahead of the
// trunnion, so the point is (R(1 - cos(s/R)), R sin(s/R)) from the trunnion,
// turned with the link.
func (g *Walschaerts) slotPoint(p walschaertsPose, s float64) Point {
	sn, cs := math.Sincos(s / g.LinkRadius)
	q := Point{g.LinkRadius * (1 - cs), g.LinkRadius * sn}
	return g.Trunnion.Add(turn(q, p.linkCos, p.linkSin))
}
