package main

import (
	"math"
	"math/rand/v2"
	"os"
	"path/filepath"
	"regexp"
	"slices"
	"strconv"
	"strings"
	"testing"

	hear "evenbeat/setting/listen"
	"evenbeat/setting/listen/listentest"
)

// writeTake synthesises a recording of beats (the trials' roar, hiss, a
// missed and a spurious beat, 1.2 rev/s) as a 16-bit WAV in dir.
func writeTake(t *testing.T, dir string, beats []hear.Beat, rate int) string {
	t.Helper()
	rng := rand.New(rand.NewPCG(15, 8))
	rec := listentest.Synthesise(rng, listentest.Take{
		Beats: beats, RevPerSec: 1.2, SpeedChange: -0.02, Seconds: 12, Rate: rate,
		RoarDB: -10, HissDB: -35, Missed: 1, Extra: 1,
	})
	path := filepath.Join(dir, "exhaust.wav")
	if err := os.WriteFile(path, listentest.WAV(rec.Samples, 1, rate, listentest.Format{Bits: 16}), 0o644); err != nil {
		t.Fatal(err)
	}
	return path
}

// limping is a two-cylinder engine whose left back exhaust comes 9 degrees
// late.
func limping() []hear.Beat {
	return []hear.Beat{
		{Deg: 155, Cylinder: "right", Front: true}, {Deg: 245, Cylinder: "left", Front: true},
		{Deg: 335, Cylinder: "right"}, {Deg: 74, Cylinder: "left"},
	}
}

// TestListenCommand: evenbeat listen prints the onsets, the speed, every
// gap in degrees and as a share of an even beat, the evenness and the late
// beat, with the cautions; flags may follow the file.
func TestListenCommand(t *testing.T) {
	path := writeTake(t, t.TempDir(), limping(), 22050)
	out, stderr, err := runBoth(t, "listen", path)
	if err != nil {
		t.Fatalf("%v\n%s", err, stderr)
	}
	// 1.2 rev/s slowing 2 %: 71.3 rev/min on the mean; the left back 9
	// degrees late is 6.75 off the even beat laid on all four; 99 / 81.
	for _, want := range []string{"Recording: 12.0 s at 22050 Hz (mono)", "Onsets heard:", "turns of 4 beats, 1 missed, 1 left out", "Speed: 71.", "slower at the end",
		"beat 1 to 2", "beat 4 to 1", "% of an even beat", "Evenness (largest gap / smallest): 1.22",
		"Beat 1 comes 6.7 degrees late", "Cautions when recording:", "Nobody near the motion"} {
		if !strings.Contains(out, want) {
			t.Errorf("listen output lacks %q:\n%s", want, out)
		}
	}
	if strings.Contains(out, "NaN") || strings.Contains(out, "Inf") {
		t.Errorf("listen output holds a non-number:\n%s", out)
	}
	// The gaps: beat 1 is the left back (74 + 360), so 1 to 2 is 81, then
	// 90, 90 and 99 degrees, within half a degree.
	gaps := regexp.MustCompile(`beat \d to \d +([0-9.]+) \+/- [0-9.]+ +([0-9.]+) %`).FindAllStringSubmatch(out, -1)
	want := []float64{81, 90, 90, 99}
	if len(gaps) != 4 {
		t.Fatalf("found %d gaps in:\n%s", len(gaps), out)
	}
	for j, g := range gaps {
		deg, _ := strconv.ParseFloat(g[1], 64)
		share, _ := strconv.ParseFloat(g[2], 64)
		if math.Abs(deg-want[j]) > 0.5 || math.Abs(share-want[j]/90*100) > 0.6 {
			t.Errorf("gap %d: %s deg, %s %%; want %.0f deg, %.1f %%", j+1, g[1], g[2], want[j], want[j]/90*100)
		}
	}
	after, _, err := runBoth(t, "listen", path, "-beats", "4")
	if err != nil || after != out {
		t.Errorf("listen FILE -beats 4 differs from listen FILE (%v):\n%s", err, after)
	}
}

// TestListenAgainstSession: with -session, the heard beats are laid on
// those the demo session's readings predict in full forward. A recording
// of just those beats fits them within a tenth of a degree; the demo engine
// beats within a degree of even, so no beat stands out to be named. One of
// its ends put 6 degrees late is a beat the readings do not foresee, and
// is said to be so.
func TestListenAgainstSession(t *testing.T) {
	predicted, err := predictedBeats(demoSession, "full forward")
	if err != nil {
		t.Fatal(err)
	}
	limp := append([]hear.Beat(nil), predicted...)
	limp[1].Deg += 6
	cases := []struct {
		name  string
		beats []hear.Beat
		says  []string
	}{
		{"as predicted", predicted, []string{"Against the beats today's readings predict in full forward", "differ from the predicted by 0.0 degrees",
			"No beat stands out, so none is named."}},
		{"one end late", limp, []string{"The beat heard is not the one the readings foresee", "Take the readings again, and look at the quartering."}},
	}
	for _, c := range cases {
		path := writeTake(t, t.TempDir(), c.beats, 16000)
		out, stderr, err := runBoth(t, "listen", "-session", demoSession, path)
		if err != nil {
			t.Fatalf("%s: %v\n%s", c.name, err, stderr)
		}
		for _, want := range c.says {
			if !strings.Contains(out, want) {
				t.Errorf("%s: listen -session output lacks %q:\n%s", c.name, want, out)
			}
		}
		// The predicted gaps are the session's beat circle's, in some order.
		for _, g := range []string{"predicted   91.2", "predicted   89.7", "predicted   89.0", "predicted   90.1"} {
			if !strings.Contains(out, g) {
				t.Errorf("%s: output lacks %q (the demo's gaps in full forward):\n%s", c.name, g, out)
			}
		}
	}
}

// TestListenRefusals: every refusal names what is wrong in words.
func TestListenRefusals(t *testing.T) {
	dir := t.TempDir()
	wav := writeTake(t, dir, limping(), 8000)
	notWAV := filepath.Join(dir, "notes.txt")
	if err := os.WriteFile(notWAV, []byte("lead 0.2 mm front, 0.3 back"), 0o644); err != nil {
		t.Fatal(err)
	}
	cases := []struct {
		args []string
		says string
	}{
		{[]string{"listen"}, "listen reads one recording, a WAV file"},
		{[]string{"listen", wav, wav}, "(given 2;"},
		{[]string{"listen", filepath.Join(dir, "missing.wav")}, "the file cannot be opened"},
		{[]string{"listen", notWAV}, "not a WAV recording"},
		{[]string{"listen", "-beats", "0", wav}, "The beats a turn must be from 2 to 12"},
		{[]string{"listen", "-beats", "four", wav}, "invalid value \"four\" for flag -beats"},
		{[]string{"listen", "-position", "full back", wav}, "flag -position: the position is the session's"},
		{[]string{"listen", "-session", demoSession, "-position", "mid gear", wav}, "no position \"mid gear\"; give one of: full forward"},
		{[]string{"listen", "-session", demoSession, "-beats", "6", wav}, "The readings predict 4 beats a turn but the recording was analysed for 6"},
	}
	for _, c := range cases {
		_, _, err := runBoth(t, c.args...)
		if err == nil || !strings.Contains(err.Error(), c.says) {
			t.Errorf("%q: %v, want an error saying %q", c.args, err, c.says)
		}
	}
}

// TestListeningStaysPortable: setting/listen runs in the app as on the
// command line, so built for js/wasm it depends on the standard library
// alone, without encoding/json (the app's build carries none), and no
// package of it imports syscall/js.
func TestListeningStaysPortable(t *testing.T) {
	lines := goListDeps(t, []string{"GOOS=js", "GOARCH=wasm"}, "{{.ImportPath}} {{.Standard}} {{join .Imports \" \"}}", "./setting/listen")
	if len(lines) < 5 {
		t.Fatalf("go list listed only %d packages: %q", len(lines), lines)
	}
	for _, line := range lines {
		f := strings.Fields(line)
		pkg, std, imports := f[0], f[1] == "true", f[2:]
		if pkg == "encoding/json" {
			t.Errorf("setting/listen depends on encoding/json in the browser build")
		}
		if !std && pkg != "evenbeat/setting/listen" {
			t.Errorf("setting/listen depends on %s; it may use the standard library only", pkg)
		}
		if strings.HasPrefix(pkg, "evenbeat/") && slices.Contains(imports, "syscall/js") {
			t.Errorf("%s imports syscall/js", pkg)
		}
	}
}
