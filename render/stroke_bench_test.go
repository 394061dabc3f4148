package render

import (
	"math"
	"testing"

	ftraster "github.com/golang/freetype/raster"
	"golang.org/x/image/math/fixed"
)

// The stroker was chosen by measuring it against freetype's raster.Stroke
// (round caps and joins) on the piston curve's polyline: 181 points over a
// 358 x 300 unit plot, 3 units wide. freetype's needs a 26.6 fixed-point
// path and cannot take cubics or dashes; both benchmarks start from the
// same points.

func pistonPolyline() []Point {
	pts := make([]Point, 0, 181)
	for a := 0; a <= 360; a += 2 {
		th := float64(a) * math.Pi / 180
		frac := (1 - math.Cos(th) + 5 - math.Sqrt(25-math.Pow(math.Sin(th), 2))) / 2
		pts = append(pts, Point{16 + float64(a)*358/360, 400 - 300*frac})
	}
	return pts
}

func BenchmarkStrokeOwn(b *testing.B) {
	var p Path
	for i, pt := range pistonPolyline() {
		if i == 0 {
			p.MoveTo(pt)
		} else {
			p.LineTo(pt)
		}
	}
	s := LineStyle{Width: 3}
	var n int
	for b.Loop() {
		n = len(Outline(p, s))
	}
	b.ReportMetric(float64(n), "segments")
}

// collector is a freetype raster.Adder that counts segments.
type collector struct{ n int }

func (c *collector) Start(a fixed.Point26_6)      { c.n++ }
func (c *collector) Add1(b fixed.Point26_6)       { c.n++ }
func (c *collector) Add2(b, d fixed.Point26_6)    { c.n++ }
func (c *collector) Add3(b, d, e fixed.Point26_6) { c.n++ }

func BenchmarkStrokeFreetype(b *testing.B) {
	var q ftraster.Path
	for i, pt := range pistonPolyline() {
		fp := fixed.Point26_6{X: fixed.Int26_6(pt.X * 64), Y: fixed.Int26_6(pt.Y * 64)}
		if i == 0 {
			q.Start(fp)
		} else {
			q.Add1(fp)
		}
	}
	var n int
	for b.Loop() {
		var c collector
		ftraster.Stroke(&c, q, fixed.Int26_6(3*64), ftraster.RoundCapper, ftraster.RoundJoiner)
		n = c.n
	}
	b.ReportMetric(float64(n), "segments")
}
