package ui

import (
	"fmt"
	"strconv"
	"strings"

	"evenbeat/render"
	"evenbeat/setting"
	"evenbeat/setting/session"
)

// The plausible ranges of the set-up values span the smallest live-steam
// models (3.5 in gauge) to full-size engines: common practice, no source;
// the figures are from memory. Outside them an entry is taken with a
// sentence asking for a second look.

// dimensionFields are the engine's dimensions asked at set-up, the
// engine's first and then its gear's (those a fitter can measure on that
// kind of gear), each with the demo design's value as its default and the
// session file's path as its Key (which also names its sketch). A port
// drilled as a ring of holes has no slot width to ask.
func dimensionFields(s *session.Session) []field {
	fs := []field{
		dim("engine.engine.crank_radius", "Crank radius", "Half the piston stroke: measure the stroke on the slide bar between the two dead centres and halve it.", 5, 600,
			func(s *session.Session) *float64 { return &s.Engine.Engine.CrankRadius }),
		dim("engine.engine.rod_length", "Connecting rod", "Centre to centre of the connecting rod, crosshead pin to crank pin.", 20, 4000,
			func(s *session.Session) *float64 { return &s.Engine.Engine.RodLength }),
		dim("engine.valve.front.steam_lap", "Front steam lap", "How far the valve's front steam edge overlaps the front port with the valve central, from the drawing or measured with the cover off.", 0, 60,
			func(s *session.Session) *float64 { return &s.Engine.Valve.Front.SteamLap }),
		dim("engine.valve.back.steam_lap", "Back steam lap", "The same overlap at the back port.", 0, 60,
			func(s *session.Session) *float64 { return &s.Engine.Valve.Back.SteamLap }),
		dim("engine.valve.front.exhaust_lap", "Front exhaust lap", "How far the valve's front exhaust edge overlaps the front port with the valve central; negative when the port is already open to exhaust (clearance).", -20, 30,
			func(s *session.Session) *float64 { return &s.Engine.Valve.Front.ExhaustLap }),
		dim("engine.valve.back.exhaust_lap", "Back exhaust lap", "The same at the back port.", -20, 30,
			func(s *session.Session) *float64 { return &s.Engine.Valve.Back.ExhaustLap }),
		dim("engine.valve.front.port_width", "Front port width", "The front steam port's width along the cylinder, edge to edge on the port face.", 0.5, 120,
			func(s *session.Session) *float64 { return &s.Engine.Valve.Front.PortWidth }),
		dim("engine.valve.back.port_width", "Back port width", "The back steam port's width, edge to edge.", 0.5, 120,
			func(s *session.Session) *float64 { return &s.Engine.Valve.Back.PortWidth }),
		dim("measuring.wheel_diameter_mm", "Wheel diameter", "Diameter of the driving wheel on the tread, where you will mark the tyre.", 40, 2500,
			func(s *session.Session) *float64 { return &s.Measuring.WheelDiameterMM }),
	}
	out := fs[:0]
	for _, f := range fs {
		holes := s.Engine.Valve.Front.Holes > 0
		if strings.HasPrefix(f.Key, "engine.valve.back.") {
			holes = s.Engine.Valve.Back.Holes > 0
		}
		if !(holes && strings.HasSuffix(f.Key, ".port_width")) {
			out = append(out, f)
		}
	}
	return append(out, gearFields(s.Engine.Gear.Kind)...)
}

// dim is one set-up length at the session's place p.
func dim(key, label, say string, lo, hi float64, p func(s *session.Session) *float64) field {
	return field{Key: key, Step: "The engine", Label: label, Say: say, Lo: lo, Hi: hi,
		get: func(s *session.Session) (float64, bool) {
			if v := p(s); v != nil {
				return *v, true
			}
			return 0, false
		},
		set: func(s *session.Session, v float64) {
			if q := p(s); q != nil {
				*q = v
			}
		}}
}

// gearDim is one of the gear's dimensions: step "The gear", nothing when
// the session's gear has no member of that kind.
func gearDim(key, label, say string, lo, hi float64, p func(s *session.Session) *float64) field {
	f := dim(key, label, say, lo, hi, p)
	f.Step = "The gear"
	return f
}

// gearAngle is one of the gear's angles, in degrees.
func gearAngle(key, label, say string, lo, hi float64, p func(s *session.Session) *float64) field {
	f := gearDim(key, label, say, lo, hi, p)
	f.Angle = true
	return f
}

// gearFields are the dimensions of a gear of the kind given that a fitter
// can measure on the engine or take from its drawing.
func gearFields(kind string) []field {
	switch kind {
	case setting.KindSingleEccentric:
		e := func(s *session.Session) *setting.Eccentric {
			if g := s.Engine.Gear.SingleEccentric; g != nil {
				return &g.Eccentric
			}
			return nil
		}
		return eccentricFields("engine.gear.single_eccentric.eccentric", "Eccentric", e)
	case setting.KindStephenson:
		st := func(s *session.Session) *setting.Stephenson { return s.Engine.Gear.Stephenson }
		ecc := func(back bool) func(s *session.Session) *setting.Eccentric {
			return func(s *session.Session) *setting.Eccentric {
				if g := st(s); g != nil {
					if back {
						return &g.Backward
					}
					return &g.Forward
				}
				return nil
			}
		}
		fs := append(eccentricFields("engine.gear.stephenson.forward", "Forward eccentric", ecc(false)),
			eccentricFields("engine.gear.stephenson.backward", "Backward eccentric", ecc(true))...)
		of := func(get func(g *setting.Stephenson) *float64) func(s *session.Session) *float64 {
			return func(s *session.Session) *float64 {
				if g := st(s); g != nil {
					return get(g)
				}
				return nil
			}
		}
		const p = "engine.gear.stephenson."
		return append(fs,
			gearDim(p+"link.radius", "Link radius", "The expansion link's radius, to the centre line of its slot: from the drawing, or from a template laid in the slot.", 20, 4000,
				of(func(g *setting.Stephenson) *float64 { return &g.Link.Radius })),
			gearDim(p+"link.pin_spacing", "Link pin spacing", "Straight across from the forward eccentric rod's pin to the backward one's on the link.", 5, 1000,
				of(func(g *setting.Stephenson) *float64 { return &g.Link.PinSpacing })),
			gearDim(p+"reverse_arm", "Reverse arm", "Weighshaft centre to the lifting link's pin on the reverse arm.", 5, 1500,
				of(func(g *setting.Stephenson) *float64 { return &g.ReverseArm })),
			gearDim(p+"lifting_link", "Lifting link", "The lifting link, centre to centre of its pins.", 5, 1500,
				of(func(g *setting.Stephenson) *float64 { return &g.LiftingLink })),
		)
	case setting.KindWalschaerts:
		of := func(get func(g *setting.Walschaerts) *float64) func(s *session.Session) *float64 {
			return func(s *session.Session) *float64 {
				if g := s.Engine.Gear.Walschaerts; g != nil {
					return get(g)
				}
				return nil
			}
		}
		const p = "engine.gear.walschaerts."
		return []field{
			gearDim(p+"return_crank", "Return crank", "Main crank-pin centre to the return crank's pin.", 2, 500,
				of(func(g *setting.Walschaerts) *float64 { return &g.ReturnCrank })),
			gearAngle(p+"return_angle", "Return crank angle", "How far the return crank points ahead of the main crank, in the forward running sense, degrees.", -180, 180,
				of(func(g *setting.Walschaerts) *float64 { return &g.ReturnAngle })),
			gearDim(p+"eccentric_rod", "Eccentric rod", "Return-crank pin to the link-foot pin, centre to centre.", 20, 4000,
				of(func(g *setting.Walschaerts) *float64 { return &g.EccentricRod })),
			gearDim(p+"link_radius", "Link radius", "The expansion link's radius, to the centre line of its slot.", 20, 4000,
				of(func(g *setting.Walschaerts) *float64 { return &g.LinkRadius })),
			gearDim(p+"radius_rod", "Radius rod", "Die-block centre to the radius rod's pin on the combination lever.", 20, 5000,
				of(func(g *setting.Walschaerts) *float64 { return &g.RadiusRod })),
			gearDim(p+"lever.valve_pin", "Lever: valve pin", "Along the combination lever from the radius-rod pin to the valve-spindle pin: positive toward the union link (inside admission), negative beyond the radius-rod pin (outside admission).", -500, 500,
				of(func(g *setting.Walschaerts) *float64 { return &g.Lever.ValvePin })),
			gearDim(p+"lever.union_pin", "Lever: union pin", "Along the combination lever from the radius-rod pin to the union link's pin.", 5, 3000,
				of(func(g *setting.Walschaerts) *float64 { return &g.Lever.UnionPin })),
			gearDim(p+"union_link", "Union link", "The union link, crosshead-arm pin to the lever's pin, centre to centre.", 5, 1500,
				of(func(g *setting.Walschaerts) *float64 { return &g.UnionLink })),
		}
	}
	return nil
}

// eccentricFields are one eccentric's throw, angle of advance and rod.
func eccentricFields(path, name string, e func(s *session.Session) *setting.Eccentric) []field {
	of := func(get func(e *setting.Eccentric) *float64) func(s *session.Session) *float64 {
		return func(s *session.Session) *float64 {
			if x := e(s); x != nil {
				return get(x)
			}
			return nil
		}
	}
	return []field{
		gearDim(path+".throw", name+": throw", "Axle centre to the sheave's centre: half the travel it gives; measure the sheave's widest and narrowest sides from the axle and halve the difference.", 2, 300,
			of(func(e *setting.Eccentric) *float64 { return &e.Throw })),
		gearAngle(path+".advance", name+": advance", "Angle of advance: how far the sheave is set ahead of square to the crank, degrees.", -10, 45,
			of(func(e *setting.Eccentric) *float64 { return &e.Advance })),
		gearDim(path+".rod", name+": rod", "The eccentric rod from the sheave's centre to the pin at its far end.", 20, 4000,
			of(func(e *setting.Eccentric) *float64 { return &e.Rod })),
	}
}

// parseEntry reads the typed text of field f: degrees for an angle, else a
// length in the display unit turned into mm.
func (a *App) parseEntry(f field, text string) (float64, error) {
	if f.Angle {
		v, err := strconv.ParseFloat(text, 64)
		if err != nil {
			return 0, fmt.Errorf("%q is not a number of degrees.", text)
		}
		return v, nil
	}
	return session.ParseLength(text, a.unit())
}

// fieldUnit is the unit shown beside field f's entry.
func (a *App) fieldUnit(f field) string {
	if f.Angle {
		return "deg"
	}
	return a.unitLabel()
}

// showValue is v of field f as the keypad would have typed it.
func (a *App) showValue(f field, v float64) string {
	if f.Angle {
		return strings.TrimSuffix(strings.TrimRight(strconv.FormatFloat(v, 'f', 2, 64), "0"), ".")
	}
	return formatNumber(v, a.unit() == session.UnitInch)
}

// assembles checks the engine after a set-up value changed: the sentence
// from setting naming the part that does not fit (a link that cannot
// close, a lever pin on the wrong side...), or "".
func (a *App) assembles() string {
	if err := a.Session().Engine.Validate(); err != nil {
		return sentence(err)
	}
	return ""
}

// hasSketch reports whether render draws a sketch for key.
func hasSketch(key string, th render.Theme) bool {
	return render.DimensionSketch(nopCanvas{}, render.Rect{}, key, th)
}

// nopCanvas draws nothing: hasSketch asks render whether a key has a
// sketch with it.
type nopCanvas struct{}

func (nopCanvas) Size() (float64, float64)                    { return 0, 0 }
func (nopCanvas) Fill(render.Path, render.FillStyle)          {}
func (nopCanvas) Stroke(render.Path, render.LineStyle)        {}
func (nopCanvas) Text(render.Point, string, render.TextStyle) {}
