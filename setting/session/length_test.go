package session

import (
	"errors"
	"math"
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
	for _, in := range []string{"", "mm", "abc", "5 furlongs", "1/0", "1//2", "NaN", "Inf mm", "1e999", "0x10", "1.2.3 mm", "5 mm mm", "--1", "1/2/3", "1e3"} {
		mm, err := ParseLength(in, UnitMM)
		var e *setting.Error
		if !errors.As(err, &e) || e.Field != "length" {
			t.Errorf("ParseLength(%q) = %v, %v; want a length error", in, mm, err)
			continue
		}
		fullSentence(t, e.Message)
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
