package setting

// Cautions returns the safety cautions shown before any valve setting
// starts and printed on every report, one full sentence each, in the order
// a setter meets them. Setting valves means turning the wheels and motion
// by hand, so the list covers making the engine safe to turn, keeping
// hands clear, never testing under pressure near the motion, and the rules
// that govern full-size engines. The slice is new on every call.
func Cautions() []string {
	return []string{
		"Work only on a cold engine, with no steam or compressed air left in the pipes or cylinders.",
		"Open the cylinder drain cocks, shut the regulator and chock the wheels, so the engine cannot move on its own.",
		"Keep fingers, hands and loose clothing out of the motion while the wheels are turned, and say so before each turn.",
		"Never test the setting on steam or air while anyone is near the motion.",
		"On a full-size engine, follow the railway's own procedures and its competent-person rules; this app does not replace them.",
		"Evenbeat gives advice only: local codes and licensed practice come first wherever they apply.",
	}
}
