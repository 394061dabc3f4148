package setting

import (
	"fmt"
	"math"
)

// Eccentric is an eccentric sheave keyed to the crank axle, with its rod.
//
// Where the sheave sits: a valve driven direct that must move back to open
// the front port (external admission, a slide valve) needs the sheave
// 90 + Advance degrees ahead of the crank in its running direction; internal
// admission, or a reversing rocker, turns the sheave to 90 - Advance behind
// the crank; both together cancel. The gears work this out from their
// Admission and rocker fields, so Advance is always the trade's angle
// of advance.
type Eccentric struct {
	Throw   float64 `json:"throw"`   // mm, axle centre to sheave centre: half the travel the sheave gives
	Advance float64 `json:"advance"` // degrees, angle of advance: how far the sheave leads the position 90 degrees from the crank
	Rod     float64 `json:"rod"`     // mm, eccentric rod, sheave centre to the pin at its far end
}

// validate names the field at fault as a key path under key ("forward");
// words is how the user knows this eccentric ("forward eccentric").
func (x Eccentric) validate(key, words string) error {
	if err := firstError(positive(key+".throw", words+" throw", x.Throw), positive(key+".rod", words+" rod length", x.Rod)); err != nil {
		return err
	}
	if !(math.Abs(x.Advance) < 90) {
		return &Error{key + ".advance", fmt.Sprintf("The %s angle of advance must lie between -90 and 90 degrees (got %g).", words, x.Advance)}
	}
	if x.Rod <= x.Throw {
		return &Error{key + ".rod", fmt.Sprintf("The %s rod %g mm is not longer than its throw %g mm; it must be much longer.", words, x.Rod, x.Throw)}
	}
	return nil
}

// sheaveAngle returns the sheave's rotation ahead of the crank in the
// forward running direction, radians. sense is +1 for external admission
// driven direct and -1 when internal admission or a reversing rocker inverts
// it (both together cancel); forward is false for the back-gear eccentric,
// whose position mirrors the forward one about the crank.
func (x Eccentric) sheaveAngle(sense float64, forward bool) float64 {
	a := (sense*90 + x.Advance) * math.Pi / 180
	if !forward {
		a = -a
	}
	return a
}

// Rocker is a rocking shaft between an eccentric rod and the valve rod.
// Its arms are measured square to the cylinder line in the rocker's middle
// position: positive above the pivot (+W), negative below. Arms on opposite
// sides reverse the motion; arms on one side keep it.
type Rocker struct {
	Pivot    Point   `json:"pivot"`     // mm, the rocking-shaft centre
	DriveArm float64 `json:"drive_arm"` // mm, signed: pivot to the eccentric-rod pin
	ValveArm float64 `json:"valve_arm"` // mm, signed: pivot to the valve-rod pin
	ValveRod float64 `json:"valve_rod"` // mm, valve-arm pin to the valve-spindle pin on the guide line; 0 when the arm works the spindle direct (a die in a slot)
}

// Reversing reports whether the rocker turns the motion round.
func (k Rocker) Reversing() bool { return k.DriveArm*k.ValveArm < 0 }

// Ratio returns the valve-arm length over the drive-arm length.
func (k Rocker) Ratio() float64 { return math.Abs(k.ValveArm / k.DriveArm) }

func (k Rocker) validate() error {
	switch {
	case !(k.DriveArm != 0) || !finiteNum(k.DriveArm):
		return &Error{"rocker.drive_arm", fmt.Sprintf("The rocker drive arm must be a non-zero length in mm (got %g).", k.DriveArm)}
	case !(k.ValveArm != 0) || !finiteNum(k.ValveArm):
		return &Error{"rocker.valve_arm", fmt.Sprintf("The rocker valve arm must be a non-zero length in mm (got %g).", k.ValveArm)}
	case !(k.ValveRod >= 0) || !finiteNum(k.ValveRod):
		return &Error{"rocker.valve_rod", fmt.Sprintf("The valve rod from the rocker must be a length of 0 mm or more (got %g).", k.ValveRod)}
	case !k.Pivot.Finite():
		return &Error{"rocker.pivot", "The rocker pivot position must be given in mm."}
	}
	return nil
}

// SingleEccentric is a valve gear with one eccentric per cylinder, keyed to
// the axle (fixed) or loose and driven by a stop (slip eccentric).
//
// A slip eccentric stands at its forward position for reverser >= 0 and, for
// reverser < 0 (the engine pushed backward until the stop picks the sheave
// up on its other side), at the mirror of that position about the crank: the
// same angle of advance for back running. A fixed eccentric ignores the
// reverser.
//
// Without a rocker the eccentric rod's far end is the valve-rod pin, which
// slides on the guide line W = Guide. Assembly: the rod runs forward from
// the axle when ValveCentreU > 0, backward when it is negative; with a
// rocker, the drive pin is held on the side of the line sheave->pivot that
// its middle position lies on with the sheave at the axle centre.
type SingleEccentric struct {
	Eccentric    Eccentric `json:"eccentric"`
	Slip         bool      `json:"slip"`             // loose sheave driven by a stop on the axle
	Admission    Admission `json:"admission"`        // the valve's admission, which sets where the sheave sits; must agree with the valve
	Rocker       *Rocker   `json:"rocker,omitempty"` // nil when the rod works the valve rod direct
	Guide        float64   `json:"guide"`            // mm, W of the valve-spindle guide line, parallel to the cylinder line
	ValveCentreU float64   `json:"valve_centre_u"`   // mm, U of the valve-spindle pin with the valve central: the spindle length
}

// Kind names the gear.
func (g SingleEccentric) Kind() string {
	if g.Slip {
		return "slip eccentric"
	}
	return "single eccentric"
}

// Validate checks every dimension and that the linkage closes all round.
func (g SingleEccentric) Validate(e Engine) error {
	if err := firstError(within("engine", e.Validate()), checkAdmission(g.Admission), g.Eccentric.validate("eccentric", "eccentric"),
		finiteField("guide", "valve guide height", g.Guide), finiteField("valve_centre_u", "valve central position", g.ValveCentreU)); err != nil {
		return err
	}
	if g.Rocker != nil {
		if err := g.Rocker.validate(); err != nil {
			return err
		}
	}
	return sweepCheck(e, g.Valve)
}

// singlePose is the solved linkage of a SingleEccentric.
type singlePose struct {
	crank, sheave, drive, arm, spindle Point
}

func (g SingleEccentric) sense() float64 {
	s := -g.Admission.sense()
	if g.Rocker != nil && g.Rocker.Reversing() {
		s = -s
	}
	return s
}

// solve places every joint at crank angle thetaDeg.
func (g SingleEccentric) solve(e Engine, thetaDeg float64, r Reverser) (singlePose, error) {
	var p singlePose
	if err := checkCall(thetaDeg, r); err != nil {
		return p, err
	}
	phi := crankRotation(e, thetaDeg)
	p.crank = onAxle(e.CrankRadius, phi)
	p.sheave = onAxle(g.Eccentric.Throw, phi+g.Eccentric.sheaveAngle(g.sense(), !g.Slip || r >= 0))
	guide0, along := Point{0, g.Guide}, Point{1, 0}
	k := g.Rocker
	if k == nil {
		var ok bool
		p.drive, ok = circleLine(p.sheave, g.Eccentric.Rod, guide0, along, sign(g.ValveCentreU))
		if !ok {
			return p, closeError("eccentric.rod", "The eccentric rod cannot reach the valve-spindle guide line", thetaDeg)
		}
		p.arm, p.spindle = p.drive, p.drive
		return p, nil
	}
	mid := k.Pivot.Add(Point{0, k.DriveArm})
	var ok bool
	p.drive, ok = circles(p.sheave, g.Eccentric.Rod, k.Pivot, math.Abs(k.DriveArm), sideOf(Point{}, k.Pivot, mid))
	if !ok {
		return p, closeError("eccentric.rod", "The eccentric rod cannot reach the rocker drive arm", thetaDeg)
	}
	p.arm = k.Pivot.Add(p.drive.Sub(k.Pivot).Scale(k.ValveArm / k.DriveArm))
	if k.ValveRod == 0 {
		p.spindle = p.arm
		return p, nil
	}
	armMid := k.Pivot.Add(Point{0, k.ValveArm})
	p.spindle, ok = circleLine(p.arm, k.ValveRod, guide0, along, sign(g.ValveCentreU-armMid.U))
	if !ok {
		return p, closeError("rocker.valve_rod", "The valve rod from the rocker cannot reach the valve-spindle guide line", thetaDeg)
	}
	return p, nil
}

// Valve returns the valve displacement (mm, positive forward) at crank angle
// thetaDeg with the reverser at r.
func (g SingleEccentric) Valve(e Engine, thetaDeg float64, r Reverser) (float64, error) {
	p, err := g.solve(e, thetaDeg, r)
	if err != nil {
		return 0, err
	}
	return valveResult(p.spindle.U-g.ValveCentreU, thetaDeg)
}

// Pose returns every joint of the gear at crank angle thetaDeg. Joints:
// "axle", "crank pin", "eccentric sheave centre", "eccentric rod pin", and
// with a rocker "rocker pivot", "rocker valve-arm pin" and (with a valve
// rod) "valve spindle pin". Bars: "crank", "eccentric", "eccentric rod",
// "rocker drive arm", "rocker valve arm", "valve rod".
func (g SingleEccentric) Pose(e Engine, thetaDeg float64, r Reverser) (Pose, error) {
	p, err := g.solve(e, thetaDeg, r)
	if err != nil {
		return Pose{}, err
	}
	valve, err := valveResult(p.spindle.U-g.ValveCentreU, thetaDeg)
	if err != nil {
		return Pose{}, err
	}
	var b poseBuilder
	axle := b.joint("axle", Point{})
	b.bar("crank", axle, b.joint("crank pin", p.crank))
	sheave := b.joint("eccentric sheave centre", p.sheave)
	b.bar("eccentric", axle, sheave)
	drive := b.joint("eccentric rod pin", p.drive)
	b.bar("eccentric rod", sheave, drive)
	if k := g.Rocker; k != nil {
		pivot := b.joint("rocker pivot", k.Pivot)
		b.bar("rocker drive arm", pivot, drive)
		arm := b.joint("rocker valve-arm pin", p.arm)
		b.bar("rocker valve arm", pivot, arm)
		if k.ValveRod > 0 {
			b.bar("valve rod", arm, b.joint("valve spindle pin", p.spindle))
		}
	}
	b.p.Valve = valve
	return b.p, nil
}

// checkAdmission rejects an admission that is neither internal nor
// external.
func checkAdmission(a Admission) error {
	if a != Internal && a != External {
		return &Error{"admission", "The gear must say whether the valve has internal or external admission: it sets where the eccentrics sit."}
	}
	return nil
}

// sign returns -1 for negative x, else +1.
func sign(x float64) float64 {
	if x < 0 {
		return -1
	}
	return 1
}
