package setting

import (
	"errors"
	"fmt"
	"math"
	"strings"
	"testing"
)

// goldenExtreme finds the rotation (radians) near guess where sign*crosshead
// is largest by golden-section search: an independent, purely numerical
// check on the closed-form dead centres.
func goldenExtreme(e Engine, guess, sign float64) float64 {
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

// engines used by several tests: centred, offset both ways, short rod.
var testEngines = []Engine{
	{CrankRadius: 38, RodLength: 228},
	{CrankRadius: 38, RodLength: 228, Offset: 25},
	{CrankRadius: 38, RodLength: 228, Offset: -40, Inclination: 7},
	{CrankRadius: 50, RodLength: 110, Offset: 30},
}

func TestDeadCentresAgainstSearch(t *testing.T) {
	for _, e := range testEngines {
		t.Run(fmt.Sprintf("%+v", e), func(t *testing.T) {
			c, err := e.Prepare()
			if err != nil {
				t.Fatal(err)
			}
			front := goldenExtreme(e, 0, 1)
			back := goldenExtreme(e, math.Pi, -1)
			// the search is limited by the flatness of the extreme: about
			// sqrt(machine epsilon)
			near(t, "front rotation", c.front, front, 1e-6)
			near(t, "back dead centre", c.BackDeadCentre(), math.Mod((back-front)*180/math.Pi+720, 360), 1e-4)
			near(t, "stroke", c.Stroke(), e.crosshead(front)-e.crosshead(back), 1e-9)
			near(t, "fraction at front", c.PistonFraction(0), 0, 1e-12)
			near(t, "fraction at back", c.PistonFraction(c.BackDeadCentre()), 1, 1e-12)
			if e.Offset == 0 {
				near(t, "centred back dead centre", c.BackDeadCentre(), 180, 1e-12)
			} else if math.Abs(c.BackDeadCentre()-180) < 1 {
				t.Errorf("offset engine: back dead centre %g should be well away from 180", c.BackDeadCentre())
			}
			// the Engine methods agree with the prepared form
			near(t, "Engine.CrossheadU", e.CrossheadU(77), c.CrossheadU(77), 0)
			near(t, "Engine.Stroke", e.Stroke(), c.Stroke(), 0)
		})
	}
}

func TestCrankAngleAtInvertsTravel(t *testing.T) {
	for _, e := range testEngines {
		c, _ := e.Prepare()
		for _, end := range []CylinderEnd{Front, Back} {
			for _, dir := range []Direction{Forward, Backward} {
				from, to := c.StrokeLeaving(end, dir)
				for _, f := range []float64{0, 1e-9, 0.001, 0.1, 0.25, 0.5, 0.75, 0.999, 1} {
					th, err := c.CrankAngleAt(f, end, dir)
					if err != nil {
						t.Fatal(err)
					}
					name := fmt.Sprintf("%+v %s %s %g", e, end, dir, f)
					inside := (th >= from-1e-12 && th <= to+1e-12) || (to == 360 && th == 0)
					if !inside {
						t.Errorf("%s: crank angle %g outside the stroke [%g, %g]", name, th, from, to)
					}
					near(t, name+" travel", c.TravelFrom(end, th), f, 1e-9)
				}
			}
		}
	}
	// the piston moves away from the end: later in the running direction is
	// further along
	c, _ := testEngines[1].Prepare()
	a, _ := c.CrankAngleAt(0.3, Front, Backward)
	b, _ := c.CrankAngleAt(0.6, Front, Backward)
	if !(b < a) {
		t.Errorf("running backward the front stroke should come at falling crank angles: 30 %% at %g, 60 %% at %g", a, b)
	}
	// by crosshead position: 40 % of the stroke from the back, running forward
	u := c.DeadCentreU(Back) + 0.4*c.Stroke()
	th, err := c.CrankAngleAtCrosshead(u, Back, Forward)
	if err != nil {
		t.Fatal(err)
	}
	near(t, "crosshead at the angle found", c.CrossheadU(th), u, 1e-9)
	if th < c.BackDeadCentre() {
		t.Errorf("running forward the back stroke follows back dead centre; got %g", th)
	}
	if _, err := c.CrankAngleAtCrosshead(c.DeadCentreU(Front)+1, Front, Forward); err == nil {
		t.Error("a crosshead position beyond the travel was accepted")
	}
	if _, err := c.CrankAngleAt(math.NaN(), Front, Forward); err == nil {
		t.Error("NaN fraction accepted")
	}
	if _, err := c.CrankAngleAt(0.5, Front, 0); err == nil {
		t.Error("direction 0 accepted")
	}
}

func TestEngineValidateNamesField(t *testing.T) {
	cases := []struct {
		e     Engine
		field string
		says  string
	}{
		{Engine{CrankRadius: 57, RodLength: 40}, "rod_length", "connecting rod 40 mm is shorter than the crank radius 57 mm"},
		{Engine{CrankRadius: 0, RodLength: 40}, "crank_radius", "crank radius must be a positive length"},
		{Engine{CrankRadius: math.NaN(), RodLength: 40}, "crank_radius", "positive"},
		{Engine{CrankRadius: 10, RodLength: math.Inf(1)}, "rod_length", "positive"},
		{Engine{CrankRadius: 10, RodLength: 40, Offset: 30}, "offset", "too large"},
		{Engine{CrankRadius: 10, RodLength: 40, Inclination: 90}, "inclination", "between -90 and 90"},
	}
	for _, c := range cases {
		err := c.e.Validate()
		var e *Error
		if !errors.As(err, &e) || e.Field != c.field || !strings.Contains(e.Message, c.says) {
			t.Errorf("%+v: got %v, want field %s saying %q", c.e, err, c.field, c.says)
		}
		if _, err := c.e.CrankAngleAt(0.5, Front, Forward); err == nil {
			t.Errorf("%+v: CrankAngleAt accepted a bad engine", c.e)
		}
	}
}
