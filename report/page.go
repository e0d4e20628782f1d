package report

import (
	"fmt"
	"image"
	"image/color"
	"image/png"
	"io"
	"math"
	"slipfront/internal/caution"

	xfont "golang.org/x/image/font"
	"gonum.org/v1/plot"
	"gonum.org/v1/plot/font"
	"gonum.org/v1/plot/text"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"
	"gonum.org/v1/plot/vg/vgimg"
)

// Caution is the one-line note printed at the bottom of every picture.
const Caution = caution.Short

// Size is a picture size in pixels. The zero Size means DefaultSize.
type Size struct {
	Width, Height int // Pixels.
}

// DefaultSize is the size of a picture whose Size is zero: 1600 × 1200
// pixels.
var DefaultSize = Size{Width: 1600, Height: 1200}

// Limits of a picture size, pixels.
const (
	MinWidth  = 320
	MinHeight = 240
	MaxSide   = 8192
)

// Design page: the layout is made for 10 × 7.5 inches and scaled to the
// requested pixel size (see the package documentation).
const (
	designWidthInch  = 10
	designHeightInch = 7.5
)

// resolve returns s, or DefaultSize when s is zero, or an error when s is
// outside the accepted range.
func (s Size) resolve() (Size, error) {
	if s == (Size{}) {
		return DefaultSize, nil
	}
	if s.Width < MinWidth || s.Height < MinHeight || s.Width > MaxSide || s.Height > MaxSide {
		return s, fmt.Errorf("report: picture size %d×%d px: width must be %d–%d px and height %d–%d px",
			s.Width, s.Height, MinWidth, MaxSide, MinHeight, MaxSide)
	}
	return s, nil
}

// page is one raster picture being drawn: a vgimg canvas of exactly the
// requested pixel size at the resolution that maps the design page onto it.
type page struct {
	canvas *vgimg.Canvas
	dc     draw.Canvas
	dpi    float64
	height int // Pixels.
}

// newPage returns a white page of size s (already resolved).
func newPage(s Size) *page {
	dpi := int(math.Round(math.Min(float64(s.Width)/designWidthInch, float64(s.Height)/designHeightInch)))
	dpi = max(dpi, 1)
	img := image.NewRGBA(image.Rect(0, 0, s.Width, s.Height))
	c := vgimg.NewWith(vgimg.UseImage(img), vgimg.UseDPI(dpi))
	return &page{canvas: c, dc: draw.New(c), dpi: float64(dpi), height: s.Height}
}

// pixel returns the image coordinates (x right, y down, pixel units, the
// centre of pixel (i, j) at (i+0.5, j+0.5)) of a page point.
func (pg *page) pixel(pt vg.Point) (x, y float64) {
	return pt.X.Dots(pg.dpi), float64(pg.height) - pt.Y.Dots(pg.dpi)
}

// image returns the drawn picture.
func (pg *page) image() image.Image { return pg.canvas.Image() }

// pngEncoder encodes every picture. It is a variable so that the fuzz
// tests, which check the drawing and not the standard library's deflate,
// can encode without compression (twice as many inputs per second).
var pngEncoder = &png.Encoder{}

// writePNG encodes the page as PNG to w.
func (pg *page) writePNG(w io.Writer) error {
	if err := pngEncoder.Encode(w, pg.canvas.Image()); err != nil {
		return fmt.Errorf("report: writing PNG: %w", err)
	}
	return nil
}

// Font sizes and line widths on the design page, points.
const (
	sizeTitle = 15
	sizeLabel = 11
	sizeTick  = 9.5
	sizeKey   = 9.5
	sizeNote  = 8.5
	sizeTag   = 9 // Labels inside a chart: stage names, well names.

	widthAxis = 0.8
	margin    = 10 // Page margin.
)

// Okabe & Ito (2008) colour-blind-safe palette.
var (
	okabeBlack      = color.NRGBA{0, 0, 0, 255}
	okabeOrange     = color.NRGBA{230, 159, 0, 255}
	okabeSkyBlue    = color.NRGBA{86, 180, 233, 255}
	okabeGreen      = color.NRGBA{0, 158, 115, 255}
	okabeBlue       = color.NRGBA{0, 114, 178, 255}
	okabeVermillion = color.NRGBA{213, 94, 0, 255}

	greyNoValue = color.NRGBA{170, 170, 170, 255}
	greyGuide   = color.NRGBA{110, 110, 110, 255}
	white       = color.NRGBA{255, 255, 255, 255}
)

// sans is the typeface of every text: Liberation Sans, bundled with
// gonum/plot.
var sans = font.Font{Typeface: "Liberation", Variant: "Sans"}

// textStyle returns a plain text style in Liberation Sans.
func textStyle(size float64, bold bool, xa text.XAlignment, ya text.YAlignment) text.Style {
	f := font.From(sans, font.Length(size))
	if bold {
		f.Weight = xfont.WeightBold
	}
	return text.Style{
		Color:   okabeBlack,
		Font:    f,
		XAlign:  xa,
		YAlign:  ya,
		Handler: plot.DefaultTextHandler,
	}
}

// newPlot returns a plot with the package's fonts and line widths and no
// title (titles are drawn on the page).
func newPlot(xLabel, yLabel string) *plot.Plot {
	p := plot.New()
	p.BackgroundColor = nil
	for _, a := range []*plot.Axis{&p.X, &p.Y} {
		a.Label.TextStyle.Font = font.From(sans, sizeLabel)
		a.Label.Padding = 3
		a.Tick.Label.Font = font.From(sans, sizeTick)
		a.LineStyle.Width = widthAxis
		a.Tick.LineStyle.Width = widthAxis
		a.Tick.Length = 4
		a.Tick.Marker = niceTicks{n: 6}
	}
	p.X.Label.Text = xLabel
	p.Y.Label.Text = yLabel
	return p
}

// frame draws the title at the top of the page and the notes (one line
// each, the caution last) at the bottom, and returns the canvas left
// between them.
func frame(c draw.Canvas, title string, notes ...string) draw.Canvas {
	c = draw.Crop(c, margin, -margin, margin, -margin)
	if title != "" {
		st := textStyle(sizeTitle, true, draw.XCenter, draw.YTop)
		c.FillText(st, vg.Point{X: c.Center().X, Y: c.Max.Y}, title)
		c.Max.Y -= st.Height(title) + 6
	}
	lines := append(notes[:len(notes):len(notes)], Caution)
	st := textStyle(sizeNote, false, draw.XLeft, draw.YBottom)
	lineHeight := st.FontExtents().Height
	y := c.Min.Y
	for i := len(lines) - 1; i >= 0; i-- {
		if lines[i] == "" {
			continue
		}
		c.FillText(st, vg.Point{X: c.Min.X, Y: y}, lines[i])
		y += lineHeight
	}
	c.Min.Y = y + 6
	return c
}

// haloText draws txt with a thin white halo so it stays legible over
// coloured lines.
func haloText(c draw.Canvas, st text.Style, pt vg.Point, txt string) {
	halo := st
	halo.Color = white
	const d = 0.9 // Halo width, points.
	for _, off := range [...][2]vg.Length{{-d, 0}, {d, 0}, {0, -d}, {0, d}, {-d, -d}, {d, d}, {-d, d}, {d, -d}} {
		c.FillText(halo, vg.Point{X: pt.X + off[0], Y: pt.Y + off[1]}, txt)
	}
	c.FillText(st, pt, txt)
}

// secondsPerHour converts times in seconds to the hours drawn on the axes.
const secondsPerHour = 3600

// areaUnit returns the factor from m² to the drawn unit and the unit's
// name for areas up to maxArea, m².
func areaUnit(maxArea float64) (factor float64, unit string) {
	switch {
	case maxArea < 1e4:
		return 1, "m²"
	case maxArea < 1e7:
		return 1e-3, "10³ m²"
	default:
		return 1e-6, "km²"
	}
}

// finite reports whether v is neither NaN nor infinite.
func finite(v float64) bool { return !math.IsNaN(v) && !math.IsInf(v, 0) }

// minus replaces a leading hyphen-minus with the minus sign U+2212.
func minus(s string) string {
	if len(s) > 0 && s[0] == '-' {
		return "−" + s[1:]
	}
	return s
}
