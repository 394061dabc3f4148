package listen_test

import (
	"fmt"
	"math/rand/v2"

	"evenbeat/setting/listen"
	"evenbeat/setting/listen/listentest"
)

// An invented two-cylinder engine whose left back exhaust comes 9 degrees
// late, heard for 15 s at 1.5 rev/s over the roar of its steam, is laid
// against the beats its readings predict.
func ExampleAnalyse() {
	predicted := []listen.Beat{
		{Deg: 155, Cylinder: "right", Front: true}, {Deg: 245, Cylinder: "left", Front: true},
		{Deg: 335, Cylinder: "right"}, {Deg: 74, Cylinder: "left"},
	}
	rec := listentest.Synthesise(rand.New(rand.NewPCG(1, 2)), listentest.Take{
		Beats: predicted, RevPerSec: 1.5, Seconds: 15, Rate: 48000, RoarDB: -10, HissDB: -35,
	})

	r, err := listen.Analyse(rec.Samples, rec.Rate, 4)
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Printf("%.0f rev/min over %d turns\n", r.RevPerMin, r.Turns)
	for j, b := range r.Beats {
		fmt.Printf("beat %d to the next: %.0f degrees (%.0f %% of an even beat)\n", j+1, b.Gap.Deg, b.Gap.Share(4))
	}
	fmt.Printf("evenness %.2f; beat 1 comes %.0f degrees late: %v\n", r.Evenness, r.Odd.Deg, r.Odd.StandsOut)
	m, err := r.Match(predicted)
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Printf("beat 1 is the %s exhaust (ambiguous: %v)\n", m.Odd[0], m.Ambiguous)
	// Output:
	// 90 rev/min over 23 turns
	// beat 1 to the next: 81 degrees (90 % of an even beat)
	// beat 2 to the next: 90 degrees (100 % of an even beat)
	// beat 3 to the next: 90 degrees (100 % of an even beat)
	// beat 4 to the next: 99 degrees (110 % of an even beat)
	// evenness 1.22; beat 1 comes 7 degrees late: true
	// beat 1 is the left back exhaust (ambiguous: false)
}
