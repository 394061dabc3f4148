package setting

import (
	"fmt"
	"math"
)

// Planar helpers shared by the gears. Every gear is drawn and solved in the
// cylinder-line frame of Engine: U along the cylinder line from the axle
// toward the front cover, W square to it, up; the axle centre is the origin.
//
// Assembly rule, used by every gear: a linkage that can close in two ways
// (two circles meet twice, a circle cuts a line twice) is held on the branch
// it has in its design position. Each gear works out, for each such joint,
// the side on which the joint lies in that position (+1 or -1, by a rule
// stated in the gear's documentation) and passes it to the helpers below,
// so every Valve call is solved afresh, with no memory of the last angle,
// and always lands on the same branch. Joints closed by Newton's method
// instead start from the design-like position and are checked to have
// stayed on its side.

// Point is a position or an offset in the cylinder-line frame, in mm.
type Point struct {
	U float64 `json:"u"` // along the cylinder line, toward the front cover
	W float64 `json:"w"` // square to the line, up
}

// Add returns p + q.
func (p Point) Add(q Point) Point { return Point{p.U + q.U, p.W + q.W} }

// Sub returns p - q.
func (p Point) Sub(q Point) Point { return Point{p.U - q.U, p.W - q.W} }

// Scale returns p scaled by k.
func (p Point) Scale(k float64) Point { return Point{p.U * k, p.W * k} }

// Len returns the length of p.
func (p Point) Len() float64 { return math.Hypot(p.U, p.W) }

// Dot returns the dot product of p and q.
func (p Point) Dot(q Point) float64 { return p.U*q.U + p.W*q.W }

// Cross returns the z component of p x q: positive when q lies
// anticlockwise of p (turning from +U toward +W).
func (p Point) Cross(q Point) float64 { return p.U*q.W - p.W*q.U }

// Left returns p turned a quarter turn anticlockwise (from +U toward +W).
func (p Point) Left() Point { return Point{-p.W, p.U} }

// turn returns p turned anticlockwise by the angle of cosine c and sine s.
func turn(p Point, c, s float64) Point { return Point{p.U*c - p.W*s, p.U*s + p.W*c} }

// Rotate returns p turned anticlockwise (from +U toward +W) by rad radians.
func (p Point) Rotate(rad float64) Point {
	s, c := math.Sincos(rad)
	return turn(p, c, s)
}

// Finite reports whether both coordinates are finite numbers.
func (p Point) Finite() bool { return finiteNum(p.U) && finiteNum(p.W) }

// onAxle returns the centre of something carried on the crank axle at radius
// r, set at rotation rad in the forward running direction from +U (the
// sense of Engine's crank: forward running turns +U toward -W).
func onAxle(r, rad float64) Point {
	s, c := math.Sincos(rad)
	return Point{r * c, -r * s}
}

// circles returns the meeting point of circle (c1, r1) and circle (c2, r2)
// that lies on side (+1 left, -1 right) of the line from c1 to c2. ok is false
// when the circles do not meet.
func circles(c1 Point, r1 float64, c2 Point, r2 float64, side float64) (p Point, ok bool) {
	d := c2.Sub(c1)
	dd := d.Dot(d)
	if dd == 0 {
		return Point{}, false
	}
	a := (r1*r1 - r2*r2 + dd) / (2 * dd) // along d, as a fraction of |d|
	h2 := r1*r1/dd - a*a                 // (height / |d|)^2
	if h2 < 0 {
		if h2 < -1e-12 {
			return Point{}, false
		}
		h2 = 0
	}
	h := side * math.Sqrt(h2)
	return Point{c1.U + a*d.U - h*d.W, c1.W + a*d.W + h*d.U}, true
}

// circleLine returns the point where circle (c, r) cuts the line through p0
// along the unit vector dir: the farther along dir when side is +1, the
// nearer when -1. ok is false when they do not meet.
func circleLine(c Point, r float64, p0, dir Point, side float64) (p Point, ok bool) {
	q := c.Sub(p0)
	t := q.Dot(dir)
	off := q.Cross(dir) // signed distance of the centre from the line
	h2 := r*r - off*off
	if h2 < 0 {
		return Point{}, false
	}
	t += side * math.Sqrt(h2)
	return p0.Add(dir.Scale(t)), true
}

// sideOf returns +1 when p lies left of the line from a to b, else -1.
func sideOf(a, b, p Point) float64 {
	if b.Sub(a).Cross(p.Sub(a)) >= 0 {
		return 1
	}
	return -1
}

// crankRotation returns the crank's rotation in radians from +U in the
// forward running direction at crank angle thetaDeg from front dead centre,
// from the engine's closed-form dead centres.
func crankRotation(e Engine, thetaDeg float64) float64 {
	if e.Offset == 0 { // the common case, without the dead-centre arithmetic
		return thetaDeg * (math.Pi / 180)
	}
	return e.prepare().rotation(thetaDeg)
}

// rootPos returns the square root of x, or 0 for negative x: a reach that
// falls short is taken as square, for starting points only. (math.Max is
// slower: it handles NaN and signed zeros.)
func rootPos(x float64) float64 {
	if x < 0 {
		return 0
	}
	return math.Sqrt(x)
}

// clamp returns x limited to [-lim, lim].
func clamp(x, lim float64) float64 {
	if x > lim {
		return lim
	}
	if x < -lim {
		return -lim
	}
	return x
}

// Joint is a named pin or point of a gear in one solved position.
type Joint struct {
	Name string // what the trade calls it ("crank pin", "die block")
	At   Point  // mm, cylinder-line frame
}

// Bar is a named link between two joints of a Pose.
type Bar struct {
	Name     string  // what the trade calls it ("eccentric rod")
	From, To int     // indices into Pose.Joints
	Radius   float64 // 0 for a straight bar; else a curved link drawn as an arc of this radius (mm), centre to the left of From->To when positive
}

// Pose is a gear solved at one crank angle and reverser position: every joint
// and link, for drawing the motion. Fixed points (axle, weighshaft, trunnion)
// are joints too.
type Pose struct {
	Joints []Joint
	Bars   []Bar
	Valve  float64 // mm, the valve displacement from central, positive forward
}

// Joint returns the position of the named joint and whether it exists.
func (p Pose) Joint(name string) (Point, bool) {
	for _, j := range p.Joints {
		if j.Name == name {
			return j.At, true
		}
	}
	return Point{}, false
}

// poseBuilder collects joints and bars by name.
type poseBuilder struct{ p Pose }

func (b *poseBuilder) joint(name string, at Point) int {
	b.p.Joints = append(b.p.Joints, Joint{name, at})
	return len(b.p.Joints) - 1
}

func (b *poseBuilder) bar(name string, from, to int) {
	b.p.Bars = append(b.p.Bars, Bar{Name: name, From: from, To: to})
}

func (b *poseBuilder) arc(name string, from, to int, radius float64) {
	b.p.Bars = append(b.p.Bars, Bar{Name: name, From: from, To: to, Radius: radius})
}

// closeError is the error for a linkage that cannot close at an angle;
// field is the key path of the link named in what.
func closeError(field, what string, thetaDeg float64) *Error {
	return &Error{field, fmt.Sprintf("%s at crank angle %.0f deg.", what, thetaDeg)}
}

// checkCall rejects a crank angle that is not a number and reverser
// positions outside full back to full forward.
func checkCall(thetaDeg float64, r Reverser) error {
	if !finiteNum(thetaDeg) {
		return &Error{"crank_angle", fmt.Sprintf("The crank angle must be a number of degrees (got %g).", thetaDeg)}
	}
	if !(r >= -1 && r <= 1) {
		return &Error{"reverser", fmt.Sprintf("The reverser position must lie between -1 (full back) and +1 (full forward) (got %g).", float64(r))}
	}
	return nil
}

// valveResult returns the valve displacement, or an error when unvalidated
// dimensions (NaN, infinite) have made it no number: output is never NaN.
func valveResult(v, thetaDeg float64) (float64, error) {
	if !finiteNum(v) {
		return 0, &Error{"", fmt.Sprintf("The gear's dimensions give no valve position at crank angle %.0f deg; check them with Validate.", thetaDeg)}
	}
	return v, nil
}

// positive returns an *Error naming field (a key path) unless v is a
// finite positive length; words name it in the message.
func positive(field, words string, v float64) error {
	if !(v > 0) || math.IsInf(v, 0) {
		return &Error{field, fmt.Sprintf("The %s must be a positive length in mm (got %g).", words, v)}
	}
	return nil
}

// finiteField returns an *Error naming field (a key path) unless v is
// finite; words name it in the message.
func finiteField(field, words string, v float64) error {
	if !finiteNum(v) {
		return &Error{field, fmt.Sprintf("The %s must be a number (got %g).", words, v)}
	}
	return nil
}

// firstError returns the first non-nil error.
func firstError(errs ...error) error {
	for _, err := range errs {
		if err != nil {
			return err
		}
	}
	return nil
}

// sweepCheck solves a gear every checkStepDeg degrees of crank in full
// forward, mid and full back gear, so Validate can report a linkage that cannot close
// before any event code meets it.
func sweepCheck(e Engine, valve func(Engine, float64, Reverser) (float64, error)) error {
	for _, r := range []Reverser{1, 0, -1} {
		for th := 0.0; th < 360; th += checkStepDeg {
			if _, err := valve(e, th, r); err != nil {
				return err
			}
		}
	}
	return nil
}

// newtonStep is the Newton step (mm) after which a linkage solution is
// taken as converged. Convergence is quadratic, the error left after a step
// of d being about d^2 / (link length): on the demo gears 1e-4 mm leaves
// at most 1.2e-11 mm in the valve (checked against fully converged
// solutions), far below the events' 1e-9 mm touch tolerance, and saves the
// last, confirming iteration.
const newtonStep = 1e-4

// startPasses is how many fixed-point passes refine a link's starting
// position before Newton's method.
const startPasses = 3

// warmPasses is as startPasses, from a start extrapolated from the last
// crank angles' solutions (Stephenson ValveCurve).
const warmPasses = 2

// checkStepDeg is the crank-angle step of the closing check in Validate.
const checkStepDeg = 10
