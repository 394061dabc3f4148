package session

import "testing"

// TestKeptMarks: an earlier round's port marks hold until the valve is
// moved on its spindle; eccentric and rod changes leave them. The rule is
// common practice, no source: the gauge reads the spindle, and only a
// change of the valve on the spindle moves the steam edges against it.
func TestKeptMarks(t *testing.T) {
	marks := &PortMarks{FrontGaugeMM: -1, BackGaugeMM: 1}
	laps := &Laps{FrontMM: 1, BackMM: 1}
	spindle := []Change{{Kind: ValveOnSpindle, Amount: 0.1}}
	sheave := []Change{{Kind: EccentricAngle, Amount: 1}, {Kind: EccentricRodLength, Amount: -0.2}}
	tests := []struct {
		name      string
		rounds    []Round
		ri        int
		from      int
		moved     int
		ok        bool
		marksFrom int
		marksOK   bool
	}{
		{"first round has no earlier", []Round{{PortMarks: marks}}, 0, 0, -1, false, 0, true},
		{"first round without marks", []Round{{}}, 0, 0, -1, false, 0, false},
		{"previous round's marks", []Round{{PortMarks: marks}, {}}, 1, 0, -1, true, 0, true},
		{"laps count as marks", []Round{{Laps: laps}, {}}, 1, 0, -1, true, 0, true},
		{"sheave and rod changes keep them", []Round{{PortMarks: marks}, {AdjustmentsBefore: sheave}}, 1, 0, -1, true, 0, true},
		{"a spindle change ends them", []Round{{PortMarks: marks}, {AdjustmentsBefore: spindle}}, 1, 0, 1, false, 0, false},
		{"own marks after a spindle change", []Round{{PortMarks: marks}, {AdjustmentsBefore: spindle, PortMarks: marks}}, 1, 0, 1, false, 1, true},
		{"the latest earlier round", []Round{{PortMarks: marks}, {Laps: laps}, {}, {AdjustmentsBefore: sheave}}, 3, 1, -1, true, 1, true},
		{"a spindle change two rounds back", []Round{{PortMarks: marks}, {AdjustmentsBefore: spindle}, {}}, 2, 0, 1, false, 0, false},
		{"a spindle change before the marks", []Round{{}, {AdjustmentsBefore: spindle, PortMarks: marks}, {AdjustmentsBefore: sheave}}, 2, 1, -1, true, 1, true},
		{"no marks at all", []Round{{}, {}, {}}, 2, 0, -1, false, 0, false},
		{"round out of range", []Round{{PortMarks: marks}}, 3, 0, -1, false, 0, false},
		{"negative round", []Round{{PortMarks: marks}}, -1, 0, -1, false, 0, false},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			c := &Cylinder{Name: "left", Rounds: tc.rounds}
			from, moved, ok := c.KeptMarks(tc.ri)
			if from != tc.from || moved != tc.moved || ok != tc.ok {
				t.Errorf("KeptMarks(%d) = %d, %d, %v; want %d, %d, %v", tc.ri, from, moved, ok, tc.from, tc.moved, tc.ok)
			}
			from, ok = c.MarksFor(tc.ri)
			if from != tc.marksFrom || ok != tc.marksOK {
				t.Errorf("MarksFor(%d) = %d, %v; want %d, %v", tc.ri, from, ok, tc.marksFrom, tc.marksOK)
			}
		})
	}
	var none *Cylinder
	if _, _, ok := none.KeptMarks(1); ok {
		t.Error("a nil cylinder keeps marks")
	}
}
