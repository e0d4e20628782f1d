// Package report draws quick-look pictures of runs and batches as PNG
// images: a map of the stimulated fracture network (Map), the growth of the
// stimulated area over time (Growth), percentile fan charts of a batch (Fan)
// and a comparison of sweep values (Comparison).
//
// The package draws; it computes no results. Every picture is a plain Go
// value filled in by the caller from its run or batch results, and its
// WritePNG method renders it with gonum.org/v1/plot (vg/vgimg, pure Go) and
// writes the PNG to an io.Writer. Nothing is read from or written to files
// by path.
//
// # Units
//
// Coordinates are local East-North metres. Times are seconds (drawn in
// hours), areas square metres (drawn in m², 10³ m² or km², whichever keeps
// the numbers short; the axis label names the unit), pressures pascals
// (drawn in MPa). The one exception is the map's colour value
// (Trace.Value), which is drawn as given, in the unit the caller names in
// ColourScale.Unit (e.g. first-slip time in hours), because the map can be
// coloured by any quantity.
//
// Picture sizes are pixels. Every picture is laid out on a design page of
// 10 × 7.5 inches (720 × 540 points) scaled to the requested size: the
// resolution is min(width/10, height/7.5) dots per inch, so fonts and line
// widths, given in points, keep their proportions at any size. The default
// size is 1600 × 1200 pixels (160 dpi); sizes from MinWidth × MinHeight to
// MaxSide × MaxSide pixels are accepted.
//
// # Conventions
//
// The map has an equal aspect ratio (one metre is as long on both axes); the
// requested extent is always shown whole and is widened along one axis to
// fill the frame. The north arrow points to grid north of the local frame
// (the +North axis), which is the projected CRS's grid north, not true
// north. The scale bar has a round length (1, 2 or 5 × 10ⁿ m) of about a
// fifth of the frame width.
//
// Traces are coloured with viridis, a perceptually uniform sequential colour
// map whose lightness rises monotonically, so it reads in greyscale and by
// readers with the common colour-vision deficiencies (van der Walt & Smith
// 2015). The table is a uniform 52-entry subset (every 5th entry) of
// matplotlib's 256-entry viridis table (CC0), interpolated linearly in sRGB;
// the tests bound the interpolation error against the full table in
// testdata/viridis256.txt. Traces without a value (NaN, e.g. never slipped)
// are thin and grey. Categorical elements use the Okabe–Ito palette (Okabe &
// Ito 2008) and are told apart by line style, width or marker shape as well
// as colour, so every picture survives greyscale printing.
//
// Events are circles whose radius grows linearly with moment magnitude
// between the integer magnitudes that bracket the catalogue (common
// practice, no source); a size key shows those integer magnitudes. Beyond
// 200 events the circles fade as 1/√n so that the traces stay visible.
//
// Percentiles are drawn as given; their definition (which percentile, of
// what, in which order) is the caller's Convention string, printed under
// the chart. P10 ≤ P50 ≤ P90 is required.
//
// Every picture carries the one-line caution Caution: slipfront is a
// screening and comparison tool, not a design code.
//
// Bad input (NaN or infinite coordinates, mismatched lengths, unordered
// times or percentiles, an empty extent, a size out of range) returns an
// error naming the field, index and value. Degenerate but valid input (no
// traces, no events, every value NaN, a single time) draws a frame with
// what there is.
//
// # References
//
// van der Walt, S. & Smith, N. (2015), "A better default colormap for
// Matplotlib", SciPy 2015 conference talk; colour-map data from the
// mpl-colormaps package (N. J. Smith, S. van der Walt, E. Firing), CC0 1.0,
// https://github.com/BIDS/colormap.
//
// Okabe, M. & Ito, K. (2008), "Color Universal Design (CUD): how to make
// figures and presentations that are friendly to colorblind people",
// https://jfly.uni-koeln.de/color/.
//
// CIE 15:2004, Colorimetry, 3rd ed. (CIE 1976 L*), and IEC 61966-2-1:1999
// (the sRGB transfer function), used by the tests to check that the colour
// map's lightness is monotone.
package report
