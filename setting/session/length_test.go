package session

import (
	"errors"
	"fmt"
	"math"
	"strings"
	"testing"

	"evenbeat/setting"
)

// The inch is exactly 25.4 mm (international yard and pound agreement,
// 1959); a thou is a thousandth of an inch.
func TestParseLength(t *testing.T) {
	cases := []struct {
		in   string
		unit Unit
		mm   float64
	}{
		{"0.13 mm", UnitInch, 0.13},
		{"0.13mm", UnitInch, 0.13},
		{"0,13 mm", UnitMM, 0.13},
		{"0.005in", UnitMM, 0.127},
		{"0.005 in", UnitMM, 0.127},
		{"0.005 inch", UnitMM, 0.127},
		{`0.005"`, UnitMM, 0.127},
		{"5 thou", UnitMM, 0.127},
		{"5thou", UnitMM, 0.127},
		{"5 THOU", UnitMM, 0.127},
		{"5 mil", UnitMM, 0.127},
		{"1/16", UnitMM, 1.5875},
		{"1/16 in", UnitMM, 1.5875},
		{"1/16\"", UnitMM, 1.5875},
		{"1 1/16 in", UnitMM, 26.9875},
		{"1-1/16in", UnitMM, 26.9875},
		{"-1/64", UnitMM, -0.396875},
		{"0.2", UnitMM, 0.2},
		{"0.2", UnitInch, 5.08},
		{" 3 ", UnitMM, 3},
		{"-0.3 mm", UnitInch, -0.3},
		{"\u22120.3 mm", UnitMM, -0.3},
		{"+2 mm", UnitMM, 2},
		{".5 mm", UnitMM, 0.5},
		{"5. mm", UnitMM, 5},
		// Inches as a drawing gives them: fractions and mixed numbers,
		// with or without the unit, in either session unit.
		{"3/16", UnitInch, 4.7625},
		{"3/16", UnitMM, 4.7625},
		{"1 3/16", UnitInch, 30.1625},
		{"1-3/16", UnitInch, 30.1625},
		{"1 3/16 in", UnitMM, 30.1625},
		{"1 3/16in", UnitMM, 30.1625},
		{"1  3/16", UnitInch, 30.1625},
		{"1 3/16\"", UnitMM, 30.1625},
		{"-1/8", UnitInch, -3.175},
		{"-1 3/16", UnitInch, -30.1625},
		{"0.012", UnitInch, 0.3048},
		{"0.012", UnitMM, 0.012},
		{"2", UnitInch, 50.8},
		// The keypad's own output: digits, one point (a lone point is
		// typed as "0."), the sign key's leading minus, a space and a
		// fraction bar.
		{"0.", UnitInch, 0},
		{"12.", UnitMM, 12},
		{"-0.012", UnitInch, -0.3048},
		{"-0.", UnitMM, 0},
		{"1 ", UnitInch, 25.4},
		{"5 1/2", UnitInch, 139.7},
		{"-5 1/2", UnitInch, -139.7},
	}
	for _, c := range cases {
		got, err := ParseLength(c.in, c.unit)
		if err != nil {
			t.Errorf("ParseLength(%q): %v", c.in, err)
			continue
		}
		if math.Abs(got-c.mm) > 1e-12 {
			t.Errorf("ParseLength(%q, %s) = %v mm, want %v", c.in, c.unit, got, c.mm)
		}
	}
}

func TestParseLengthRefuses(t *testing.T) {
	for _, in := range []string{"", "mm", "abc", "5 furlongs", "1/0", "1//2", "NaN", "Inf mm", "1e999", "0x10", "1.2.3 mm", "5 mm mm", "--1", "1/2/3", "1e3", "-", "-/", "1.5/2"} {
		mm, err := ParseLength(in, UnitMM)
		var e *setting.Error
		if !errors.As(err, &e) || e.Field != "length" {
			t.Errorf("ParseLength(%q) = %v, %v; want a length error", in, mm, err)
			continue
		}
		fullSentence(t, e.Message)
		if !strings.Contains(e.Message, fmt.Sprintf("%q", in)) {
			t.Errorf("ParseLength(%q): %q does not quote what was typed", in, e.Message)
		}
	}
}

// A fraction typed wrong (on the keypad: a bar too many, a zero or nothing
// below it) is refused saying what is wrong with it.
func TestParseLengthSaysWhatIsWrong(t *testing.T) {
	cases := []struct{ in, says string }{
		{"3/0", "cannot have 0 below the bar"},
		{"1 3/0", "cannot have 0 below the bar"},
		{"1/2/3", "more than one fraction bar"},
		{"3/", "no number below the fraction bar"},
		{"1 3/", "no number below the fraction bar"},
		{"/16", "no number above the fraction bar"},
		{"1.5 3/16", "whole inches before the fraction"},
		{"3/16.5", "whole numbers either side of the bar"},
		{"5 furlongs", `the unit "furlongs"`},
		{"", "it is empty"},
		{"-", "there is no number"},
	}
	for _, c := range cases {
		_, err := ParseLength(c.in, UnitInch)
		if err == nil || !strings.Contains(err.Error(), c.says) {
			t.Errorf("ParseLength(%q): got %v, want it to say %q", c.in, err, c.says)
		}
	}
}

// Lengths off a drawing are shown as a setter writes them: the nearest
// 64th in lowest terms when within half a thou of one, else decimals to
// the thou; each reads back (ParseLength) as the length shown.
func TestFormatInches(t *testing.T) {
	cases := []struct {
		in   float64 // inches
		want string
	}{
		{0, "0"},
		{3.0 / 16, "3/16"},
		{1 + 3.0/16, "1 3/16"},
		{-1.0 / 8, "-1/8"},
		{-(1 + 3.0/16), "-1 3/16"},
		{2, "2"},
		{1.0 / 64, "1/64"},
		{32.0 / 64, "1/2"},
		{0.1875 + 0.0004, "3/16"}, // within half a thou
		{0.1875 + 0.00063, "0.188"},
		{0.012, "0.012"},
		{0.3, "0.3"},
		{0.0125, "0.0125"},
		{5.11634, "5.116"},
		{0.0001, "0"},
		{63.9999 / 64, "1"},
		{-0.012, "-0.012"},
		{-0.0002, "0"},
	}
	for _, c := range cases {
		got := FormatInches(c.in * MMPerInch)
		if got != c.want {
			t.Errorf("FormatInches(%v in) = %q, want %q", c.in, got, c.want)
		}
		back, err := ParseLength(got, UnitInch)
		if err != nil || math.Abs(back/MMPerInch-c.in) > 0.0005+1e-9 {
			t.Errorf("%q reads back as %v in (%v), want %v", got, back/MMPerInch, err, c.in)
		}
	}
	for n := -200; n <= 200; n++ {
		mm := float64(n) / 64 * MMPerInch
		if back, err := ParseLength(FormatInches(mm), UnitInch); err != nil || math.Abs(back-mm) > 1e-12 {
			t.Errorf("%d/64 in shown as %q reads back as %v mm (%v), want %v", n, FormatInches(mm), back, err, mm)
		}
	}
	if got := FormatInches(math.NaN()); got != "?" {
		t.Errorf("NaN shown as %q", got)
	}
}

func TestFormatLength(t *testing.T) {
	cases := []struct {
		mm   float64
		unit Unit
		want string
	}{
		{0.127, UnitInch, "0.005 in"},
		{0.13, UnitMM, "0.13 mm"},
		{-0.001, UnitMM, "0.00 mm"},
		{1.5875, UnitInch, "0.063 in"},
		{-0.3, UnitMM, "-0.30 mm"},
		{math.NaN(), UnitMM, "?"},
	}
	for _, c := range cases {
		if got := FormatLength(c.mm, c.unit); got != c.want {
			t.Errorf("FormatLength(%v, %s) = %q, want %q", c.mm, c.unit, got, c.want)
		}
	}
	// What is shown reads back within half the last digit.
	for _, mm := range []float64{0.127, 0.254, 1.5875, 3.3} {
		back, err := ParseLength(FormatLength(mm, UnitInch), UnitMM)
		if err != nil || math.Abs(back-mm) > 0.0254/2+1e-12 {
			t.Errorf("%v mm shown as %q reads back as %v (%v)", mm, FormatLength(mm, UnitInch), back, err)
		}
	}
}
