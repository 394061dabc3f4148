// Package report writes Evenbeat's printed report, as a PDF of A4 pages
// (render/pdf) or a tall PNG (render/raster): the whole engine of a
// session (each cylinder's readings, event table, balance, valve curves
// and plan, the beat, and the cautions) as render.Report draws it.
//
// It imports render, render/raster, setting and its subpackages and the
// standard library; never ebiten or syscall/js.
package report

import (
	"image/png"
	"io"
	"math"

	"evenbeat/render"
	"evenbeat/render/pdf"
	"evenbeat/render/raster"
	"evenbeat/setting/plan"
	"evenbeat/setting/session"
)

// Options tune the report. The zero value gives the light theme at
// render.ReportWidth logical units drawn at scale 1.5 (960 pixels wide,
// about 150 dots per inch across a printed A4 page), for cylinder 0 with
// equal leads.
type Options struct {
	Plan  plan.Options // the plan's choices (cylinder, priority)
	Dark  bool         // the dark theme instead of the light one
	Width float64      // logical width; 0 means render.ReportWidth
	Scale float64      // device pixels per logical unit; 0 means 1.5
}

// Build returns the report's model for a session: the fit and plan of the
// chosen cylinder, then the engine's other cylinders and its beat
// (render.WholeEngine). Errors are the chosen cylinder's fit's and plan's
// *setting.Error sentences.
func Build(s *session.Session, opt Options) (render.ReportModel, error) {
	m, err := render.NewSessionModel(s, opt.Plan)
	if err != nil {
		return render.ReportModel{}, err
	}
	o := opt.Plan
	o.Fit = plan.FitOptions{} // the other cylinders' latest rounds
	return render.WholeEngine(s, m, o), nil
}

// Draw draws the report of rm into a new raster canvas of the report's
// height.
func Draw(rm render.ReportModel, opt Options) *raster.Canvas {
	w := opt.Width
	if !(w > 0) || math.IsInf(w, 0) {
		w = render.ReportWidth
	}
	k := opt.Scale
	if !(k > 0) || math.IsInf(k, 0) {
		k = 1.5
	}
	th := render.Light()
	if opt.Dark {
		th = render.Dark()
	}
	h := render.ReportHeight(w, rm)
	c := raster.New(int(math.Ceil(w*k)), int(math.Ceil(h*k)), k)
	render.Report(c, rm, th) // paints its own ground
	return c
}

// EncodePNG encodes a drawn canvas as PNG (fast compression: the
// pictures are mostly flat colour). It lives here, not in render/raster,
// so that the browser app, which draws its reports with render/raster but
// makes the PNG with the browser's own encoder, carries no PNG code.
func EncodePNG(w io.Writer, c *raster.Canvas) error {
	enc := png.Encoder{CompressionLevel: png.BestSpeed}
	return enc.Encode(w, c.Image())
}

// WritePDF fits and plans a session and writes its report as a PDF of
// A4 pages to w (render/pdf), in the light theme whatever opt says: it is
// for paper.
func WritePDF(w io.Writer, s *session.Session, opt Options) error {
	rm, err := Build(s, opt)
	if err != nil {
		return err
	}
	return PDF(w, rm, Title(rm))
}

// PDF writes rm's report as a PDF of A4 pages with the title given.
func PDF(w io.Writer, rm render.ReportModel, title string) error {
	lw := float64(render.ReportWidth)
	c := pdf.New(lw, render.ReportHeight(lw, rm))
	render.Report(c, rm, render.Light())
	return c.Write(w, title)
}

// Title is the report's title for a document's information: the engine
// and the words "valve setting report".
func Title(rm render.ReportModel) string {
	if rm.Model == nil {
		return "Valve setting report"
	}
	return rm.Model.Spec.Name + ": valve setting report"
}

// WritePNG fits and plans a session and writes its report as a PNG to w
// (fast compression: the picture is mostly flat colour).
func WritePNG(w io.Writer, s *session.Session, opt Options) error {
	rm, err := Build(s, opt)
	if err != nil {
		return err
	}
	return EncodePNG(w, Draw(rm, opt))
}
