package setting

import (
	"errors"
	"fmt"
	"math"
	"strings"
	"testing"
)

// The admission decides which way the valve opens which port (derived in
// the Admission comment from the port layout; common practice, no source:
// an outside-admission slide valve moved back opens the front port).
func TestAdmissionOpensWhichPort(t *testing.T) {
	cases := []struct {
		adm                 Admission
		x                   float64 // valve displacement, beyond the lap
		frontSteam, backExh bool
	}{
		{External, -5, true, true},
		{External, +5, false, false},
		{Internal, +5, true, true},
		{Internal, -5, false, false},
	}
	for _, c := range cases {
		v := slideValve(c.adm, 2, 0.5, 3)
		fs := v.SteamOpening(Front, c.x) > 0
		be := v.ExhaustOpening(Back, c.x) > 0
		bs := v.SteamOpening(Back, c.x) > 0
		fe := v.ExhaustOpening(Front, c.x) > 0
		if fs != c.frontSteam || be != c.backExh || bs == fs || fe == be {
			t.Errorf("%s admission, valve at %+g mm: front steam %v back exhaust %v back steam %v front exhaust %v",
				c.adm, c.x, fs, be, bs, fe)
		}
		if got := v.SteamOpening(Front, c.x) + v.SteamOpening(Back, c.x); got != 3 {
			t.Errorf("%s at %+g: steam opening %g, want the port width 3 (capped)", c.adm, c.x, got)
		}
	}
	// central valve: lapped by the lap, exhaust lapped by the exhaust lap
	v := slideValve(External, 2, -0.4, 3)
	near(t, "steam edge central", v.SteamEdge(Front, 0), -2, 0)
	near(t, "exhaust edge central (clearance)", v.ExhaustEdge(Back, 0), 0.4, 0)
	near(t, "exhaust opening central", v.ExhaustOpening(Back, 0), 0.4, 0)
}

// A slot opens in proportion to the edge's travel, a ring of round holes
// gradually: the circular-segment area (d^2/8)(a - sin a),
// a = 2 acos(1 - 2h/d) (plane geometry; common knowledge, no source).
// The table is the one the Valve.PortArea comment quotes.
func TestSlotOpensSharplyHolesGradually(t *testing.T) {
	const d, n, liner = 6.0, 8, 40.0
	slot := Valve{Admission: Internal, LinerDiameter: liner,
		Front: End{SteamLap: 1, PortWidth: d}, Back: End{SteamLap: 1, PortWidth: d}}
	holes := Valve{Admission: Internal, LinerDiameter: liner,
		Front: End{SteamLap: 1, Holes: n, HoleDiameter: d}, Back: End{SteamLap: 1, Holes: n, HoleDiameter: d}}
	for _, c := range []struct{ frac, slotPct, holePct float64 }{
		{0.10, 10, 5.20}, {0.25, 25, 19.55}, {0.50, 50, 50}, {0.75, 75, 80.45}, {1, 100, 100},
	} {
		h := c.frac * d
		s := slot.PortArea(Front, h) / slot.PortArea(Front, d) * 100
		o := holes.PortArea(Front, h) / holes.PortArea(Front, d) * 100
		near(t, fmt.Sprintf("slot %% open at %g of the width", c.frac), s, c.slotPct, 1e-9)
		near(t, fmt.Sprintf("holes %% open at %g of the width", c.frac), o, c.holePct, 0.01)
		near(t, "slot equivalent opening", slot.EquivalentOpening(Front, h), h, 1e-12)
		if c.frac < 1 && c.frac != 0.5 && (c.frac < 0.5) != (holes.EquivalentOpening(Front, h) < math.Pi/4*h) {
			t.Errorf("at %g of the width the holes' equivalent opening %g should lag pi/4 x %g below half and lead above", c.frac, holes.EquivalentOpening(Front, h), h)
		}
	}
	near(t, "slot area, whole liner", slot.PortArea(Front, d), d*math.Pi*liner, 1e-9)
	near(t, "holes area full", holes.PortArea(Front, d), n*math.Pi*d*d/4, 1e-9)
	near(t, "holes equivalent full", holes.EquivalentOpening(Front, d), math.Pi/4*d, 1e-12)
	near(t, "beyond the port", holes.PortArea(Front, 2*d), holes.PortArea(Front, d), 0)
	near(t, "closed", holes.PortArea(Front, -1), 0, 0)
	// at the first crack a hole opens as h^1.5: (4/3) sqrt(d) h^1.5
	h := 1e-6
	near(t, "segment near the edge", segmentArea(d, h)/(4.0/3*math.Sqrt(d)*math.Pow(h, 1.5)), 1, 1e-5)
}

// segmentArea against a midpoint-rule integral of the chord length.
func TestSegmentAreaByIntegration(t *testing.T) {
	const d = 5.0
	for _, h := range []float64{0.001, 0.05, 0.3, 1, 2.5, 4, 4.999} {
		const steps = 200000
		sum := 0.0
		for i := range steps {
			y := (float64(i) + 0.5) * h / steps
			sum += 2 * math.Sqrt(y*(d-y)) * h / steps
		}
		near(t, fmt.Sprintf("segment area, h %g", h), segmentArea(d, h), sum, 1e-6*sum+1e-12)
	}
}

func TestValveValidateNamesField(t *testing.T) {
	good := End{SteamLap: 2, PortWidth: 3}
	cases := []struct {
		v     Valve
		field string
	}{
		{Valve{Front: good, Back: good}, "admission"},
		{Valve{Admission: External, Front: End{SteamLap: 2}, Back: good}, "front.port_width"},
		{Valve{Admission: External, Front: good, Back: End{SteamLap: math.NaN(), PortWidth: 3}}, "back.steam_lap"},
		{Valve{Admission: Internal, Front: good, Back: End{Holes: 3}}, "back.hole_diameter"},
		{Valve{Admission: Internal, Front: good, Back: End{Holes: -1, PortWidth: 3}}, "back.holes"},
		{Valve{Admission: Internal, Front: good, Back: End{HoleDiameter: 3, PortWidth: 3}}, "back.hole_diameter"},
		{Valve{Admission: Internal, LinerDiameter: 10, Front: End{Holes: 20, HoleDiameter: 3}, Back: good}, "front.holes"},
		{Valve{Admission: Internal, LinerDiameter: -10, Front: good, Back: good}, "liner_diameter"},
	}
	for _, c := range cases {
		err := c.v.Validate()
		var e *Error
		if !errors.As(err, &e) || e.Field != c.field || !strings.HasSuffix(e.Message, ".") {
			t.Errorf("%+v: got %v, want field %s", c.v, err, c.field)
		}
	}
	if err := (Valve{Admission: Internal, LinerDiameter: 40, Front: End{Holes: 8, HoleDiameter: 6, PortWidth: 6}, Back: good}).Validate(); err != nil {
		t.Errorf("holes with port width = hole diameter refused: %v", err)
	}
}

func TestAdmissionText(t *testing.T) {
	for _, a := range []Admission{External, Internal} {
		b, err := a.MarshalText()
		if err != nil {
			t.Fatal(err)
		}
		var back Admission
		if err := back.UnmarshalText(b); err != nil || back != a {
			t.Errorf("%s: round trip gave %v, %v", a, back, err)
		}
	}
	if _, err := Admission(0).MarshalText(); err == nil {
		t.Error("the zero admission was written")
	}
}

// The events of a piston valve with drilled ports give the open area of the
// ring of holes at the largest opening, and the same events as a slot:
// the port form changes the area, not the timing.
func TestEventsWithDrilledPorts(t *testing.T) {
	const d, n = 4.0, 10
	e := Engine{CrankRadius: 30, RodLength: 180}
	slot := Valve{Admission: Internal, LinerDiameter: 32,
		Front: End{SteamLap: 3, PortWidth: d}, Back: End{SteamLap: 3, PortWidth: d}}
	holes := slot
	holes.Front, holes.Back = End{SteamLap: 3, Holes: n, HoleDiameter: d}, End{SteamLap: 3, Holes: n, HoleDiameter: d}
	m := textbookMotion(5, 28, Internal) // opens 2 mm at most: half the holes' width
	a, err := Events(e, slot, m, Forward)
	if err != nil {
		t.Fatal(err)
	}
	b, err := Events(e, holes, m, Forward)
	if err != nil {
		t.Fatal(err)
	}
	near(t, "cut-off, slot and holes", b.Front.CutOff.StrokePercent, a.Front.CutOff.StrokePercent, 0)
	near(t, "max opening", b.Front.MaxOpening, 2, 1e-9)
	near(t, "slot area at the largest opening", a.Front.MaxOpeningArea, 2*math.Pi*32, 1e-9)
	// half-way across a round hole: half its area
	near(t, "holes area at the largest opening", b.Front.MaxOpeningArea, n*math.Pi*d*d/8, 1e-9)
}
