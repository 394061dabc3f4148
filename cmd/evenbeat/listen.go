package main

import (
	"errors"
	"flag"
	"fmt"
	"io"
	"io/fs"
	"os"
	"strings"

	"evenbeat/setting"
	"evenbeat/setting/beat"
	hear "evenbeat/setting/listen" // package main has a func listen (app.go)
	"evenbeat/setting/plan"
	"evenbeat/setting/session"
)

// runListen is `evenbeat listen [-beats 4] [-session S.json [-position P]]
// RECORDING.wav`: the beat heard in a recording of the exhaust, and with a
// session, laid against the beats its readings predict.
func runListen(args []string, stdout, stderr io.Writer) error {
	limitMemory()
	flags := flag.NewFlagSet("listen", flag.ContinueOnError)
	flags.SetOutput(stderr)
	beats := flags.Int("beats", 4, "beats a turn: 4 for two cylinders, 6 for three")
	sessionPath := flags.String("session", "", "a session file: lay the beats heard against those its readings predict")
	position := flags.String("position", "full forward", "with -session: the reverser position the engine ran in, as the plan names it")
	files, err := parseAnyOrder(flags, args)
	if err != nil {
		return fmt.Errorf("listen: %w", err)
	}
	if len(files) != 1 {
		return fmt.Errorf("listen reads one recording, a WAV file, e.g. evenbeat listen exhaust.wav -beats 4 (given %d; flags: %s)", len(files), flagNames(flags))
	}
	if *sessionPath == "" && flagGiven(flags, "position") {
		return fmt.Errorf("flag -position: the position is the session's; give the session too, e.g. -session engine.json -position %q", *position)
	}
	var predicted []hear.Beat
	if *sessionPath != "" {
		if predicted, err = predictedBeats(*sessionPath, *position); err != nil {
			return err
		}
		// The session knows the cylinders: -beats need not be given.
		if !flagGiven(flags, "beats") {
			*beats = len(predicted)
		}
	}
	snd, err := readRecording(files[0])
	if err != nil {
		return err
	}
	if snd.Truncated {
		fmt.Fprintf(stderr, "evenbeat: warning: %s ends before its sound data do; the %.1f s it holds are analysed.\n", files[0], snd.Seconds())
	}
	r, err := hear.Analyse(snd.Samples, snd.Rate, *beats)
	if err != nil {
		return fmt.Errorf("%s: %w", files[0], err)
	}
	for _, n := range r.Notes {
		fmt.Fprintf(stderr, "evenbeat: note: %s\n", n)
	}
	var m *hear.Match
	if predicted != nil {
		if m, err = r.Match(predicted); err != nil {
			return fmt.Errorf("%s against %s: %w", files[0], *sessionPath, err)
		}
	}
	return buffered(stdout, func(w io.Writer) error {
		writeHeard(w, snd, r)
		if m != nil {
			writeMatch(w, r, m, *position)
		}
		fmt.Fprintln(w, "\nCautions when recording:")
		for _, c := range hear.Cautions() {
			fmt.Fprintf(w, "- %s\n", c)
		}
		return nil
	})
}

// flagGiven reports whether flag name was on the command line.
func flagGiven(fs *flag.FlagSet, name string) bool {
	found := false
	fs.Visit(func(f *flag.Flag) { found = found || f.Name == name })
	return found
}

// readRecording reads a WAV file, naming the file in a refusal.
func readRecording(path string) (*hear.Sound, error) {
	f, err := os.Open(path)
	if err != nil {
		return nil, openError(path, err)
	}
	defer f.Close()
	snd, err := hear.ReadWAV(f)
	if err != nil {
		return nil, fmt.Errorf("%s: %w", path, err)
	}
	return snd, nil
}

// openError says in a sentence that a file cannot be opened.
func openError(path string, err error) error {
	var pe *fs.PathError
	if errors.As(err, &pe) {
		err = pe.Err
	}
	return fmt.Errorf("%s: the file cannot be opened (%v); check its name and the folder it is in", path, err)
}

// predictedBeats are the exhausts round one turn that the session's
// latest readings give in the named position (today's events, before any
// step of the plan), in the direction of running: every cylinder is
// planned with the session's aims and the whole engine's beat taken from
// the plans (setting/beat).
func predictedBeats(path, position string) ([]hear.Beat, error) {
	s, err := session.ReadFile(path)
	if err != nil {
		return nil, err
	}
	plans := make([]*plan.Plan, len(s.Cylinders))
	for i, c := range s.Cylinders {
		if len(c.Rounds) == 0 {
			return nil, fmt.Errorf("%s: the %s cylinder has no readings yet, so its exhausts cannot be predicted; take a round of readings on every cylinder first", path, c.Name)
		}
		opt := plan.AimsOptions(s.Aims)
		opt.Cylinder = i
		if plans[i], err = plan.Make(s, opt); err != nil {
			return nil, fmt.Errorf("%s: the %s cylinder's exhausts cannot be predicted: %w", path, c.Name, err)
		}
	}
	ps, err := beat.FromPlans(s, plans, beat.DefaultSteam)
	if err != nil {
		return nil, fmt.Errorf("%s: %w", path, err)
	}
	var names []string
	for _, p := range ps {
		names = append(names, p.Name)
		if !strings.EqualFold(p.Name, position) {
			continue
		}
		var out []hear.Beat
		for _, e := range p.Now.Exhausts {
			deg := e.Deg
			if p.Direction == setting.Backward {
				deg = 360 - deg // degrees in the direction of running
			}
			out = append(out, hear.Beat{Deg: deg, Cylinder: e.Cylinder, Front: e.End == setting.Front})
		}
		if len(out) == 0 {
			return nil, fmt.Errorf("%s: no exhaust opens in %s, so there is no beat to predict", path, p.Name)
		}
		return out, nil
	}
	return nil, fmt.Errorf("flag -position: the session's plans have no position %q; give one of: %s", position, strings.Join(names, ", "))
}

// writeHeard writes what the recording says: onsets, speed, gaps,
// evenness and the odd beat.
func writeHeard(w io.Writer, snd *hear.Sound, r *hear.Result) {
	n := r.BeatsPerTurn
	chans := "mono"
	if snd.Channels > 1 {
		chans = fmt.Sprintf("%d channels averaged", snd.Channels)
	}
	fmt.Fprintf(w, "Recording: %.1f s at %d Hz (%s)\n", snd.Seconds(), snd.Rate, chans)
	folded := len(r.Onsets) - r.Spurious
	fmt.Fprintf(w, "Onsets heard: %d; %d on the beat over %d turns of %d beats, %d missed, %d left out\n",
		len(r.Onsets), folded, r.Turns, n, r.Missed, r.Spurious)
	fmt.Fprintf(w, "Speed: %.1f rev/min (%s)\n", r.RevPerMin, speedChange(r.SpeedChange))
	fmt.Fprintf(w, "\nGaps between beats, degrees of crank, averaged over the turns (+/- the scatter from turn to turn):\n")
	for j, b := range r.Beats {
		fmt.Fprintf(w, "  beat %d to %d  %6.1f +/- %.1f  %5.1f %% of an even beat\n", j+1, (j+1)%n+1, b.Gap.Deg, b.Gap.Scatter, b.Gap.Share(n))
	}
	fmt.Fprintf(w, "Evenness (largest gap / smallest): %.3f (1 is even)\n", r.Evenness)
	o := r.Odd
	word := "late"
	if !o.Late() {
		word = "early"
	}
	if o.StandsOut {
		fmt.Fprintf(w, "Beat 1 comes %.1f degrees %s (+/- %.2f) against an even beat; the beats are numbered from it.\n", abs(o.Deg), word, o.Doubt)
		return
	}
	fmt.Fprintf(w, "No one beat stands out: beat 1, the furthest off, is %.1f degrees %s (+/- %.2f) against an even beat; the beats are numbered from it.\n", abs(o.Deg), word, o.Doubt)
}

// writeMatch writes the heard beats against the predicted ones and names
// the odd beat's cylinder end.
func writeMatch(w io.Writer, r *hear.Result, m *hear.Match, position string) {
	n := r.BeatsPerTurn
	fmt.Fprintf(w, "\nAgainst the beats today's readings predict in %s (degrees of crank to the next beat):\n", position)
	for j, b := range m.Beats {
		next := m.Beats[(j+1)%n]
		want := next.Deg - b.Deg
		for want < 0 {
			want += 360
		}
		fmt.Fprintf(w, "  beat %d  %-14s heard %6.1f  predicted %6.1f\n", j+1, b.Beat.String(), r.Beats[j].Gap.Deg, want)
	}
	fmt.Fprintf(w, "The heard places differ from the predicted by %.1f degrees (root mean square).\n", m.RMSDeg)
	var ends []string
	for _, b := range m.Odd {
		ends = append(ends, "the "+b.String())
	}
	word := "late"
	if !r.Odd.Late() {
		word = "early"
	}
	switch {
	case len(m.Odd) == 0:
		fmt.Fprintln(w, "No beat stands out, so none is named.")
	case m.Ambiguous && m.Disagrees:
		fmt.Fprintf(w, "The beat heard is not the one the readings foresee, so which end it is cannot be told from them: the %s beat may be %s exhaust. Take the readings again, and look at the quartering.\n", word, strings.Join(ends, " or "))
	case m.Ambiguous:
		fmt.Fprintf(w, "The match is ambiguous: the readings foresee a beat that fits more than one way round, so the %s beat may be %s exhaust.\n", word, strings.Join(ends, " or "))
	default:
		fmt.Fprintf(w, "The %s beat is most likely %s exhaust.\n", word, ends[0])
	}
}

// speedChange says how the speed moved during the recording.
func speedChange(f float64) string {
	switch {
	case f >= 0.0005:
		return fmt.Sprintf("%.1f %% faster at the end", 100*f)
	case f <= -0.0005:
		return fmt.Sprintf("%.1f %% slower at the end", -100*f)
	}
	return "steady"
}

func abs(x float64) float64 {
	if x < 0 {
		return -x
	}
	return x
}
