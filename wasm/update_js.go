//go:build js

package main

import "syscall/js"

// The page (site/index.html) watches the service worker: when a new
// version has installed and waits, it sets window.evenbeatUpdateWaiting
// and calls window.evenbeatOnUpdate if the app has set it. The app then
// shows its banner; its Restart calls window.evenbeatActivateUpdate, which
// asks the waiting worker to take over, and the page reloads once the
// worker controls it and window.evenbeatSettled is not false.

// listenForUpdate lets the page tell the app that a new version waits, and
// takes in a notice the page gave before the app started.
func (g *flowGame) listenForUpdate() {
	g.window.Set("evenbeatOnUpdate", js.FuncOf(func(js.Value, []js.Value) any {
		g.mu.Lock()
		g.updateWaits = true
		g.mu.Unlock()
		return nil
	}))
	if g.window.Get("evenbeatUpdateWaiting").Truthy() {
		g.updateWaits = true
	}
	g.window.Set("evenbeatUpdateReady", false)
}

// askRestart is the app's OnUpdate: the restart happens on a later tick,
// once every write has completed.
func (g *flowGame) askRestart() { g.restart = true }

// updateTick shows the banner once the page has reported a waiting
// version, and starts a restart asked for when nothing is being saved.
func (g *flowGame) updateTick() {
	g.mu.Lock()
	waits := g.updateWaits
	g.mu.Unlock()
	if waits && !g.bannerShown {
		g.bannerShown = true
		g.ui.SetUpdateReady(true)
		g.window.Set("evenbeatUpdateReady", true)
	}
	if g.restart && g.settled() {
		g.restart = false
		if f := g.window.Get("evenbeatActivateUpdate"); f.Type() == js.TypeFunction {
			f.Invoke()
			g.window.Set("evenbeatRestarting", true)
		}
	}
}

// settled reports whether the page may reload without losing an entry:
// nothing is open, or every write asked for has completed ("Saved"), or
// none was asked for since the start ("Not saved yet": what is open is as
// stored). A failed write keeps the page, with its entries, until the user
// exports or a later write succeeds.
func (g *flowGame) settled() bool {
	st := g.ui.Status()
	return g.ui.Session() == nil || st == "Saved" || st == "Not saved yet"
}
