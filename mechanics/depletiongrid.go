package mechanics

import (
	"fmt"
	"math"

	"gonum.org/v1/gonum/dsp/fourier"

	"slipfront/scenarios"
)

// MaxDepletionCells caps the cells of a [DepletionGrid]: the scenario's
// cap on its depletion grid. The kernel tables take 24 bytes per cell and
// the FFT summation about 160 more (five half-spectra on a grid padded to
// twice the size each way), so the cap keeps a response within about
// 400 MB.
const MaxDepletionCells = scenarios.MaxDepletionCells

// DepletionGrid is a regular map grid carrying a depletion field, one
// pore-pressure change per cell. Cell (col, row) has index row·Cols + col,
// col counting west to east and row south to north, as in the scenario's
// map grid; its centre is where the stress change is given.
type DepletionGrid struct {
	Cols, Rows int     // cells west to east and south to north
	DX, DY     float64 // cell size east and north, m
}

// Cells returns the number of cells.
func (g DepletionGrid) Cells() int { return g.Cols * g.Rows }

// Validate returns an error unless the grid has at least one and at most
// MaxDepletionCells cells of finite positive size.
func (g DepletionGrid) Validate() error {
	if err := firstError(positive("depletion grid dx", g.DX), positive("depletion grid dy", g.DY)); err != nil {
		return err
	}
	if g.Cols < 1 || g.Rows < 1 {
		return &InputError{Name: "depletion grid cells", Value: float64(min(g.Cols, g.Rows)),
			Want: fmt.Sprintf("the grid is %d × %d: cols and rows must be ≥ 1", g.Cols, g.Rows)}
	}
	if g.Cols > MaxDepletionCells/g.Rows {
		return &InputError{Name: "depletion grid cells", Value: float64(g.Cols) * float64(g.Rows),
			Want: fmt.Sprintf("the grid is %d × %d: must be ≤ %d cells; use larger cells", g.Cols, g.Rows, MaxDepletionCells)}
	}
	return nil
}

// Summation chooses how [GridResponse.Change] sums the cells.
type Summation int

const (
	// AutoSummation sums directly when that is cheaper than the FFT
	// (few depleted cells, a small grid, or a single field, for which the
	// FFT's kernel spectra are not yet built), by FFT otherwise.
	AutoSummation Summation = iota
	// DirectSummation adds every depleted cell's contribution at every
	// cell centre: O(cells × depleted cells), exact to round-off.
	DirectSummation
	// FFTSummation convolves the field with the kernels by FFT on a grid
	// padded to at least (2·Cols − 1) × (2·Rows − 1), so that the circular
	// convolution is the linear one (Press et al. 2007, §13.1):
	// O(cells·log cells); it agrees with the direct sum to round-off
	// (relative 1e-12 of the largest change in the tests).
	FFTSummation
)

// GridResponse is the stress change of a [Layer] to a depletion field on a
// [DepletionGrid]: the superposition over cells of the closed-form change
// of a uniformly depleted rectangular cell (a prism of the layer's
// thickness), evaluated at every cell centre. Because each cell's
// contribution is integrated exactly, the superposition is exact for a
// field that is uniform in each cell; a region that does not follow the
// cell edges converges to its own solution as the cells shrink.
//
// Build it once per grid with [NewGridResponse] and apply it to any number
// of fields (a depletion history). A GridResponse is not safe for
// concurrent use: it keeps work buffers; build one per goroutine.
type GridResponse struct {
	grid DepletionGrid
	path float64 // stress-path coefficient A
	// kxx, kyy and kxy are A·ψ_ij/(4π) of the unit-depletion cell at
	// offset (p, q) ≥ 0 cells from the point, index q·Cols + p. Offsets of
	// either sign follow by symmetry: kxx and kyy are even in p and in q,
	// kxy is odd in each.
	kxx, kyy, kxy []float64
	fft           *gridFFT // built on the first FFT summation
	src           []source // depleted cells of the field being summed
}

// source is a depleted cell.
type source struct {
	col, row int
	dp       float64 // Pa
}

// NewGridResponse returns the response of the layer l on the grid g, or an
// error for invalid constants or grid.
func NewGridResponse(l Layer, g DepletionGrid) (*GridResponse, error) {
	if err := firstError(l.Validate(), g.Validate()); err != nil {
		return nil, err
	}
	r := &GridResponse{grid: g, path: l.StressPath()}
	r.kxx, r.kyy, r.kxy = cellKernels(g, l.Thickness/2, r.path/(4*math.Pi))
	return r, nil
}

// Grid returns the grid of the response.
func (r *GridResponse) Grid() DepletionGrid { return r.grid }

// cellKernels returns scale·ψ_ij at a cell centre of the unit cells at
// offsets (p, q) ≥ 0, for the layer of half-thickness c (+Inf: plane
// strain). Over a rectangle the Hessian of the line potential g integrates
// to sums over the corners (X, Y) taken relative to the point,
//
//	ψ_ij = G_ij(X₂, Y₂) − G_ij(X₁, Y₂) − G_ij(X₂, Y₁) + G_ij(X₁, Y₁)
//	G_xx = −2·atan(cY/(X·R)),  G_yy = −2·atan(cX/(Y·R)),  G_xy = 2·asinh(c/ρ)
//
// with R = √(X² + Y² + c²) and ρ = √(X² + Y²): the second derivatives of
// the potential of a right rectangular prism at its mid-height (Nagy, Papp
// & Benedek 2000). As c → ∞, G_xx → −2·atan(Y/X), G_yy → −2·atan(X/Y) and
// G_xy → −2·ln ρ up to a constant that cancels in the corner sum. Cell
// edges lie half a cell from the centres, so X and Y are never zero.
func cellKernels(g DepletionGrid, c, scale float64) (kxx, kyy, kxy []float64) {
	nc, nr := g.Cols+1, g.Rows+1
	gxx := make([]float64, nc*nr)
	gyy := make([]float64, nc*nr)
	gxy := make([]float64, nc*nr)
	for q := range nr {
		y := (float64(q) - 0.5) * g.DY
		for p := range nc {
			x := (float64(p) - 0.5) * g.DX
			k := q*nc + p
			if math.IsInf(c, 1) {
				gxx[k] = -2 * math.Atan(y/x)
				gyy[k] = -2 * math.Atan(x/y)
				gxy[k] = -2 * math.Log(math.Hypot(x, y))
				continue
			}
			rr := math.Sqrt(x*x + y*y + c*c)
			gxx[k] = -2 * math.Atan(c*y/(x*rr))
			gyy[k] = -2 * math.Atan(c*x/(y*rr))
			gxy[k] = 2 * math.Asinh(c/math.Hypot(x, y))
		}
	}
	n := g.Cols * g.Rows
	kxx, kyy, kxy = make([]float64, n), make([]float64, n), make([]float64, n)
	for q := range g.Rows {
		for p := range g.Cols {
			k00, k10, k01, k11 := q*nc+p, q*nc+p+1, (q+1)*nc+p, (q+1)*nc+p+1
			k := q*g.Cols + p
			kxx[k] = scale * (gxx[k11] - gxx[k01] - gxx[k10] + gxx[k00])
			kyy[k] = scale * (gyy[k11] - gyy[k01] - gyy[k10] + gyy[k00])
			kxy[k] = scale * (gxy[k11] - gxy[k01] - gxy[k10] + gxy[k00])
		}
	}
	return kxx, kyy, kxy
}

// Change writes the stress change at every cell centre to dst for the
// pore-pressure change dp per cell, Pa (negative for depletion), both in
// grid order (row·Cols + col), summed as how says. It returns an error for
// a non-finite dp. dst and dp must have the grid's cell count.
func (r *GridResponse) Change(dst []StressChange, dp []float64, how Summation) error {
	n := r.grid.Cells()
	if len(dst) != n || len(dp) != n {
		panic("mechanics: GridResponse.Change: slice length is not the grid's cell count")
	}
	r.src = r.src[:0]
	for k, v := range dp {
		if math.IsNaN(v) || math.IsInf(v, 0) {
			return &InputError{Name: fmt.Sprintf("depletion[%d] (col %d, row %d)", k, k%r.grid.Cols, k/r.grid.Cols),
				Value: v, Want: "must be a finite number"}
		}
		if v != 0 {
			r.src = append(r.src, source{col: k % r.grid.Cols, row: k / r.grid.Cols, dp: v})
		}
	}
	if how == AutoSummation {
		how = r.choose(len(r.src))
	}
	switch how {
	case DirectSummation:
		r.direct(dst)
	case FFTSummation:
		if r.fft == nil {
			r.fft = newGridFFT(r)
		}
		r.fft.convolve(dst, dp)
	default:
		panic(fmt.Sprintf("mechanics: GridResponse.Change: unknown summation %d", how))
	}
	for k := range dst {
		local := r.path * dp[k]
		c := &dst[k]
		c.ZZ = -(c.XX + c.YY) // 2A·Δp − ΔSxx − ΔSyy with the local terms below
		c.XX += local
		c.YY += local
		c.Pore = dp[k]
	}
	return nil
}

// Costs of the summations, measured with BenchmarkGridResponse* and
// BenchmarkNewGridResponse200* on the development machine: the direct sum
// takes about 8 ns per pair of cells, the FFT summation about 10 ns per
// padded cell and unit of log2 of the padded size, and building the kernel
// spectra (once per response) about 2.3 times one FFT summation.
const (
	fftWorkFactor     = 1.25 // FFT time per padded cell and log2 over the direct time per pair
	spectraWorkFactor = 2.3  // first FFT summation: the spectra and the summation itself
)

// choose returns the cheaper summation for a field with m depleted cells.
func (r *GridResponse) choose(m int) Summation {
	px, py := fftSize(2*r.grid.Cols-1), fftSize(2*r.grid.Rows-1)
	cells := float64(px * py)
	fft := fftWorkFactor * cells * math.Log2(cells)
	if r.fft == nil {
		fft *= 1 + spectraWorkFactor
	}
	if float64(r.grid.Cells())*float64(m) <= fft {
		return DirectSummation
	}
	return FFTSummation
}

// direct writes the kernel sums over the depleted cells (without the local
// term) to the XX, YY and XY fields of dst.
func (r *GridResponse) direct(dst []StressChange) {
	cols := r.grid.Cols
	for row := range r.grid.Rows {
		for col := range cols {
			var sxx, syy, sxy float64
			for _, s := range r.src {
				p, q := s.col-col, s.row-row
				k := abs(q)*cols + abs(p)
				sxx += s.dp * r.kxx[k]
				syy += s.dp * r.kyy[k]
				if (p < 0) != (q < 0) {
					sxy -= s.dp * r.kxy[k]
				} else {
					sxy += s.dp * r.kxy[k]
				}
			}
			dst[row*cols+col] = StressChange{XX: sxx, YY: syy, XY: sxy}
		}
	}
}

// abs returns |i|.
func abs(i int) int {
	if i < 0 {
		return -i
	}
	return i
}

// fftSize returns the least n ≥ m whose only prime factors are 2, 3 and 5,
// a length the FFT handles fast.
func fftSize(m int) int {
	for n := max(m, 1); ; n++ {
		k := n
		for _, f := range [...]int{2, 3, 5} {
			for k%f == 0 {
				k /= f
			}
		}
		if k == 1 {
			return n
		}
	}
}

// gridFFT convolves fields with the kernels of a GridResponse: real FFTs
// along rows, complex FFTs along the columns of the half spectrum.
type gridFFT struct {
	cols, rows int // grid
	px, py, nh int // padded size and half-spectrum width px/2 + 1
	rowFFT     *fourier.FFT
	colFFT     *fourier.CmplxFFT
	kernel     [3][]complex128 // spectra of kxx, kyy, kxy, py × nh
	data, prod []complex128    // spectrum of the field and a product, py × nh
	line       []float64       // one padded row
	col        []complex128    // one column
}

// newGridFFT returns the FFT convolver of r with the kernel spectra.
func newGridFFT(r *GridResponse) *gridFFT {
	g := r.grid
	px, py := fftSize(2*g.Cols-1), fftSize(2*g.Rows-1)
	nh := px/2 + 1
	f := &gridFFT{cols: g.Cols, rows: g.Rows, px: px, py: py, nh: nh,
		rowFFT: fourier.NewFFT(px), colFFT: fourier.NewCmplxFFT(py),
		data: make([]complex128, py*nh), prod: make([]complex128, py*nh),
		line: make([]float64, px), col: make([]complex128, py)}
	// A kernel at offset (p, q) goes to (p mod px, q mod py).
	wrap := func(i, n, size int) (offset int, ok bool) {
		switch {
		case i < n:
			return i, true
		case i > size-n:
			return i - size, true
		}
		return 0, false
	}
	for c, table := range [3][]float64{r.kxx, r.kyy, r.kxy} {
		odd := c == 2
		f.kernel[c] = make([]complex128, py*nh)
		f.forward(f.kernel[c], func(j int, line []float64) bool {
			q, ok := wrap(j, g.Rows, py)
			if !ok {
				return false
			}
			for i := range line {
				p, ok := wrap(i, g.Cols, px)
				if !ok {
					line[i] = 0
					continue
				}
				v := table[abs(q)*g.Cols+abs(p)]
				if odd && (p < 0) != (q < 0) {
					v = -v
				}
				line[i] = v
			}
			return true
		})
	}
	return f
}

// forward writes the 2-D spectrum of the padded real array whose row j
// fill writes into line (returning false for a row of zeros) to dst.
func (f *gridFFT) forward(dst []complex128, fill func(j int, line []float64) bool) {
	for j := range f.py {
		row := dst[j*f.nh : (j+1)*f.nh]
		if !fill(j, f.line) {
			clear(row)
			continue
		}
		f.rowFFT.Coefficients(row, f.line)
	}
	f.columns(dst, f.colFFT.Coefficients)
}

// columns applies the column transform tr to every column of a, in place.
func (f *gridFFT) columns(a []complex128, tr func(dst, seq []complex128) []complex128) {
	for k := range f.nh {
		for j := range f.py {
			f.col[j] = a[j*f.nh+k]
		}
		tr(f.col, f.col)
		for j := range f.py {
			a[j*f.nh+k] = f.col[j]
		}
	}
}

// convolve writes the kernel sums of the field dp (without the local term)
// to the XX, YY and XY fields of dst.
func (f *gridFFT) convolve(dst []StressChange, dp []float64) {
	f.forward(f.data, func(j int, line []float64) bool {
		if j >= f.rows {
			return false
		}
		copy(line, dp[j*f.cols:(j+1)*f.cols])
		clear(line[f.cols:])
		return true
	})
	norm := 1 / float64(f.px*f.py) // the inverse transforms are unnormalised
	for c := range f.kernel {
		for k, v := range f.data {
			f.prod[k] = v * f.kernel[c][k]
		}
		f.columns(f.prod, f.colFFT.Sequence)
		for j := range f.rows {
			f.rowFFT.Sequence(f.line, f.prod[j*f.nh:(j+1)*f.nh])
			out := dst[j*f.cols : (j+1)*f.cols]
			for i := range out {
				v := f.line[i] * norm
				switch c {
				case 0:
					out[i] = StressChange{XX: v}
				case 1:
					out[i].YY = v
				default:
					out[i].XY = v
				}
			}
		}
	}
}
