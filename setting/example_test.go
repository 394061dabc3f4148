package setting_test

import (
	"fmt"
	"math"
	"os"
	"strings"

	"evenbeat/setting"
)

// The events of a plain slide valve worked by a single eccentric on a long
// rod, from its valve motion alone: an invented engine with a 2 in stroke.
func ExampleEvents() {
	e := setting.Engine{CrankRadius: 25.4, RodLength: 152.4} // rod 6 cranks
	end := setting.End{SteamLap: 3.2, ExhaustLap: 0, PortWidth: 3.2}
	v := setting.Valve{Admission: setting.External, Front: end, Back: end}
	// external admission: the valve is back of centre at front dead centre
	r, advance := 6.4, 32.0
	motion := func(theta float64) (float64, error) {
		return -r * math.Sin((theta+advance)*math.Pi/180), nil
	}
	set, err := setting.Events(e, v, motion, setting.Forward)
	if err != nil {
		fmt.Println(err)
		return
	}
	for _, end := range []setting.CylinderEnd{setting.Front, setting.Back} {
		ev := set.End(end)
		fmt.Printf("%s: lead %.2f mm, cut-off %.1f %%, release %.1f %%, compression %.1f %%\n",
			end, ev.Lead, ev.CutOff.StrokePercent, ev.Release.StrokePercent, ev.Compression.StrokePercent)
	}
	// Output:
	// front: lead 0.19 mm, cut-off 76.7 %, release 93.6 %, compression 8.8 %
	// back: lead 0.19 mm, cut-off 70.2 %, release 91.2 %, compression 6.4 %
}

// Where the piston is, and the inverse: the crank angle at which the
// piston is half-way down the front stroke, running forward.
func ExampleCrank_CrankAngleAt() {
	c, err := setting.Engine{CrankRadius: 50, RodLength: 300}.Prepare()
	if err != nil {
		fmt.Println(err)
		return
	}
	theta, _ := c.CrankAngleAt(0.5, setting.Front, setting.Forward)
	fmt.Printf("half stroke at %.2f degrees; at 90 degrees the piston is %.4f of the stroke from the front\n",
		theta, c.TravelFrom(setting.Front, 90))
	// Output:
	// half stroke at 85.22 degrees; at 90 degrees the piston is 0.5420 of the stroke from the front
}

// exampleEngine is an invented single-eccentric engine (invented for the
// examples).
const exampleEngine = `{
  "name": "Example", "invented": true,
  "engine": {"crank_radius": 30, "rod_length": 180, "inclination": 0, "offset": 0},
  "valve": {"admission": "external",
    "front": {"steam_lap": 3, "exhaust_lap": 0, "port_width": 3},
    "back": {"steam_lap": 3, "exhaust_lap": 0, "port_width": 3}},
  "gear": {"kind": "single-eccentric", "single_eccentric": {
    "eccentric": {"throw": 6.5, "advance": 30, "rod": 250},
    "slip": false, "admission": "external", "guide": 0, "valve_centre_u": 250}}}`

// A bad value in an engine file is named by its key path.
func ExampleDecodeEngineSpec() {
	bad := strings.Replace(exampleEngine, `"crank_radius": 30, "rod_length": 180`, `"crank_radius": 57, "rod_length": 40`, 1)
	_, err := setting.DecodeEngineSpec(strings.NewReader(bad))
	fmt.Println(err)
	missing := strings.Replace(exampleEngine, `"exhaust_lap": 0, `, ``, 1)
	_, err = setting.DecodeEngineSpec(strings.NewReader(missing))
	fmt.Println(err)
	misspelt := strings.Replace(exampleEngine, `"rod_length"`, `"rod_lenght"`, 1)
	_, err = setting.DecodeEngineSpec(strings.NewReader(misspelt))
	fmt.Println(err)
	// Output:
	// engine.rod_length: The connecting rod 40 mm is shorter than the crank radius 57 mm; it must be longer.
	// valve.front.exhaust_lap: The exhaust lap (valve.front.exhaust_lap) is missing; add "exhaust_lap" with a number, or give the engine's "design" (the lead it is drawn for) to take the usual value.
	// engine.rod_lenght: The key "rod_lenght" is not known here; did you mean "rod_length"? Correct its name.
}

// The event table of a gear, as text.
func ExampleTable() {
	spec, err := setting.DecodeEngineSpec(strings.NewReader(exampleEngine))
	if err != nil {
		fmt.Println(err)
		return
	}
	g, _ := spec.Gear.Gear()
	t, err := setting.Table(spec.Engine, spec.Valve, g, []setting.Notch{{Name: "full forward", Reverser: 1}}, nil)
	if err != nil {
		fmt.Println(err)
		return
	}
	t.Format(os.Stdout)
	// Output:
	// position      run      end    lead mm  adm deg  cut-off %  release %  compr %  open mm
	// full forward  forward  front     0.31      3.2       80.3       94.6      8.1     3.00
	//                        back      0.19      1.9       73.4       91.9      5.4     3.00
}
