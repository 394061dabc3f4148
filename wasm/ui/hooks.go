package ui

import (
	"fmt"
	"strings"
	"time"
	"unicode/utf8"

	"evenbeat/render"
	"evenbeat/setting/plan"
)

// maxNameRunes is the longest engine name taken.
const maxNameRunes = 60

// RenameLabel and ImportLabel are the labels of the buttons that rename
// the engine and import a session file: the glue opens its name box and
// the browser's file chooser from the browser's own tap event on them
// (iOS opens a keyboard or a chooser only inside a user's gesture).
const (
	RenameLabel = "Rename engine"
	ImportLabel = "Import a session file"
	// CopyLabel is the menu's button that copies the plan's words (the
	// glue writes the clipboard inside the browser's tap event on it).
	CopyLabel = "Copy the plan's words"
)

// BarBottom is where the top bar ends (CSS px): a tap above it reaches
// only the bar's buttons, even where a scrolled button lies under it.
func (a *App) BarBottom() float64 { return barH + margin }

// Rename sets the session's name (trimmed), and the engine's, and saves
// it; a demo renamed becomes the user's own engine (not invented, without
// the demo's notes). An empty name or one longer than 60 characters is
// refused with a sentence naming the field "name", and nothing changes.
func (a *App) Rename(name string) error {
	a.dirty = true
	s := a.Session()
	if s == nil {
		return fmt.Errorf("name: there is no engine open to rename.")
	}
	name = strings.TrimSpace(name)
	switch n := utf8.RuneCountInString(name); {
	case n == 0:
		return fmt.Errorf("name: the engine's name is empty; type at least one letter.")
	case n > maxNameRunes:
		return fmt.Errorf("name: the engine's name has %d characters; at most %d are kept.", n, maxNameRunes)
	}
	s.Name = name
	s.Engine.Name = name // titles, the report and the file say the user's name
	if s.Invented {
		// A demo renamed is the user's engine: no longer marked invented,
		// nor carrying the demo's notes.
		s.Invented, s.Note = false, ""
		s.Engine.Invented, s.Engine.Notes = false, ""
	}
	a.save()
	return nil
}

// SetUpdateReady shows (or hides) the banner saying a new version is
// ready, with a Restart button that calls Options.OnUpdate.
func (a *App) SetUpdateReady(ready bool) {
	if ready != a.updateReady {
		a.updateReady, a.dirty = ready, true
	}
}

// PlanTime returns how long the last fit, plan and diagram model took:
// the time until the plan can be shown.
func (a *App) PlanTime() time.Duration { return a.planTime }

// OtherTime returns how long the last plan's other priority took, made
// on the tick after the plan was first drawn (0 before).
func (a *App) OtherTime() time.Duration { return a.otherTime }

// reportName is the file name of the shared report.
func (a *App) reportName() string {
	return strings.TrimSuffix(a.exportName(), ".json") + "-report.pdf"
}

// Theme returns the app's palette, for what the glue draws over it.
func (a *App) Theme() render.Theme { return a.theme }

// share hands the plan's report to the glue's OnShare.
func (a *App) share() {
	if a.opt.OnShare == nil || a.model == nil {
		return
	}
	a.finishPlan() // the report's notes compare the two priorities
	// The whole engine: the other cylinders' latest rounds, planned with
	// the session's aims, and the beat.
	s := a.Session()
	opt := plan.AimsOptions(s.Aims)
	opt.Unit, opt.Cylinder = a.unit(), a.cyl
	a.opt.OnShare(a.reportName(), render.WholeEngine(s, a.model, opt))
}

// copyWords hands the plan's words to the glue's OnCopy.
func (a *App) copyWords() {
	if a.opt.OnCopy == nil || a.plan == nil {
		return
	}
	a.copyNote = ""
	a.opt.OnCopy(a.PlanText())
}

// CopyDone tells the app how putting the plan's words on the clipboard
// went: nil when they are there, else why not; the menu says so.
func (a *App) CopyDone(err error) {
	a.dirty, a.copyFailed = true, err != nil
	if err != nil {
		a.copyNote = "The plan's words were not copied: " + err.Error() + ". They are also on the plan screen to read."
		return
	}
	a.copyNote = "The plan's words are copied: paste them into a message or your notes."
}

// rename asks the glue for a new name.
func (a *App) rename() {
	if a.opt.OnName != nil && a.Session() != nil {
		a.opt.OnName(a.Session().Name)
	}
}

// updateBanner adds the new-version banner at the top of a screen: the
// sentence beside its Restart button, one row tall.
func (a *App) updateBanner(l *layouter) {
	if !a.updateReady {
		return
	}
	const bw = 112 // the Restart button's width
	lines := render.Wrap("A new version is ready.", l.w-bw-gap, render.BodySize, true)
	h := max(rowH, float64(len(lines))*render.BodySize*render.LineHeight)
	top := l.y + (h-float64(len(lines))*render.BodySize*render.LineHeight)/2
	l.v.paras = append(l.v.paras, para{lines: lines, at: render.Point{X: l.x, Y: top}, size: render.BodySize, bold: true})
	l.v.targets = append(l.v.targets, Target{Label: "Restart", Rect: rect(l.x+l.w-bw, l.y+(h-rowH)/2, bw, rowH), act: func() {
		if a.opt.OnUpdate != nil {
			a.opt.OnUpdate()
		}
	}})
	l.y += h + gap
}
