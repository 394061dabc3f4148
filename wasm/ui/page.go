package ui

import "evenbeat/render"

// SetTheme sets the palette, when the page's colour scheme changes while
// the app runs (the OS turned dark at dusk), and draws again.
func (a *App) SetTheme(th render.Theme) {
	if th != a.theme {
		a.theme, a.dirty = th, true
	}
}
