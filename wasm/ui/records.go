package ui

import (
	"bytes"
	"fmt"
	"strconv"
	"strings"
	"time"

	"evenbeat/render"
	"evenbeat/setting/jsonx"
	"evenbeat/setting/session"
)

// Records: nothing a stray tap makes is permanent, and everything can be
// taken back. A round begun (Next round, or a cylinder's first) is a
// draft, stored with its first value; a demo engine opened is stored on
// its first change (Stored.pending); an engine, a round or one reading's
// record can be deleted, with an Undo bar for a few seconds; a file of an
// engine already here asks whether to replace it or keep both.

// draftKey names a cylinder of a session.
type draftKey struct {
	s   *session.Session
	cyl string
}

// markDraft notes that cylinder ci's latest round was begun here and has
// no value yet.
func (a *App) markDraft(s *session.Session, ci int) {
	if a.drafts == nil {
		a.drafts = map[draftKey]bool{}
	}
	a.drafts[draftKey{s, s.Cylinders[ci].Name}] = true
}

// isDraft reports whether cylinder ci's latest round was begun here and
// still has no value: it is not stored, and the plan is the round's
// before (the steps still to do).
func (a *App) isDraft(s *session.Session, ci int) bool {
	c := &s.Cylinders[ci]
	return len(c.Rounds) > 0 && a.drafts[draftKey{s, c.Name}] && emptyRound(c.Rounds[len(c.Rounds)-1])
}

// emptyRound reports whether r holds no value: no port marks or laps and
// no reading (its date and the changes made before it are not values).
func emptyRound(r session.Round) bool { return !r.HasMarks() && r.Readings() == 0 }

// encode returns the session file of s as it is stored: without a draft
// round. A round that has had a value is a draft no more.
func (a *App) encode(s *session.Session) ([]byte, error) {
	out := s
	for ci := range s.Cylinders {
		k := draftKey{s, s.Cylinders[ci].Name}
		if !a.drafts[k] {
			continue
		}
		if !a.isDraft(s, ci) {
			delete(a.drafts, k)
			continue
		}
		if out == s {
			cp := *s
			cp.Cylinders = append([]session.Cylinder(nil), s.Cylinders...)
			out = &cp
		}
		rs := s.Cylinders[ci].Rounds
		out.Cylinders[ci].Rounds = rs[:len(rs)-1]
	}
	return encodeSession(out)
}

// roundsTaken counts the rounds of s's busiest cylinder that hold values
// (a draft does not count).
func (a *App) roundsTaken(s *session.Session) int {
	n := 0
	for ci, c := range s.Cylinders {
		k := len(c.Rounds)
		if a.isDraft(s, ci) {
			k--
		}
		n = max(n, k)
	}
	return n
}

// roundsWords says n rounds in words.
func roundsWords(n int) string {
	if n == 1 {
		return "1 round"
	}
	return strconv.Itoa(n) + " rounds"
}

// engineLabel is a stored engine's row on the engines list: its name,
// its rounds, and whether its last write failed.
func (a *App) engineLabel(e *Stored) string {
	label := e.Session.Name + ", " + roundsWords(a.roundsTaken(e.Session))
	if _, bad := a.failed[e.Key]; bad {
		label += " (not saved)"
	}
	return label
}

// roundLabel is round ri's row on the list of rounds, with a draft said
// to be one.
func (a *App) roundLabel(ri int, label string) string {
	s := a.Session()
	if ri == len(s.Cylinders[a.cyl].Rounds)-1 && a.isDraft(s, a.cyl) {
		return label + " (nothing taken yet)"
	}
	return label
}

// deleteWidth is the width of a row's Delete button.
const deleteWidth = 88

// rowWithDelete adds a full-width row that does act, with a Delete button
// at its end that does del (none when del is nil); what names the row's
// record for the Delete's label ("Delete Round 2").
func (a *App) rowWithDelete(l *layouter, label, what string, act, del func()) {
	if del == nil {
		l.button(label, false, act)
		return
	}
	l.v.targets = append(l.v.targets,
		Target{Label: label, Rect: rect(l.x, l.y, l.w-deleteWidth-gap, rowH), act: act},
		Target{Label: "Delete " + what, caption: "Delete", Rect: rect(l.x+l.w-deleteWidth, l.y, deleteWidth, rowH), act: del})
	l.y += rowH + gap
}

// storedName names a stored engine: its session's name, or its key when
// it cannot be read.
func storedName(e *Stored) string {
	if e.Session == nil || e.Session.Name == "" {
		return "The unreadable " + e.Key
	}
	return e.Session.Name
}

// deleteEngine deletes a stored engine (the list first, then its session
// file), offering Undo, which writes both back.
func (a *App) deleteEngine(e *Stored) {
	i := indexWhere(a.stored, func(x *Stored) bool { return x == e })
	if i < 0 {
		return
	}
	stored, index := a.stored, a.index
	a.stored = append(a.stored[:i:i], a.stored[i+1:]...)
	if j := indexWhere(a.index, func(k string) bool { return k == e.Key }); j >= 0 {
		a.index = append(a.index[:j:j], a.index[j+1:]...)
	}
	if a.retired == nil {
		a.retired = map[string]bool{}
	}
	a.retired[e.Key] = true
	if a.cur == e {
		a.cur, a.stack = nil, nil // nothing of it to go back to
		a.clearPlan()
	}
	a.put(IndexKey, encodeIndex(a.index))
	a.remove(e.Key)
	a.offerUndo(storedName(e)+" deleted.", func() {
		a.stored, a.index = stored, index
		delete(a.retired, e.Key)
		a.put(e.Key, e.Raw)
		a.put(IndexKey, encodeIndex(a.index))
	})
}

// deleteRound deletes round ri of the cylinder shown, offering Undo. The
// changes made before it were made to the engine all the same: they move
// to the round after it.
func (a *App) deleteRound(ri int) {
	s := a.Session()
	c := s.Cylinders[a.cyl]
	say := fmt.Sprintf("Round %d deleted.", ri+1)
	if len(s.Cylinders) > 1 {
		say = fmt.Sprintf("Round %d of the %s cylinder deleted.", ri+1, c.Name)
	}
	carried := ri+1 < len(c.Rounds) && len(c.Rounds[ri].AdjustmentsBefore) > 0
	if carried {
		say += fmt.Sprintf(" The changes made before it now count before round %d, as they were made.", ri+1)
	}
	a.editRecords(say, func(root *jsonx.Value) bool {
		rounds := at(root, fmt.Sprintf("cylinders[%d].rounds", a.cyl))
		if rounds == nil || ri >= len(rounds.Elems) {
			return false
		}
		if carried {
			moved, next := rounds.Elems[ri].Last("adjustments_before"), rounds.Elems[ri+1]
			if later := next.Last("adjustments_before"); later != nil {
				later.Elems = append(append([]*jsonx.Value(nil), moved.Elems...), later.Elems...)
			} else {
				next.Keys, next.Vals = append(next.Keys, "adjustments_before"), append(next.Vals, moved)
			}
		}
		rounds.Elems = append(rounds.Elems[:ri:ri], rounds.Elems[ri+1:]...)
		return true
	})
	a.fieldsFor = fieldsKey{} // listed again for the rounds as they now stand
	a.planRound = 0
}

// RemoveLabel is the keypad screen's button that deletes the reading
// typed again from a round's list (not "Delete", which the keypad's Del
// key would be taken for).
const RemoveLabel = "Remove"

// deleteHere returns what deletes the record of the reading typed again
// from a round's list (the keypad screen's Remove), then goes back to the
// list with Undo; nil when it has no value.
func (a *App) deleteHere() func() {
	f := a.fields[a.fi]
	if _, ok := f.get(a.Session()); !ok || !a.editing {
		return nil
	}
	return func() {
		a.Back()
		a.deleteReading(f)
	}
}

// deleteReading deletes the record f's value belongs to (both port marks,
// a dead centre's two marks, a sweep reading's mark and gauge reading,
// one reading), offering Undo. A sweep left with no reading goes too.
func (a *App) deleteReading(f field) {
	s := a.Session()
	rec := f.Path(s)
	var labels []string
	for _, g := range a.fields {
		if g.Path(s) == rec {
			labels = append(labels, g.Label)
		}
	}
	a.editRecords(strings.Join(labels, " and ")+" deleted.", func(root *jsonx.Value) bool {
		if !dropAt(root, rec) {
			return false
		}
		if list := strings.TrimSuffix(rec, lastIndex(rec)); strings.HasSuffix(list, ".readings") {
			if l := at(root, list); l != nil && len(l.Elems) == 0 {
				dropAt(root, strings.TrimSuffix(list, ".readings")) // a sweep with no reading left
			}
		}
		return true
	})
}

// editRecords edits the current session as its file's JSON tree (the
// records of a reading or round go as a whole, whatever their kind) and
// saves it, offering Undo with say, which puts the file back as it was.
func (a *App) editRecords(say string, edit func(root *jsonx.Value) bool) {
	s := a.Session()
	old, err := encodeSession(s) // drafts too: they stay drafts
	if err != nil {
		return
	}
	root, err := jsonx.Parse(old, jsonx.Options{})
	if err != nil || !edit(root) {
		return
	}
	w := &jsonx.Writer{}
	w.Value(root)
	b, err := w.Bytes()
	if err != nil || !fileInto(s, b) {
		return
	}
	a.clearPlan()
	a.save()
	a.offerUndo(say, func() {
		fileInto(s, old)
		a.clearPlan()
		a.save()
	})
}

// fileInto reads the session file b into s, reporting whether it could.
func fileInto(s *session.Session, b []byte) bool {
	n, err := session.Decode(bytes.NewReader(b))
	if err != nil {
		return false
	}
	*s = *n
	return true
}

// at returns the value at a key path in a session file's tree ("" is the
// root), or nil.
func at(root *jsonx.Value, path string) *jsonx.Value {
	v := root
	for _, seg := range parsePath(path) {
		if v == nil {
			return nil
		}
		if seg.key != "" {
			v = v.Last(seg.key)
		}
		if seg.i != -1 {
			if v == nil || seg.i < 0 || seg.i >= len(v.Elems) {
				return nil
			}
			v = v.Elems[seg.i]
		}
	}
	return v
}

// dropAt removes the value at a key path (an entry of a list, or a key of
// an object) from a session file's tree, and reports whether it was there.
func dropAt(root *jsonx.Value, path string) bool {
	if idx := lastIndex(path); idx != "" {
		return drop(at(root, strings.TrimSuffix(path, idx)), "", idx)
	}
	i := strings.LastIndexByte(path, '.')
	return i > 0 && drop(at(root, path[:i]), path[i+1:], "")
}

// drop removes key from the object v, or (key "") the element "[i]" of
// the list v, and reports whether it was there.
func drop(v *jsonx.Value, key, index string) bool {
	if v == nil {
		return false
	}
	if key != "" {
		for i, k := range v.Keys {
			if k == key {
				v.Keys, v.Vals = append(v.Keys[:i:i], v.Keys[i+1:]...), append(v.Vals[:i:i], v.Vals[i+1:]...)
				return true
			}
		}
		return false
	}
	i, err := strconv.Atoi(strings.Trim(index, "[]"))
	if err != nil || i < 0 || i >= len(v.Elems) {
		return false
	}
	v.Elems = append(v.Elems[:i:i], v.Elems[i+1:]...)
	return true
}

// pathSeg is one key of a path and its list index (-1 for none).
type pathSeg struct {
	key string
	i   int
}

// parsePath splits a session file's key path into its keys ("" gives
// none).
func parsePath(p string) []pathSeg {
	var out []pathSeg
	if p == "" {
		return nil
	}
	for _, seg := range strings.Split(p, ".") {
		ps := pathSeg{seg, -1}
		if k := strings.IndexByte(seg, '['); k >= 0 {
			n, err := strconv.Atoi(strings.TrimSuffix(seg[k+1:], "]"))
			if err != nil {
				n = -2 // not an index: matches no list
			}
			ps = pathSeg{seg[:k], n}
		}
		out = append(out, ps)
	}
	return out
}

// undoFor is how long the Undo bar stays after a delete.
const undoFor = 8 * time.Second

// undoOffer is the Undo bar: what was done, and what takes it back (nil
// when the bar only says why nothing was done).
type undoOffer struct {
	say    string
	undo   func()
	until  time.Time
	screen Screen // the bar shows only there
}

// offerUndo shows the Undo bar on the screen shown for undoFor.
func (a *App) offerUndo(say string, undo func()) {
	a.undoing = &undoOffer{say: say, undo: undo, until: a.now().Add(undoFor), screen: a.screen}
	a.dirty = true
}

// expireUndo takes the Undo bar away once its time is up or its screen
// is left.
func (a *App) expireUndo() {
	if o := a.undoing; o != nil && (a.screen != o.screen || !a.now().Before(o.until)) {
		a.undoing, a.dirty = nil, true
	}
}

// undoLast takes back what the Undo bar offers.
func (a *App) undoLast() {
	o := a.undoing
	a.undoing, a.dirty = nil, true
	if o != nil && o.undo != nil {
		o.undo()
	}
}

// undoLayout lays out the Undo bar across the bottom of the screen: its
// box, its Undo button and its lines; ok is false when there is none.
func (a *App) undoLayout() (box, button render.Rect, lines []string, ok bool) {
	o := a.undoing
	if o == nil || o.screen != a.screen {
		return box, button, nil, false
	}
	bw := 0.0
	if o.undo != nil {
		bw = 96
	}
	w := a.w - 2*margin
	lines = render.Wrap(o.say, w-bw-3*gap, render.BodySize, true)
	h := max(rowH+2*gap, float64(len(lines))*render.BodySize*render.LineHeight+2*gap)
	box = rect(margin, a.h-margin-h, w, h)
	button = rect(box.Max.X-gap-bw, box.Min.Y+(h-rowH)/2, bw, rowH)
	return box, button, lines, true
}

// undoRoom is the height the Undo bar takes from the content's bottom.
func (a *App) undoRoom() float64 {
	if box, _, _, ok := a.undoLayout(); ok {
		return box.H() + gap
	}
	return 0
}

// undoBar puts the Undo button first among the screen's targets, over
// whatever is scrolled under the bar.
func (a *App) undoBar(v *view) {
	_, button, _, ok := a.undoLayout()
	if !ok || a.undoing.undo == nil {
		return
	}
	v.targets = append([]Target{{Label: "Undo", Rect: button, act: a.undoLast, over: true}}, v.targets...)
}

// drawUndo draws the Undo bar over the content: the sentence in the page
// colour on ink, and the Undo button.
func (a *App) drawUndo(c render.Canvas, v *view) {
	box, _, lines, ok := a.undoLayout()
	if !ok {
		return
	}
	th := a.theme
	c.Fill(a.roundRect(box, 10), render.FillStyle{Color: th.Ink})
	lh := render.BodySize * render.LineHeight
	top := box.Min.Y + (box.H()-float64(len(lines))*lh)/2
	st := render.TextStyle{Color: th.Background, Size: render.BodySize, Bold: true, VAlign: render.Top}
	for i, line := range lines {
		c.Text(render.Point{X: box.Min.X + gap, Y: top + float64(i)*lh}, line, st)
	}
	for _, t := range v.targets {
		if t.over {
			a.drawTarget(c, t)
		}
	}
}

// importAsk is a file of an engine already here, waiting for the choice:
// replace the engine here, or keep both.
type importAsk struct {
	s    *session.Session // the file's session
	same *Stored          // the engine of that name here
}

// alreadyHere handles a file whose engine is already here (a session of
// the same name): the same session is opened as it is; a different one
// waits on the engines list for the choice. It reports whether it did.
func (a *App) alreadyHere(s *session.Session) bool {
	for _, e := range a.stored {
		if e.Session == nil || s.Name == "" || e.Session.Name != s.Name {
			continue
		}
		b1, err1 := encodeSession(s)
		b2, err2 := a.encode(e.Session)
		if err1 == nil && err2 == nil && bytes.Equal(b1, b2) {
			a.openSession(e) // importing the same file twice makes nothing new
			return true
		}
		a.asking = &importAsk{s: s, same: e}
		if a.screen != Engines {
			a.navigate(Engines)
		}
		return true
	}
	return false
}

// importQuestion asks, on the engines list, what to do with a file of an
// engine already here.
func (a *App) importQuestion(l *layouter) {
	q := a.asking
	if q == nil {
		return
	}
	l.text(fmt.Sprintf("The file holds %q, and an engine of that name is already here (%s; the file has %s). Replace the engine here with the file, or keep both?",
		q.s.Name, roundsWords(a.roundsTaken(q.same.Session)), roundsWords(a.roundsTaken(q.s))), true)
	l.row([]string{"Replace it", "Keep both", "Cancel"}, make([]bool, 3), []func(){a.replaceByImport, a.keepBoth, func() { a.asking = nil }})
}

// replaceByImport puts the file's session in place of the engine of its
// name, offering Undo, which writes the engine's file back as it was.
func (a *App) replaceByImport() {
	q := a.asking
	a.asking = nil
	e := q.same
	if indexWhere(a.stored, func(x *Stored) bool { return x == e }) < 0 {
		a.keepBothOf(q) // deleted meanwhile: nothing to replace
		return
	}
	old, oldRaw := e.Session, e.Raw
	e.Session = q.s
	a.saveStored(e, nil)
	if a.cur == e {
		a.clearPlan()
	}
	a.offerUndo(fmt.Sprintf("%s replaced by the file.", q.s.Name), func() {
		e.Session, e.Raw = old, oldRaw
		a.put(e.Key, oldRaw)
		if a.cur == e {
			a.clearPlan()
		}
	})
}

// keepBoth stores the file's session beside the engine of its name, named
// apart ("... (2)"), and opens it.
func (a *App) keepBoth() {
	q := a.asking
	a.asking = nil
	a.keepBothOf(q)
}

// keepBothOf stores q's session under a name no stored engine has, and
// opens it.
func (a *App) keepBothOf(q *importAsk) {
	base := q.s.Name
	for n := 2; a.nameUsed(q.s.Name); n++ {
		q.s.Name = fmt.Sprintf("%s (%d)", base, n)
	}
	a.addSession(q.s, true)
	a.openSession(a.cur)
}

// nameUsed reports whether a stored engine is called name.
func (a *App) nameUsed(name string) bool {
	return indexWhere(a.stored, func(e *Stored) bool { return e.Session != nil && e.Session.Name == name }) >= 0
}
