// Package raster is a render.Canvas that draws into an *image.RGBA:
// anti-aliased fills with golang.org/x/image/vector (strokes become fills
// through render.Outline, text through render.TextPath: the font's own
// outlines from render/font, the ones the browser fills too), each
// alpha-blended over the pixels already there. It makes the PNG report
// and the app icons, and is the reference for what the browser backend
// should show.
//
// Units: the canvas is wPx by hPx device pixels; the drawing is in logical
// units (CSS px) multiplied by scale, so the logical size is px/scale.
// Origin top-left, y down. The package imports render and x/image; never
// ebiten or syscall/js.
package raster
