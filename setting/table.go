package setting

import (
	"fmt"
	"io"
	"math"
	"strings"
	"text/tabwriter"
)

// TableRow is one row of an event table: the events of both ends with the
// reverser in one position, running one way.
type TableRow struct {
	Notch  Notch    // the reverser position and its name
	Events EventSet // the events; Events.Direction is the running direction
}

// EventTable is the table setters compare: a row per reverser position and
// running direction, front end against back.
type EventTable struct {
	Rows []TableRow
}

// ReverserPositions returns n reverser positions (n >= 2) evenly spaced
// from full forward (+1) to full back (-1), named "full forward",
// "forward 75 %", "mid gear", "back 75 %", "full back" and so on (the
// percentage is of full-gear reverser travel, not cut-off). With n = 9
// the steps are quarters.
func ReverserPositions(n int) []Notch {
	if n < 2 {
		n = 2
	}
	out := make([]Notch, n)
	for i := range out {
		r := 1 - 2*float64(i)/float64(n-1)
		if math.Abs(r) < 1e-12 {
			r = 0
		}
		out[i] = Notch{Name: reverserName(Reverser(r)), Reverser: Reverser(r)}
	}
	return out
}

// reverserName names a reverser position in words.
func reverserName(r Reverser) string {
	switch {
	case r == 1:
		return "full forward"
	case r == -1:
		return "full back"
	case r == 0:
		return "mid gear"
	case r > 0:
		return fmt.Sprintf("forward %.0f %%", 100*float64(r))
	}
	return fmt.Sprintf("back %.0f %%", -100*float64(r))
}

// RunningDirections returns the directions a table shows for a reverser
// position when none are asked for: forward-gear positions run forward,
// back-gear positions backward, and mid gear both ways.
func RunningDirections(r Reverser) []Direction {
	switch {
	case r > 0:
		return []Direction{Forward}
	case r < 0:
		return []Direction{Backward}
	}
	return []Direction{Forward, Backward}
}

// Table works out the event table of a gear: for each notch, and for each
// direction in dirs, the events of both ends. With dirs nil each notch is
// run the way its gear drives (see RunningDirections); otherwise every
// notch is run every way in dirs, so the events of an engine running
// against its gear can be seen too. The valve curve of a notch is found
// once and serves every direction.
//
// Errors: the engine and valve are validated first (fields under "engine"
// and "valve"); a linkage that cannot close in a notch gives the gear's
// error with the notch named. The gear's own dimensions are not checked
// here, to keep the table fast for fitting: check them once with
// Gear.Validate (EngineSpec.Validate and DecodeEngineSpec do).
func Table(e Engine, v Valve, g Gear, notches []Notch, dirs []Direction) (EventTable, error) {
	c, err := e.Prepare()
	if err != nil {
		return EventTable{}, within("engine", err)
	}
	if g == nil {
		return EventTable{}, &Error{"gear", "No valve gear was given."}
	}
	for _, d := range dirs {
		if err := d.validate(); err != nil {
			return EventTable{}, err
		}
	}
	var t EventTable
	for _, n := range notches {
		if !(n.Reverser >= -1 && n.Reverser <= 1) {
			return EventTable{}, &Error{"reverser", fmt.Sprintf("The reverser position of %q must lie between -1 (full back) and +1 (full forward) (got %g).", n.Name, float64(n.Reverser))}
		}
		r := n.Reverser
		a, err := analyse(c, v, func(theta float64) (float64, error) { return g.Valve(e, theta, r) })
		if err != nil {
			return EventTable{}, inNotch(n, err)
		}
		ds := dirs
		if ds == nil {
			ds = RunningDirections(r)
		}
		for _, d := range ds {
			set, err := a.events(d)
			if err != nil {
				return EventTable{}, err
			}
			t.Rows = append(t.Rows, TableRow{Notch: n, Events: set})
		}
	}
	return t, nil
}

// inNotch adds the notch to an error's message.
func inNotch(n Notch, err error) error {
	e := within("", err).(*Error)
	return &Error{e.Field, fmt.Sprintf("With the reverser at %s (%g): %s", n.Name, float64(n.Reverser), e.Message)}
}

// Format writes the table as aligned text, one line per end:
//
//	position      run      end    lead mm  adm deg  cut-off %  release %  compr %  open mm
//	full forward  forward  front     0.31      3.2       80.3       94.6      8.1     3.00
//	                       back      0.19      1.9       73.4       91.9      5.4     3.00
//
// "adm deg" is how far before its dead centre the port opens (LeadAngle);
// percentages are of the stroke from that end (see Event); "open mm" is the
// largest steam opening. A port that never opens or never closes says so.
func (t EventTable) Format(w io.Writer) error {
	tw := tabwriter.NewWriter(w, 0, 0, 2, ' ', 0)
	fmt.Fprintln(tw, "position\trun\tend\tlead mm\tadm deg\tcut-off %\trelease %\tcompr %\topen mm")
	for _, row := range t.Rows {
		for _, end := range [2]CylinderEnd{Front, Back} {
			pos, run := "", ""
			if end == Front {
				pos, run = row.Notch.Name, row.Events.Direction.String()
			}
			ev := row.Events.End(end)
			fmt.Fprintf(tw, "%s\t%s\t%s\t%7.2f\t%s\t%s\t%s\t%s\t%7.2f\n", pos, run, end, ev.Lead,
				steamCell(ev, fmt.Sprintf("%7.1f", ev.LeadAngle)),
				steamCell(ev, fmt.Sprintf("%9.1f", ev.CutOff.StrokePercent)),
				exhaustCell(ev, ev.Release, 9), exhaustCell(ev, ev.Compression, 7), ev.MaxOpening)
		}
	}
	return tw.Flush()
}

// String returns the formatted table.
func (t EventTable) String() string {
	var b strings.Builder
	t.Format(&b)
	return b.String()
}

// steamCell shows a steam value, or why there is none.
func steamCell(ev EndEvents, s string) string {
	switch {
	case ev.NeverOpens:
		return "never opens"
	case ev.NeverCloses:
		return "never closes"
	}
	return s
}

// exhaustCell shows an exhaust event's percentage right-aligned in width,
// or why there is none.
func exhaustCell(ev EndEvents, e Event, width int) string {
	switch {
	case ev.ExhaustNeverOpens:
		return "never opens"
	case ev.ExhaustNeverCloses:
		return "never closes"
	}
	return fmt.Sprintf("%*.1f", width, e.StrokePercent)
}
