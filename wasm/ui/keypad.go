package ui

import (
	"math"
	"strconv"
	"strings"

	"evenbeat/render"
)

// Key is one key of the on-canvas keypad.
type Key uint8

// The keypad's keys.
const (
	Key0 Key = iota
	Key1
	Key2
	Key3
	Key4
	Key5
	Key6
	Key7
	Key8
	Key9
	KeyPoint  // decimal point
	KeySign   // change the sign
	KeyDelete // delete the last character
	KeyNext   // commit the entry and go to the next field
	KeySlash  // the fraction bar of an inch fraction ("3/16")
	KeySpace  // between the whole inches and the fraction ("1 3/16")
)

// Label is the key's caption.
func (k Key) Label() string {
	switch {
	case k <= Key9:
		return string(rune('0' + k))
	case k == KeyPoint:
		return "."
	case k == KeySign:
		return "+/-"
	case k == KeyDelete:
		return "Del"
	case k == KeySlash:
		return "/"
	case k == KeySpace:
		return "Space"
	}
	return "Next"
}

// keyRows is the keypad's arrangement, as on a calculator; Next spans the
// last three columns of the bottom row. With fractions (an inch length)
// the bottom row also holds the space and the fraction bar, so that
// "1 3/16" is typed as it is written.
func keyRows(fractions bool) [4][4]Key {
	rows := [4][4]Key{
		{Key7, Key8, Key9, KeyDelete},
		{Key4, Key5, Key6, KeySign},
		{Key1, Key2, Key3, KeyPoint},
		{Key0, KeyNext, KeyNext, KeyNext},
	}
	if fractions {
		rows[3] = [4]Key{Key0, KeySpace, KeySlash, KeyNext}
	}
	return rows
}

// Keypad sizes, logical units (CSS px).
const (
	// KeyHeight is a key's height: above the 48 CSS px a fingertip needs,
	// with room for oily fingers.
	KeyHeight = 60
	// KeyGap is the space between keys.
	KeyGap = 8
	// KeypadHeight is the keypad's height: four rows of keys.
	KeypadHeight = 4*KeyHeight + 3*KeyGap
	// KeypadMinHeight is the keypad's least height: four rows of keys a
	// fingertip (render.HitMin) tall.
	KeypadMinHeight = 4*render.HitMin + 3*KeyGap
)

// KeyRect is one key's place on the screen.
type KeyRect struct {
	Key  Key
	Rect render.Rect
}

// LayoutKeypad lays the keypad out across the bottom of box: four columns
// of keys (Next three columns wide, or one beside the space and the
// fraction bar with fractions), KeyHeight tall when box has the room
// (KeypadHeight in all), shorter in a lower box, but never under
// render.HitMin (KeypadMinHeight in all).
func LayoutKeypad(box render.Rect, fractions bool) []KeyRect {
	w := (box.W() - 3*KeyGap) / 4
	kh := max(render.HitMin, min(KeyHeight, (box.H()-3*KeyGap)/4))
	top := box.Max.Y - (4*kh + 3*KeyGap)
	var out []KeyRect
	for r, row := range keyRows(fractions) {
		y := top + float64(r)*(kh+KeyGap)
		for col := 0; col < 4; col++ {
			k := row[col]
			if col > 0 && row[col-1] == k {
				continue // a key spanning columns is laid out once
			}
			span := 1
			for col+span < 4 && row[col+span] == k {
				span++
			}
			x := box.Min.X + float64(col)*(w+KeyGap)
			out = append(out, KeyRect{k, render.Rect{
				Min: render.Point{X: x, Y: y},
				Max: render.Point{X: x + float64(span)*w + float64(span-1)*KeyGap, Y: y + kh}}})
		}
	}
	return out
}

// keyAt returns the key under pt.
func keyAt(keys []KeyRect, pt render.Point) (Key, bool) {
	for _, k := range keys {
		if k.Rect.Contains(pt) {
			return k.Key, true
		}
	}
	return 0, false
}

// maxEntry bounds the length of a typed number: more digits than any gauge
// shows.
const maxEntry = 12

// press applies key k (not Next) to the typed text and returns the new
// text.
func press(text string, k Key) string {
	switch {
	case k <= Key9:
		if len(strings.TrimPrefix(text, "-")) >= maxEntry {
			return text
		}
		return text + k.Label()
	case k == KeyPoint:
		if strings.ContainsAny(text, "./ ") {
			return text
		}
		if strings.TrimPrefix(text, "-") == "" {
			return text + "0."
		}
		return text + "."
	case k == KeySign:
		if strings.HasPrefix(text, "-") {
			return text[1:]
		}
		return "-" + text
	case k == KeyDelete:
		if text == "" {
			return text
		}
		return text[:len(text)-1]
	case k == KeySpace:
		// Once, after the whole inches and before any point or bar.
		if !endsInDigit(text) || strings.ContainsAny(text, " ./") {
			return text
		}
		return text + " "
	case k == KeySlash:
		// Once, after the numerator, in a number without a point.
		if !endsInDigit(text) || strings.ContainsAny(text, "./") {
			return text
		}
		return text + "/"
	}
	return text
}

// endsInDigit reports whether text ends in a digit.
func endsInDigit(text string) bool {
	return text != "" && text[len(text)-1] >= '0' && text[len(text)-1] <= '9'
}

// formatNumber shows a length in the display unit as plain digits the
// keypad could have typed: mm to the hundredth, inches to the ten-thousandth,
// without trailing zeros.
func formatNumber(mm float64, inch bool) string {
	v, dec := mm, 2
	if inch {
		v, dec = mm/25.4, 4
	}
	p := math.Pow(10, float64(dec))
	v = math.Round(v*p) / p
	if v == 0 {
		v = 0 // no "-0"
	}
	s := strings.TrimRight(strings.TrimRight(strconv.FormatFloat(v, 'f', dec, 64), "0"), ".")
	if s == "" || s == "-" {
		return "0"
	}
	return s
}

// wholeFraction reports whether text ends in a whole inch fraction: a bar
// and below it 2, 4, 8, 16, 32 or 64. No other of these begins one of
// them, so the fraction cannot go on: the keypad takes it as typed, with
// no Next.
func wholeFraction(text string) bool {
	_, den, ok := strings.Cut(text, "/")
	if !ok {
		return false
	}
	switch den {
	case "2", "4", "8", "16", "32", "64":
		return true
	}
	return false
}
