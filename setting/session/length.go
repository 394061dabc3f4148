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
// "5 mil", "-0.3 mm", "0,13 mm" (a decimal comma), and inches as a
// drawing gives them: fractions and mixed numbers, "3/16", "1 3/16",
// "1-3/16", "1 3/16 in", "-1/8". A number without a unit is in unit (the
// display unit: "0.012" is 0.012 in in an inch session); a fraction
// without a unit is inches, as fractions are an inch habit. Errors are
// *setting.Error sentences with Field "length" that quote what was typed
// and say what is wrong with it (a zero below the fraction bar, two
// fraction bars, a unit not known...).
func ParseLength(text string, unit Unit) (float64, error) {
	s := strings.TrimSpace(text)
	bad := func(why string) (float64, error) {
		return 0, userError("length", fmt.Sprintf("The entry %q is not a length: %s Write it as 0.13 mm, 0.005 in, 5 thou, 3/16 in or 1 3/16 in.", text, why))
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
	v, isFraction, why := parseNumber(num)
	if why != "" {
		return bad(why)
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
// "1-1/16"). When it cannot, why says in a sentence what is wrong with
// the number.
func parseNumber(s string) (v float64, fraction bool, why string) {
	neg := false
	if strings.HasPrefix(s, "-") {
		neg, s = true, strings.TrimSpace(s[1:])
	} else if strings.HasPrefix(s, "+") {
		s = strings.TrimSpace(s[1:])
	}
	if s == "" {
		return 0, false, "there is no number."
	}
	if strings.Contains(s, "/") {
		v, why = parseFraction(s)
		fraction = true
	} else {
		v, why = parseDecimal(s)
	}
	if neg {
		v = -v
	}
	return v, fraction, why
}

// parseFraction reads a fraction or a mixed number of inches: "3/16",
// "1 3/16", "1-3/16".
func parseFraction(s string) (float64, string) {
	if strings.Count(s, "/") > 1 {
		return 0, "it has more than one fraction bar (write a mixed number as 1 3/16)."
	}
	whole := 0.0
	if i := strings.LastIndexAny(s[:strings.Index(s, "/")], " -"); i >= 0 {
		w, err := strconv.ParseUint(strings.TrimSpace(s[:i]), 10, 32)
		if err != nil {
			return 0, fmt.Sprintf("the whole inches before the fraction (%q) are not a whole number.", strings.TrimSpace(s[:i]))
		}
		whole, s = float64(w), strings.TrimSpace(s[i+1:])
	}
	a, b, _ := strings.Cut(s, "/")
	a, b = strings.TrimSpace(a), strings.TrimSpace(b)
	switch {
	case a == "":
		return 0, "there is no number above the fraction bar."
	case b == "":
		return 0, "there is no number below the fraction bar."
	}
	n, err1 := strconv.ParseUint(a, 10, 32)
	d, err2 := strconv.ParseUint(b, 10, 32)
	switch {
	case err1 != nil || err2 != nil:
		return 0, "a fraction is written with whole numbers either side of the bar, as 3/16."
	case d == 0:
		return 0, "a fraction cannot have 0 below the bar."
	}
	return whole + float64(n)/float64(d), ""
}

// parseDecimal reads a decimal number without a sign: "0.13", "0,13",
// "12", ".5", "5.".
func parseDecimal(s string) (float64, string) {
	if strings.Count(s, ",") == 1 && !strings.Contains(s, ".") {
		s = strings.Replace(s, ",", ".", 1)
	}
	for _, r := range s {
		if !(r >= '0' && r <= '9' || r == '.') {
			return 0, "the number cannot be read (only digits, one decimal point and a fraction bar)."
		}
	}
	f, err := strconv.ParseFloat(s, 64)
	if err != nil {
		return 0, "the number cannot be read (only digits, one decimal point and a fraction bar)."
	}
	return f, ""
}

// FormatInches shows a length in mm as a setter writes inches off a
// drawing, without the unit: the nearest 1/64 in as a fraction or mixed
// number in lowest terms ("3/16", "1 3/16", "-1/8", "2") when the length
// is within 0.0005 in of it, else decimals to the thou, trailing zeros
// dropped ("0.012", "0.3"; "0.0125" keeps its fourth place, which the
// thou would round). ParseLength(FormatInches(mm), UnitInch) reads it
// back, exactly for a fraction, within half a thou otherwise. It is for
// set-up dimensions; a gauge reading keeps FormatLength's thou.
func FormatInches(mm float64) string {
	if math.IsNaN(mm) || math.IsInf(mm, 0) {
		return "?"
	}
	in := mm / MMPerInch
	sign := ""
	if in < 0 {
		sign, in = "-", -in
	}
	if n := math.Round(in * 64); math.Abs(in-n/64) <= fractionTolIn && n < 1<<40 {
		whole, rest := int64(n)/64, int64(n)%64
		if rest == 0 {
			if whole == 0 {
				return "0"
			}
			return sign + strconv.FormatInt(whole, 10)
		}
		den := int64(64)
		for rest%2 == 0 {
			rest, den = rest/2, den/2
		}
		frac := strconv.FormatInt(rest, 10) + "/" + strconv.FormatInt(den, 10)
		if whole == 0 {
			return sign + frac
		}
		return sign + strconv.FormatInt(whole, 10) + " " + frac
	}
	places := 3
	if t := math.Round(in * 1e4); math.Abs(in*1e4-t) < 1e-6 && math.Mod(t, 10) != 0 {
		places = 4 // a length typed to the ten-thousandth is shown as typed
	}
	text := strings.TrimRight(strconv.FormatFloat(in, 'f', places, 64), "0")
	text = strings.TrimSuffix(text, ".")
	if text == "0" {
		return "0"
	}
	return sign + text
}

// fractionTolIn is how near (in) a length must be to a 64th of an inch to
// be shown as a fraction: half a thou, below what a rule or a drawing's
// fraction tells.
const fractionTolIn = 0.0005

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
