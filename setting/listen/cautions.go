package listen

// Cautions returns the safety cautions for running an engine on air to
// record its beat, one full sentence each, in the order a setter meets
// them: the app shows them before it asks for the microphone, and the
// command line prints them under what it heard. The slice is new on every
// call.
func Cautions() []string {
	return []string{
		"Run the engine on blocks or rollers, its driving wheels clear of the ground or on a rolling road, so it cannot move off.",
		"Use low air pressure and open the cylinder drain cocks; wear eye protection.",
		"Nobody near the motion while it runs, and say so before the air goes on.",
		"Hold the phone at the chimney or exhaust, never within reach of the motion.",
	}
}
