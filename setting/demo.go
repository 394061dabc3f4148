package setting

// The demo engine is invented for this program: "Brackenfold", a 5 in gauge
// two-cylinder tank engine with 115 mm driving wheels, built three ways so
// each gear can be shown. Its numbers are plausible for the scale, not
// taken from any real engine or drawing, and were tuned with Events so that
// full-gear cut-off is 70-80 % and leads 0.1-0.3 mm at both ends in both
// directions (common practice for 5 in gauge, no source; see the primer's
// typical values). The same engines are in testdata/engines/*.json; a test
// keeps the two in step.

// demoEngine is the crank and cylinder shared by every variant: 44 mm
// stroke, a connecting rod six cranks long, cylinder line through the axle.
func demoEngine() Engine {
	return Engine{CrankRadius: 22, RodLength: 132}
}

// demoSlideValve is a flat slide valve: external admission, 2.4 mm steam
// lap, no exhaust lap, 2.4 x 16 mm ports.
func demoSlideValve() Valve {
	end := End{SteamLap: 2.4, ExhaustLap: 0, PortWidth: 2.4, PortLength: 16}
	return Valve{Admission: External, Front: end, Back: end}
}

// demoPistonValve is a 16 mm piston valve with internal admission, its
// ports a ring of eight 2.4 mm holes each end.
func demoPistonValve() Valve {
	end := End{SteamLap: 2.4, ExhaustLap: 0, Holes: 8, HoleDiameter: 2.4}
	return Valve{Admission: Internal, Front: end, Back: end, LinerDiameter: 16}
}

// DemoSlipEccentric returns the invented demo engine with a slip eccentric
// driving a slide valve direct.
func DemoSlipEccentric() EngineSpec {
	g := SingleEccentric{
		Eccentric:    Eccentric{Throw: 5, Advance: 31.3, Rod: 120},
		Slip:         true,
		Admission:    External,
		Guide:        0,
		ValveCentreU: 119.92,
	}
	return demoSpec("Brackenfold (slip eccentric)",
		"Slip eccentric on the axle, rod straight to the valve spindle; set the engine going the way it is to run before opening the regulator.",
		demoSlideValve(), GearSpec{Kind: KindSingleEccentric, SingleEccentric: &g}, nil)
}

// DemoStephenson returns the invented demo engine with inside Stephenson
// link motion, open rods, driving slide valves direct.
func DemoStephenson() EngineSpec {
	g := Stephenson{
		Forward:      Eccentric{Throw: 5.2, Advance: 28.6, Rod: 130},
		Backward:     Eccentric{Throw: 5.2, Advance: 29.1, Rod: 130.04},
		Admission:    External,
		Link:         ExpansionLink{Radius: 130, PinSpacing: 36},
		Weighshaft:   Point{U: 100, W: 45},
		ReverseArm:   30,
		MidArmAngle:  0,
		ArmSwing:     -33.7,
		LiftingLink:  45,
		Guide:        0,
		ValveCentreU: 129.94,
	}
	return demoSpec("Brackenfold (Stephenson)",
		"Inside Stephenson link motion with open rods, link hung by its middle, slide valves driven direct.",
		demoSlideValve(), GearSpec{Kind: KindStephenson, Stephenson: &g}, []Notch{{Name: "running notch", Reverser: 0.4}})
}

// DemoWalschaerts returns the invented demo engine with outside Walschaerts
// gear and internal-admission piston valves.
func DemoWalschaerts() EngineSpec {
	g := Walschaerts{
		ReturnCrank:  24.2,
		ReturnAngle:  149.72,
		EccentricRod: 63.39,
		Trunnion:     Point{U: 61.94, W: 41.59},
		LinkFoot:     Point{U: 0, W: -36},
		LinkRadius:   110,
		FullGearDie:  14.05,
		RadiusRod:    110,
		Lever:        CombinationLever{ValvePin: 7.09, UnionPin: 60},
		UnionLink:    40,
		CrossheadArm: Point{U: 0, W: -22},
		Guide:        35,
		ValveCentreU: 171.86,
	}
	return demoSpec("Brackenfold (Walschaerts)",
		"Outside Walschaerts gear, combination lever for 2.4 mm lap and 0.2 mm lead, piston valves with internal admission.",
		demoPistonValve(), GearSpec{Kind: KindWalschaerts, Walschaerts: &g}, []Notch{{Name: "running notch", Reverser: 0.4}})
}

// DemoEngines returns the three invented demo engines: slip eccentric,
// Stephenson and Walschaerts.
func DemoEngines() []EngineSpec {
	return []EngineSpec{DemoSlipEccentric(), DemoStephenson(), DemoWalschaerts()}
}

func demoSpec(name, notes string, v Valve, g GearSpec, notches []Notch) EngineSpec {
	return EngineSpec{
		Name:     name,
		Invented: true,
		Notes:    "Invented demo engine, not a real one: 5 in gauge, two cylinders, 115 mm driving wheels. " + notes,
		Engine:   demoEngine(),
		Valve:    v,
		Gear:     g,
		Notches:  notches,
		Cylinders: []Cylinder{
			{Name: "right", CrankAngle: 0},
			{Name: "left", CrankAngle: -90},
		},
	}
}
