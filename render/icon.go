package render

import (
	"image/color"
	"math"
)

// IconSafe is the fraction of an icon's side, centred, inside which all of
// its content lies: a maskable icon may be cropped to a circle of 80 %.
const IconSafe = 0.8

// Icon draws the app icon on a size by size square of c from the origin: a
// spoked driving wheel with its crank, and a valve curve (one turn of a
// sine) sweeping across it, on a full-bleed ground. Every mark except the
// ground lies within the central circle of IconSafe times size, so
// launchers may crop it to any shape.
func Icon(c Canvas, size float64) {
	if !(size > 0) || math.IsInf(size, 0) {
		return
	}
	var (
		ground = color.RGBA{0x12, 0x3a, 0x4a, 0xff}
		steel  = color.RGBA{0xf2, 0xe8, 0xd2, 0xff}
		amber  = color.RGBA{0xff, 0xb0, 0x3b, 0xff}
		shadow = color.RGBA{0x0a, 0x24, 0x2e, 0xff}
	)
	s := size
	ctr := Point{s / 2, s / 2}
	c.Fill(RectPath(Rect{Max: Point{s, s}}), FillStyle{Color: ground})

	// Wheel: tyre, spokes, boss.
	rim := 0.3 * s
	c.Stroke(Circle(ctr, rim), LineStyle{Color: steel, Width: 0.055 * s})
	var spokes Path
	for i := 0; i < 12; i++ {
		a := float64(i) * math.Pi / 6
		sn, cs := math.Sincos(a)
		spokes.MoveTo(Point{ctr.X + 0.07*s*cs, ctr.Y + 0.07*s*sn})
		spokes.LineTo(Point{ctr.X + rim*cs, ctr.Y + rim*sn})
	}
	c.Stroke(spokes, LineStyle{Color: steel, Width: 0.018 * s})
	c.Fill(Circle(ctr, 0.075*s), FillStyle{Color: steel})

	// Crank: a web from the boss to the pin, down and to the left, clear of
	// the curve.
	a := 135 * math.Pi / 180
	pin := Point{ctr.X + 0.17*s*math.Cos(a), ctr.Y + 0.17*s*math.Sin(a)}
	var crank Path
	crank.MoveTo(ctr)
	crank.LineTo(pin)
	c.Stroke(crank, LineStyle{Color: steel, Width: 0.07 * s})
	c.Fill(Circle(pin, 0.045*s), FillStyle{Color: shadow})
	c.Fill(Circle(pin, 0.028*s), FillStyle{Color: steel})

	// Valve curve: one turn of a sine across the wheel, dark under amber so
	// it reads on the steel and on the ground alike.
	var wave Path
	const n = 48
	for i := 0; i <= n; i++ {
		t := float64(i) / n
		pt := Point{ctr.X + (t-0.5)*0.64*s, ctr.Y - 0.13*s*math.Sin(2*math.Pi*t)}
		if i == 0 {
			wave.MoveTo(pt)
		} else {
			wave.LineTo(pt)
		}
	}
	c.Stroke(wave, LineStyle{Color: shadow, Width: 0.085 * s})
	c.Stroke(wave, LineStyle{Color: amber, Width: 0.05 * s})
}
