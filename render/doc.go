// Package render draws Evenbeat's diagrams through a small Canvas seam, so
// the same diagram code paints the ebiten canvas in the browser, a PNG on
// the command line, and a text log in tests.
//
// Units and conventions: every coordinate is in logical units, equal to
// CSS pixels on a phone, origin at the top-left, y pointing down (as image
// and ebiten). A backend maps logical units to device pixels by its own
// scale (3 on a 3x phone). Text sizes are em sizes in logical units; no
// diagram text is smaller than 14. Angles at the API are degrees; lengths
// shown to the user are the model's millimetres.
//
// The pieces:
//   - Canvas (Size, Fill, Stroke, Text) with value styles whose zero values
//     are documented defaults.
//   - Outline: the one place a stroke becomes a fillable outline (round
//     joins and caps, dashes applied), so every backend draws the same
//     lines; Arc, Circle, RectPath, RoundRect build paths.
//   - Text measurement and outlines from the glyph tables in render/font
//     (Go Regular and Go Bold): TextWidth, TextOrigin, TextBox, Wrap,
//     GlyphPath, TextPath, PlaceGlyphs, GlyphBounds.
//   - Theme: Light and Dark palettes and the line and marker styles that
//     tell the front and back ends apart by shape as well as colour.
//   - Plot pieces shared by diagrams: Axes (scales, grid, ticks, sampled
//     curves), DrawLegend, Button.
//   - Model: one cylinder worked out once (NewEngineModel for an engine as
//     drawn, NewSessionModel for a session's fit and plan): each reverser
//     position's valve curve sampled every CurveStep degrees today and
//     after the plan, the events of both, the readings with their
//     residuals, and the scale drawing's frame. Drawing only maps numbers,
//     so a frame is cheap; build a new Model when the data change.
//   - Diagrams, each a function of (canvas, model, box): PistonCurve,
//     Cautions (returns its button's hit rectangle), Icon, ValveCurve,
//     Balance, ValvePiston, PortOpening, Motion (one frame of the
//     animation at a crank angle) and PlanCard (returns each step's hit
//     rectangle); DrawScreen draws a whole phone screen with the position
//     tabs (LayoutTabs, LayoutSideTabs) and returns its touch targets;
//     Report draws the printed report (ReportHeight); DimensionSketch
//     shows where a set-up value is measured. Their layout maths
//     (LayoutPiston, LayoutCautions, CautionsHeight, LayoutCard,
//     LayoutValveCurve, LayoutBalance, LayoutMotion, LayoutPlan, ValveEdges,
//     ValveRange, Ports, PortStateAt, Ticks, AngleTicks, Scale) are plain
//     functions tested with numbers, so an app can learn where a button is
//     without drawing.
//   - Front and back differ by more than colour everywhere: front solid
//     lines and round markers, back dashed lines, square markers and
//     hatched bands; port states by pattern (steam solid, exhaust hatched,
//     closed empty); the balance card's verdicts by shape (tick or cross).
//
// Backends live in sub-packages: render/recorder (a text log for goldens
// and layout checks) and render/raster (*image.RGBA and PNG); render/report
// writes the report of a session as a PNG. The browser's ebiten backend
// lives with the app.
//
// Text is the Go font family (render/font/LICENSE), drawn from outlines
// generated once from its TrueType files; Freetype-Go reads those files
// only in the tests that generate and check the tables, under the FreeType
// License (render/font/FTL.txt): portions of this software are copyright
// 2010 The FreeType Project (www.freetype.org). All rights reserved.
//
// Imports: setting and its subpackages session and plan, render/font and
// the standard library (its tests also golang.org/x/image and Freetype-Go).
// Never ebiten or syscall/js: render must build and test natively with no
// display.
package render
