package setting

import (
	"fmt"
	"math"
)

// Admission says where the live steam is: outside the valve (External, as
// with a flat slide valve or an outside-admission piston valve) or between
// the two heads of a piston valve (Internal). It decides which way the valve
// must move to open a port to steam.
//
// Derivation, with the front port ahead (+u) of the back port on the seat:
//
//   - External: live steam surrounds the valve and the exhaust cavity lies
//     between the ports. The steam edge of the front port is its outer
//     (front) edge, covered by the valve's front face; moving the valve BACK
//     uncovers it. Moving the valve FORWARD carries the cavity over the front
//     port's inner edge and opens it to exhaust. The back port is the mirror
//     image: steam when the valve moves forward, exhaust when it moves back.
//   - Internal: live steam is between the heads and the exhaust at the ends.
//     The steam edge of the front port is its inner edge; moving the valve
//     FORWARD uncovers it; moving it back uncovers the outer edge to the
//     exhaust. The back port again is the mirror image.
//
// So with valve displacement x (positive forward) the front port's steam
// edge is passed by s*x - lap and its exhaust edge by -s*x - exhaust lap,
// the back port's by -s*x - lap and s*x - exhaust lap, where s is +1 for
// Internal and -1 for External. Mirroring the motion (x -> -x) turns one
// admission into the other with the same events.
type Admission int

// The two admission types. The zero value is neither, so a valve must say
// which it is.
const (
	External Admission = 1 // steam outside the valve (slide valves, some piston valves)
	Internal Admission = 2 // steam between the heads of a piston valve
)

// String returns "external" or "internal" (or a note for an invalid value).
func (a Admission) String() string {
	switch a {
	case External:
		return "external"
	case Internal:
		return "internal"
	}
	return fmt.Sprintf("admission(%d)", int(a))
}

// MarshalText writes "external" or "internal".
func (a Admission) MarshalText() ([]byte, error) {
	if a != External && a != Internal {
		return nil, &Error{"admission", fmt.Sprintf("The admission must be internal or external (got %d).", int(a))}
	}
	return []byte(a.String()), nil
}

// UnmarshalText reads "external" or "internal".
func (a *Admission) UnmarshalText(b []byte) error {
	switch string(b) {
	case "external":
		*a = External
	case "internal":
		*a = Internal
	default:
		return &Error{"admission", fmt.Sprintf("The admission must be \"internal\" or \"external\" (got %q).", b)}
	}
	return nil
}

// sense is +1 for internal admission and -1 for external: the sign of the
// valve displacement that opens the front port to steam.
func (a Admission) sense() float64 {
	if a == Internal {
		return 1
	}
	return -1
}

// End is the valve and port geometry at one end of the cylinder, in mm.
//
// The port is either a slot (Holes zero) of axial width PortWidth, or a ring
// of Holes drilled holes of diameter HoleDiameter round a piston-valve liner
// (PortWidth then zero or equal to HoleDiameter: the holes' diameter is the
// port's axial width).
type End struct {
	SteamLap   float64 `json:"steam_lap"`   // mm the valve overlaps the port's steam edge when central
	ExhaustLap float64 `json:"exhaust_lap"` // mm the valve overlaps the exhaust edge when central; negative = exhaust clearance
	PortWidth  float64 `json:"port_width"`  // mm, axial width of a slot port
	// PortLength is the slot's length across the direction of travel (mm),
	// used only for areas. Zero means the whole liner circumference
	// (pi x Valve.LinerDiameter) for a piston valve, or unknown (areas 0).
	PortLength   float64 `json:"port_length,omitempty"`
	Holes        int     `json:"holes,omitempty"`         // number of drilled holes in the ring; 0 for a slot
	HoleDiameter float64 `json:"hole_diameter,omitempty"` // mm, for a ring of holes
}

// Width returns the port's axial width in mm: the slot width, or the hole
// diameter for a ring of holes. No linear opening exceeds it.
func (p End) Width() float64 {
	if p.Holes > 0 {
		return p.HoleDiameter
	}
	return p.PortWidth
}

// Valve is the valve and its ports: the admission type and each end's laps
// and port. LinerDiameter is the piston-valve liner bore (mm), zero for a
// flat slide valve.
type Valve struct {
	Admission     Admission `json:"admission"`
	Front         End       `json:"front"`
	Back          End       `json:"back"`
	LinerDiameter float64   `json:"liner_diameter,omitempty"`
}

// End returns the geometry of the given end.
func (v Valve) End(end CylinderEnd) End {
	if end == Back {
		return v.Back
	}
	return v.Front
}

// finiteNum reports whether x is neither NaN nor infinite.
func finiteNum(x float64) bool { return !math.IsNaN(x) && !math.IsInf(x, 0) }

// Validate checks the valve; errors name the field as a key path
// ("front.port_width").
func (v Valve) Validate() error {
	if v.Admission != External && v.Admission != Internal {
		return &Error{"admission", fmt.Sprintf("The admission must be internal or external (got %d).", int(v.Admission))}
	}
	if !finiteNum(v.LinerDiameter) || v.LinerDiameter < 0 {
		return &Error{"liner_diameter", fmt.Sprintf("The liner diameter must be zero (a flat slide valve) or a positive length (got %g mm).", v.LinerDiameter)}
	}
	for _, end := range [2]CylinderEnd{Front, Back} {
		if err := v.End(end).validate(end, v.LinerDiameter); err != nil {
			return within(end.String(), err)
		}
	}
	return nil
}

// validate checks one end; name is "front" or "back" for the messages.
func (p End) validate(end CylinderEnd, liner float64) error {
	name := end.String()
	switch {
	case !finiteNum(p.SteamLap):
		return &Error{"steam_lap", fmt.Sprintf("The %s steam lap must be a number of mm (got %g).", name, p.SteamLap)}
	case !finiteNum(p.ExhaustLap):
		return &Error{"exhaust_lap", fmt.Sprintf("The %s exhaust lap must be a number of mm (got %g).", name, p.ExhaustLap)}
	case !finiteNum(p.PortLength) || p.PortLength < 0:
		return &Error{"port_length", fmt.Sprintf("The %s port length must be zero (whole liner, or unknown) or a positive length (got %g mm).", name, p.PortLength)}
	case p.Holes < 0:
		return &Error{"holes", fmt.Sprintf("The number of %s port holes must be zero (a slot port) or more (got %d).", name, p.Holes)}
	}
	if p.Holes == 0 {
		switch {
		case !finiteNum(p.PortWidth) || p.PortWidth <= 0:
			return &Error{"port_width", fmt.Sprintf("The %s port width must be a positive length (got %g mm).", name, p.PortWidth)}
		case p.HoleDiameter != 0:
			return &Error{"hole_diameter", fmt.Sprintf("The %s port has a hole diameter (%g mm) but no holes; give the number of holes, or set the hole diameter to zero for a slot.", name, p.HoleDiameter)}
		}
		return nil
	}
	switch {
	case !finiteNum(p.HoleDiameter) || p.HoleDiameter <= 0:
		return &Error{"hole_diameter", fmt.Sprintf("The %s port hole diameter must be a positive length (got %g mm).", name, p.HoleDiameter)}
	case p.PortWidth != 0 && math.Abs(p.PortWidth-p.HoleDiameter) > 1e-9*p.HoleDiameter:
		return &Error{"port_width", fmt.Sprintf("The %s port is a ring of holes, so its width is the hole diameter %g mm; leave the port width at zero (got %g mm).", name, p.HoleDiameter, p.PortWidth)}
	case p.PortLength != 0:
		return &Error{"port_length", fmt.Sprintf("The %s port is a ring of holes, which has no slot length; leave the port length at zero (got %g mm).", name, p.PortLength)}
	case liner > 0 && float64(p.Holes)*p.HoleDiameter > math.Pi*liner:
		return &Error{"holes", fmt.Sprintf("The %d holes of %g mm do not fit round a liner of %g mm bore (circumference %.1f mm).", p.Holes, p.HoleDiameter, liner, math.Pi*liner)}
	}
	return nil
}

// SteamEdge returns how far the valve's steam edge has passed the given
// end's port steam edge at valve displacement x (mm, positive forward):
// positive means open to steam by that much (before the port-width cap),
// negative means still lapped by that much. At a dead centre this is the
// lead.
func (v Valve) SteamEdge(end CylinderEnd, x float64) float64 {
	s := v.Admission.sense()
	if end == Back {
		return -s*x - v.Back.SteamLap
	}
	return s*x - v.Front.SteamLap
}

// ExhaustEdge returns how far the valve's exhaust edge has passed the given
// end's port exhaust edge at valve displacement x: positive means open to
// exhaust by that much, negative still covered.
func (v Valve) ExhaustEdge(end CylinderEnd, x float64) float64 {
	s := v.Admission.sense()
	if end == Back {
		return s*x - v.Back.ExhaustLap
	}
	return -s*x - v.Front.ExhaustLap
}

// SteamOpening returns the linear steam opening of the given end's port at
// valve displacement x: SteamEdge capped to [0, port width].
func (v Valve) SteamOpening(end CylinderEnd, x float64) float64 {
	return v.End(end).clamp(v.SteamEdge(end, x))
}

// ExhaustOpening returns the linear exhaust opening of the given end's port
// at valve displacement x: ExhaustEdge capped to [0, port width].
func (v Valve) ExhaustOpening(end CylinderEnd, x float64) float64 {
	return v.End(end).clamp(v.ExhaustEdge(end, x))
}

// clamp caps a linear opening to [0, Width].
func (p End) clamp(y float64) float64 {
	return math.Max(0, math.Min(p.Width(), y))
}

// slotLength returns the slot's length across the travel: PortLength, or the
// liner circumference, or 0 when unknown.
func (p End) slotLength(liner float64) float64 {
	if p.PortLength > 0 {
		return p.PortLength
	}
	return math.Pi * liner
}

// PortArea returns the open area in mm^2 of the given end's port when a valve
// edge has passed its port edge by opening mm (capped to [0, width]).
//
// A slot opens in proportion: area = opening x slot length, so it opens at
// full rate from the first movement. A round hole of diameter d uncovered to
// a depth h shows a circular segment, area (d^2/8)(a - sin a) with
// a = 2 acos(1 - 2h/d); near the edge that grows only as h^1.5, so a ring of
// holes opens gradually: at 10 %, 25 % and 50 % of the port width a slot is
// 10 %, 25 % and 50 % open, a hole 5.2 %, 19.6 % and 50 %. A slot of
// unknown length (no PortLength, no liner) gives area 0.
func (v Valve) PortArea(end CylinderEnd, opening float64) float64 {
	p := v.End(end)
	h := p.clamp(opening)
	if p.Holes == 0 {
		return h * p.slotLength(v.LinerDiameter)
	}
	return float64(p.Holes) * segmentArea(p.HoleDiameter, h)
}

// FullPortLength returns the length of port edge the valve edge crosses:
// the slot length for a slot, Holes x HoleDiameter for a ring of holes.
func (v Valve) FullPortLength(end CylinderEnd) float64 {
	p := v.End(end)
	if p.Holes > 0 {
		return float64(p.Holes) * p.HoleDiameter
	}
	return p.slotLength(v.LinerDiameter)
}

// EquivalentOpening returns the width of slot, as long as the port's full
// edge (FullPortLength), that has the same open area as the given end's port
// at a linear opening of opening mm: PortArea / FullPortLength. For a slot
// it is the linear opening itself; for a ring of holes it runs from 0 to
// pi/4 of the hole diameter (a round hole passes less than a square one),
// lagging the linear opening most at the first crack. Zero when the port
// length is unknown.
func (v Valve) EquivalentOpening(end CylinderEnd, opening float64) float64 {
	l := v.FullPortLength(end)
	if !(l > 0) {
		return 0
	}
	return v.PortArea(end, opening) / l
}

// segmentArea returns the area of the part of a circle of diameter d lying
// within h of one side (0 <= h <= d): a circular segment of height h.
func segmentArea(d, h float64) float64 {
	if h <= 0 {
		return 0
	}
	if h >= d {
		return math.Pi * d * d / 4
	}
	// central angle a of the segment; area = r^2 (a - sin a) / 2.
	r := d / 2
	a := 2 * math.Atan2(math.Sqrt(h*(d-h)), r-h)
	var aMinusSin float64
	if a < 0.1 {
		// series for a - sin a, free of cancellation for small a
		a2 := a * a
		aMinusSin = a * a2 / 6 * (1 - a2/20*(1-a2/42*(1-a2/72*(1-a2/110))))
	} else {
		aMinusSin = a - math.Sin(a)
	}
	return r * r * aMinusSin / 2
}
