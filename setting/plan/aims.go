package plan

import "evenbeat/setting/session"

// AimsOptions returns the options a session's plan aims ask for: priority,
// target lead, the share given to leads and the running notch. The other
// fields are left at their zero values for the caller to set.
func AimsOptions(a session.PlanAims) Options {
	opt := Options{Priority: Priority(a.Priority), Weight: a.LeadShare, RunningNotch: a.RunningNotch}
	if a.TargetLeadMM != nil {
		t := *a.TargetLeadMM
		opt.TargetLeadMM = &t
	}
	return opt
}
