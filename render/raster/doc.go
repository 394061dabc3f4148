// Package raster is a render.Canvas that draws into an *image.RGBA:
// anti-aliased fills with golang.org/x/image/vector (strokes become fills
// through render.Outline), text with the embedded font through
// golang/freetype's truetype faces, each alpha-blended over the pixels
// already there. It makes the PNG report and the app icons, and is the
// reference for what the browser backend should show.
//
// Units: the canvas is wPx by hPx device pixels; the drawing is in logical
// units (CSS px) multiplied by scale, so the logical size is px/scale.
// Origin top-left, y down. The package imports render, x/image and
// freetype; never ebiten or syscall/js.
package raster
