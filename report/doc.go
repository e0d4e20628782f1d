// Package report draws the pictures of screenings, runs and batches as PNG
// images.
//
// Screening: the poles of the fractures on a lower-hemisphere equal-area
// net with the principal stress axes (Stereonet), the three-dimensional
// Mohr diagram with the failure envelope (Mohr), the share of fractures
// and of trace length that slip against the pressure increase
// (SlipShares), and a Map of the traces coloured by Δp_c.
//
// Run: the map of the stimulated fracture network (Map), the growth of the
// stimulated area over time (Growth), event distance from the injection
// point against time with the diffusion front (DistanceTime), the
// magnitude–frequency chart (MagnitudeFrequency) and a vertical section
// along a well (CrossSection).
//
// Batch: percentile fan charts of one case (Fan) and of every case on
// shared axes (FanPanels), a comparison of sweep values (Comparison), the
// stimulation probability map of a case (ProbabilityMap), the difference
// of two cases' probabilities (DifferenceMap) and the distribution of
// per-realization ratios against a reference case (RatioDistribution).
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
// (drawn in MPa), stresses pascals (drawn in MPa), diffusivities m²/s,
// angles radians. The exceptions are colour values (Trace.Value,
// NetPlane.Value, SectionFracture.Value), drawn as given in the unit the
// caller names in ColourScale.Unit (e.g. first-slip time in hours, Δp_c in
// MPa), because they can be any quantity; and probabilities, shares and
// ratios, which are dimensionless (shares drawn in %).
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
// Stress is compression-positive; the Mohr diagram takes effective
// stresses σ′ = σ − p. Orientations are dip and dip direction (clockwise
// from north); the stereonet shows the lower-hemisphere poles on a net of
// unit radius, r = √2·sin(θ/2) for a pole θ from the vertical. Sections
// show depth (TVD) positive down, with the vertical exaggeration printed.
//
// Traces are coloured with viridis, a perceptually uniform sequential colour
// map whose lightness rises monotonically, so it reads in greyscale and by
// readers with the common colour-vision deficiencies (van der Walt & Smith
// 2015). Signed differences use ColorBrewer's diverging RdBu scheme, marked
// colour-blind safe by its authors (Harrower & Brewer 2003); its two ends
// are equally dark, so the difference map also carries the sign in its
// contour line styles. The table is a uniform 52-entry subset (every 5th entry) of
// matplotlib's 256-entry viridis table (CC0), interpolated linearly in sRGB;
// the tests bound the interpolation error against the full table in
// testdata/viridis256.txt. Traces without a value (NaN, e.g. never slipped)
// are thin and grey. Categorical elements use the Okabe–Ito palette (Okabe &
// Ito 2008) and are told apart by line style, width or marker shape as well
// as colour, so every picture survives greyscale printing.
//
// On the run map the stimulated traces read first: events are small light
// rings beneath the coloured traces, the outline is a thin line, primary
// conduits are dashed and labels are placed clear of markers (greedy
// candidate positions; Christensen, Marks & Shieber 1995).
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
// Aki, K. (1965), "Maximum likelihood estimate of b in the formula
// log N = a − bM and its confidence limits", Bulletin of the Earthquake
// Research Institute 43, 237–239.
//
// Allmendinger, R.W., Cardozo, N. & Fisher, D.M. (2012), Structural Geology
// Algorithms: Vectors and Tensors, Cambridge University Press.
//
// Christensen, J., Marks, J. & Shieber, S. (1995), "An empirical study of
// algorithms for point-feature label placement", ACM Transactions on
// Graphics 14(3), 203–232.
//
// Gutenberg, B. & Richter, C.F. (1944), "Frequency of earthquakes in
// California", Bulletin of the Seismological Society of America 34(4),
// 185–188.
//
// Harrower, M. & Brewer, C.A. (2003), "ColorBrewer.org: an online tool for
// selecting colour schemes for maps", The Cartographic Journal 40(1),
// 27–37.
//
// Jaeger, J.C., Cook, N.G.W. & Zimmerman, R.W. (2007), Fundamentals of
// Rock Mechanics, 4th ed., Blackwell.
//
// Okabe, M. & Ito, K. (2008), "Color Universal Design (CUD): how to make
// figures and presentations that are friendly to colorblind people",
// https://jfly.uni-koeln.de/color/.
//
// Pearson, K. (1900), "On the criterion that a given system of deviations
// from the probable …", Philosophical Magazine 50(302), 157–175 (the
// chi-square test of the stereonet's equal-area property).
//
// Shapiro, S.A., Huenges, E. & Borm, G. (1997), Geophysical Journal
// International 131, F15–F18 (permeability from the triggering front of
// injection-induced seismicity).
//
// Snyder, J.P. (1987), Map Projections — A Working Manual, USGS
// Professional Paper 1395 (Lambert azimuthal equal-area projection).
//
// Tol, P. (2021), "Colour schemes", SRON technical note
// SRON/EPS/TN/09-002, version 3.2 (from memory).
//
// CIE 15:2004, Colorimetry, 3rd ed. (CIE 1976 L*), and IEC 61966-2-1:1999
// (the sRGB transfer function), used by the tests to check that the colour
// map's lightness is monotone.
package report
