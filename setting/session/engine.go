package session

import (
	"bytes"
	"errors"
	"fmt"
	"strings"

	"evenbeat/setting"
)

// specInfo is what the session needs to know of an engine to check and
// convert readings.
type specInfo struct {
	engine        setting.Engine
	haveEngine    bool
	admission     setting.Admission
	gearKind      string // setting.KindStephenson, ...
	gearName      string // in words, for messages
	twoEccentrics bool
	notches       map[string]setting.Reverser // built-in and running notches
	notchOrder    []string
	stroke        float64
	cylinders     []string   // the engine's cylinder names; empty when it names none
	steamLap      [2]float64 // front, back
	portWidth     [2]float64 // front, back
	pistonValve   bool
}

// engine decodes an engine object with the engine decoder, placing its
// error's field under path.
func (d *decoder) engine(n *node, path string) (setting.EngineSpec, specInfo) {
	var spec setting.EngineSpec
	if d.err != nil {
		return spec, specInfo{}
	}
	if n.kind != nodeObject {
		d.fail(path, "must be the engine object {...}, got %s.", n.describe())
		return spec, specInfo{}
	}
	var buf bytes.Buffer
	n.writeCompact(&buf)
	spec, err := setting.DecodeEngineSpec(&buf)
	if err != nil {
		d.engineError(path, err)
		return spec, specInfo{}
	}
	return spec, infoOf(spec)
}

// engineError fails with an error of the engine reader, or of an engine
// patch, placing its field under path.
func (d *decoder) engineError(path string, err error) {
	field, msg := "", err.Error()
	var se *setting.Error
	if errors.As(err, &se) {
		field, msg = se.Field, se.Message
	}
	full := path
	if field != "" {
		full = path + "." + field
	}
	d.fail(full, "%s", msg)
}

// RunningNotches lists the notches a plan may make the cut-offs equal in,
// the values plan_aims.running_notch may take: full forward, then the
// engine's own notches.
func (s *Session) RunningNotches() []string {
	names := make([]string, len(s.Engine.Notches))
	for i, n := range s.Engine.Notches {
		names[i] = n.Name
	}
	return runningNotches(names)
}

// infoOf collects the facts the session uses from an engine.
func infoOf(spec setting.EngineSpec) specInfo {
	info := specInfo{
		engine:      spec.Engine,
		haveEngine:  spec.Engine.Validate() == nil,
		admission:   spec.Valve.Admission,
		gearKind:    spec.Gear.Kind,
		notches:     map[string]setting.Reverser{FullForward: 1, MidGear: 0, FullBack: -1},
		notchOrder:  []string{FullForward, MidGear, FullBack},
		steamLap:    [2]float64{spec.Valve.Front.SteamLap, spec.Valve.Back.SteamLap},
		portWidth:   [2]float64{spec.Valve.Front.Width(), spec.Valve.Back.Width()},
		pistonValve: spec.Valve.LinerDiameter > 0,
	}
	switch info.gearKind {
	case setting.KindStephenson:
		info.gearName, info.twoEccentrics = "Stephenson gear", true
	case setting.KindWalschaerts:
		info.gearName = "Walschaerts gear"
	default:
		info.gearName = "single-eccentric gear"
	}
	for _, n := range spec.Notches {
		if _, ok := info.notches[n.Name]; !ok {
			info.notchOrder = append(info.notchOrder, n.Name)
		}
		info.notches[n.Name] = n.Reverser
	}
	for _, c := range spec.Cylinders {
		info.cylinders = append(info.cylinders, c.Name)
	}
	if info.haveEngine {
		info.stroke = info.engine.Stroke()
	}
	return info
}

// encodeTree writes an engine spec as a tree, in the engine format's own
// key order.
func encodeTree(spec setting.EngineSpec) (*node, error) {
	raw, err := spec.AppendJSON(nil)
	if err != nil {
		return nil, err
	}
	return parseCompact(raw)
}

// allows says, as a sentence, why this engine's gear cannot have an
// adjustment of the given kind; "" when it can.
func (i specInfo) allows(kind AdjustmentKind, ecc Eccentric) string {
	ok := true
	switch kind {
	case EccentricAngle:
		ok = i.gearKind != setting.KindWalschaerts
	case ReturnCrankAngle, RadiusRodLength:
		ok = i.gearKind == setting.KindWalschaerts
	case LiftingLinkLength:
		ok = i.gearKind != setting.KindSingleEccentric
	}
	if !ok {
		return fmt.Sprintf("A %s has no %s to adjust; remove this adjustment.", i.gearName, strings.ReplaceAll(string(kind), "_", " "))
	}
	return ""
}
