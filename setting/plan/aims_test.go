package plan

import (
	"reflect"
	"testing"

	"evenbeat/setting/session"
)

// TestAimsOptions: a session names the plan's priorities as the plan does,
// and its aims become the options field by field.
func TestAimsOptions(t *testing.T) {
	for _, p := range [][2]string{
		{string(session.PriorityLeads), string(EqualLeads)},
		{string(session.PriorityCutOffs), string(EqualCutOffs)},
		{string(session.PriorityBalanced), string(Balanced)},
	} {
		if p[0] != p[1] {
			t.Errorf("the session calls a priority %q, the plan %q", p[0], p[1])
		}
	}
	lead := 0.3
	got := AimsOptions(session.PlanAims{Priority: session.PriorityBalanced, TargetLeadMM: &lead, LeadShare: 0.7, RunningNotch: "running notch"})
	lead = 9 // the options keep their own copy
	want := Options{Priority: Balanced, Weight: 0.7, RunningNotch: "running notch", TargetLeadMM: new(0.3)}
	if !reflect.DeepEqual(got, want) {
		t.Errorf("got %+v, want %+v", got, want)
	}
	if got := AimsOptions(session.PlanAims{}); !reflect.DeepEqual(got, Options{}) {
		t.Errorf("no aims gave %+v", got)
	}
}
