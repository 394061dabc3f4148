package render

import (
	"fmt"
	"math"
)

// Progress draws, over whatever is on a screen w by h, a sign near its
// foot that something long is under way: the words, the share done
// (0 to 1) as a bar and a percentage. It is drawn the moment the work is
// asked for, so a tap is seen to be heard.
func Progress(c Canvas, w, h float64, words string, done float64, th Theme) {
	if !(w > 60) || !(h > 60) || math.IsInf(w, 0) || math.IsInf(h, 0) {
		return
	}
	done = math.Max(0, math.Min(1, done))
	if math.IsNaN(done) {
		done = 0
	}
	cw := math.Min(w-2*gap, 420)
	lines := Wrap(words, cw-2*cardPad, BodySize, true)
	ch := 2*cardPad + float64(len(lines))*lineStep(BodySize) + gap + 10
	box := Rect{Point{(w - cw) / 2, h - ch - 3*gap}, Point{(w + cw) / 2, h - 3*gap}}
	c.Fill(RoundRect(box, cardRadius), FillStyle{Color: th.Surface})
	c.Stroke(RoundRect(box, cardRadius), LineStyle{Color: th.Accent, Width: 2})
	in := box.Inset(cardPad)
	pct := fmt.Sprintf("%.0f %%", 100*done)
	drawLines(c, in.Min, lines, TextStyle{Color: th.Ink, Size: BodySize, Bold: true})
	c.Text(Point{in.Max.X, in.Min.Y}, pct, TextStyle{Color: th.Ink, Size: BodySize, HAlign: Right, VAlign: Top})
	bar := Rect{Point{in.Min.X, in.Max.Y - 10}, Point{in.Max.X, in.Max.Y}}
	c.Fill(RoundRect(bar, 5), FillStyle{Color: th.Grid})
	if done > 0 {
		c.Fill(RoundRect(Rect{bar.Min, Point{bar.Min.X + math.Max(10, done*bar.W()), bar.Max.Y}}, 5), FillStyle{Color: th.Accent})
	}
}
