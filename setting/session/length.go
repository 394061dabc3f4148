package session

import (
	"fmt"
	"math"
	"strconv"
	"strings"
	"unicode"
)

// MMPerInch is the exact length of the inch in mm.
const MMPerInch = 25.4

// ParseLength reads a length as a setter types it and returns mm:
// "0.13 mm", "0.13mm", "0.005in", "0.005 in", "0.005\"", "5 thou",
// "5 mil", "1/16", "1/16 in", "1 1/16in", "-0.3 mm", "0,13 mm" (a decimal
// comma). A number without a unit is in unit (the display unit); a
// fraction without a unit is inches, as fractions are an inch habit.
// Errors are *setting.Error sentences with Field "length".
func ParseLength(text string, unit Unit) (float64, error) {
	s := strings.TrimSpace(text)
	bad := func(why string) (float64, error) {
		return 0, userError("length", fmt.Sprintf("The entry %q is not a length: %s Write it as 0.13 mm, 0.005 in, 5 thou or 1/16 in.", text, why))
	}
	if s == "" {
		return bad("it is empty.")
	}
	s = strings.ReplaceAll(s, "\u2212", "-") // minus sign
	s = strings.ReplaceAll(s, "\u2033", "\"")
	s = strings.ReplaceAll(s, "\u201d", "\"")
	// Split off the unit: the trailing letters and quote marks.
	end := len(s)
	for end > 0 {
		r := rune(s[end-1])
		if unicode.IsLetter(r) || r == '"' || r == '.' && end < len(s) {
			end--
			continue
		}
		break
	}
	num, word := strings.TrimSpace(s[:end]), strings.ToLower(strings.TrimSpace(s[end:]))
	word = strings.TrimSuffix(word, ".")
	perUnit := 0.0
	switch word {
	case "mm", "millimetre", "millimetres", "millimeter", "millimeters":
		perUnit = 1
	case "in", "inch", "inches", "\"":
		perUnit = MMPerInch
	case "thou", "th", "mil", "mils":
		perUnit = MMPerInch / 1000
	case "":
	default:
		return bad(fmt.Sprintf("the unit %q is not one Evenbeat knows (mm, in, thou).", word))
	}
	if num == "" {
		return bad("there is no number.")
	}
	v, isFraction, ok := parseNumber(num)
	if !ok {
		return bad("the number cannot be read.")
	}
	if perUnit == 0 {
		switch {
		case isFraction, unit == UnitInch:
			perUnit = MMPerInch
		default:
			perUnit = 1
		}
	}
	mm := v * perUnit
	if math.IsNaN(mm) || math.IsInf(mm, 0) || math.Abs(mm) > maxLength {
		return bad("it is too large.")
	}
	return mm, nil
}

// parseNumber reads "0.13", "0,13", "-3", "1/16" or "1 1/16" (also
// "1-1/16").
func parseNumber(s string) (v float64, fraction, ok bool) {
	neg := false
	if strings.HasPrefix(s, "-") {
		neg, s = true, strings.TrimSpace(s[1:])
	} else if strings.HasPrefix(s, "+") {
		s = strings.TrimSpace(s[1:])
	}
	whole := 0.0
	if i := strings.IndexAny(s, " -"); i > 0 && strings.Contains(s[i:], "/") {
		w, err := strconv.ParseUint(s[:i], 10, 32)
		if err != nil {
			return 0, false, false
		}
		whole, s = float64(w), strings.TrimSpace(s[i+1:])
	}
	if a, b, isFrac := strings.Cut(s, "/"); isFrac {
		n, err1 := strconv.ParseUint(strings.TrimSpace(a), 10, 32)
		d, err2 := strconv.ParseUint(strings.TrimSpace(b), 10, 32)
		if err1 != nil || err2 != nil || d == 0 {
			return 0, false, false
		}
		v = whole + float64(n)/float64(d)
		fraction = true
	} else {
		if strings.Count(s, ",") == 1 && !strings.Contains(s, ".") {
			s = strings.Replace(s, ",", ".", 1)
		}
		for _, r := range s {
			if !(r >= '0' && r <= '9' || r == '.') {
				return 0, false, false
			}
		}
		f, err := strconv.ParseFloat(s, 64)
		if err != nil {
			return 0, false, false
		}
		v = f
	}
	if neg {
		v = -v
	}
	return v, fraction, true
}

// FormatLength shows a length in mm in the display unit: mm to the
// hundredth ("0.13 mm"), or inches to the thou ("0.005 in"), the way the
// gauge is read. Zero shows without a sign.
func FormatLength(mm float64, unit Unit) string {
	if math.IsNaN(mm) || math.IsInf(mm, 0) {
		return "?"
	}
	if unit == UnitInch {
		in := math.Round(mm/MMPerInch*1000) / 1000
		return strconv.FormatFloat(in+0, 'f', 3, 64) + " in"
	}
	v := math.Round(mm*100) / 100
	return strconv.FormatFloat(v+0, 'f', 2, 64) + " mm"
}
