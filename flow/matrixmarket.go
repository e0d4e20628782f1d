package flow

import (
	"bufio"
	"bytes"
	"errors"
	"fmt"
	"io"
	"math"
	"slices"
	"strconv"
)

// Matrix Market exchange format (Boisvert, Pozo & Remington 1996), as
// far as the flow systems need it:
//
//	%%MatrixMarket matrix coordinate real general      ← banner (case-insensitive)
//	% any number of comment lines                       ← '%' in column 1
//	M N NNZ                                             ← size line
//	i j a(i,j)                                          ← NNZ entry lines, 1-based
//
// "symmetric" instead of "general" lists the lower triangle only (i ≥ j);
// the reader mirrors it so the CSR holds both triangles. A vector is
// written as "array real general" with size line "M 1" and M values, one
// per line, in order. Fields "real" and "integer" are read; "pattern",
// "complex", and the skew-symmetric and Hermitian kinds are not. Blank
// lines are skipped. Duplicate coordinate entries are summed.

// ErrFormat is matched (with errors.Is) by every error that reports
// malformed Matrix Market input.
var ErrFormat = errors.New("flow: malformed Matrix Market input")

// FormatError reports malformed Matrix Market input and the line where it
// was found. A file cut short also matches io.ErrUnexpectedEOF.
type FormatError struct {
	Line int    // 1-based line number.
	Msg  string // What is wrong.
	Err  error  // Underlying cause, if any (io.ErrUnexpectedEOF for a cut file).
}

func (e *FormatError) Error() string {
	return fmt.Sprintf("flow: Matrix Market line %d: %s", e.Line, e.Msg)
}

// Is reports whether target is ErrFormat.
func (e *FormatError) Is(target error) bool { return target == ErrFormat }

// Unwrap returns the underlying cause.
func (e *FormatError) Unwrap() error { return e.Err }

// MatrixMarketSymmetry selects how WriteMatrixMarket stores a matrix.
type MatrixMarketSymmetry int

const (
	// MatrixMarketGeneral writes every stored entry.
	MatrixMarketGeneral MatrixMarketSymmetry = iota
	// MatrixMarketSymmetric writes the lower triangle of a symmetric
	// matrix.
	MatrixMarketSymmetric
)

const (
	mmBanner = "%%MatrixMarket"
	// mmMaxDim caps the declared order so that a corrupt size line cannot
	// make the reader allocate without bound; indices of the sparse
	// factorization are int32.
	mmMaxDim = math.MaxInt32 - 1
	// mmMaxLine caps the length of one line, bytes.
	mmMaxLine = 1 << 20
	// mmPrealloc caps the entries reserved from a declared count before
	// they are actually read.
	mmPrealloc = 1 << 20
)

// mmHeader is the parsed banner.
type mmHeader struct {
	format, field, symmetry string
}

// mmScanner reads a Matrix Market file line by line.
type mmScanner struct {
	r    *bufio.Reader
	line int
	buf  []byte
	tok  [][]byte
}

func newMMScanner(r io.Reader) *mmScanner {
	return &mmScanner{r: bufio.NewReaderSize(r, 1<<16)}
}

func (s *mmScanner) errorf(cause error, format string, args ...any) error {
	return &FormatError{Line: s.line, Msg: fmt.Sprintf(format, args...), Err: cause}
}

// next returns the next line without its line ending, or io.EOF.
func (s *mmScanner) next() ([]byte, error) {
	s.buf = s.buf[:0]
	for {
		chunk, err := s.r.ReadSlice('\n')
		if len(s.buf)+len(chunk) > mmMaxLine {
			s.line++
			return nil, s.errorf(nil, "line longer than %d bytes", mmMaxLine)
		}
		switch {
		case err == nil:
			s.line++
			if len(s.buf) == 0 {
				return bytes.TrimRight(chunk, "\r\n"), nil
			}
			s.buf = append(s.buf, chunk...)
			return bytes.TrimRight(s.buf, "\r\n"), nil
		case errors.Is(err, bufio.ErrBufferFull):
			s.buf = append(s.buf, chunk...)
		case errors.Is(err, io.EOF):
			s.buf = append(s.buf, chunk...)
			if len(s.buf) == 0 {
				return nil, io.EOF
			}
			s.line++
			return bytes.TrimRight(s.buf, "\r\n"), nil
		default:
			return nil, err
		}
	}
}

// nextData returns the fields of the next line that is neither a comment
// nor blank; io.EOF at the end.
func (s *mmScanner) nextData() ([][]byte, error) {
	for {
		ln, err := s.next()
		if err != nil {
			return nil, err
		}
		if len(ln) > 0 && ln[0] == '%' {
			continue
		}
		s.tok = splitFields(s.tok[:0], ln)
		if len(s.tok) > 0 {
			return s.tok, nil
		}
	}
}

// splitFields splits at spaces and tabs without allocating beyond dst.
func splitFields(dst [][]byte, ln []byte) [][]byte {
	i := 0
	for i < len(ln) {
		for i < len(ln) && (ln[i] == ' ' || ln[i] == '\t') {
			i++
		}
		j := i
		for j < len(ln) && ln[j] != ' ' && ln[j] != '\t' {
			j++
		}
		if j > i {
			dst = append(dst, ln[i:j])
		}
		i = j
	}
	return dst
}

// header reads and checks the banner line.
func (s *mmScanner) header() (mmHeader, error) {
	ln, err := s.next()
	if errors.Is(err, io.EOF) {
		return mmHeader{}, &FormatError{Line: 1, Msg: "empty input, want a %%MatrixMarket banner", Err: io.ErrUnexpectedEOF}
	}
	if err != nil {
		return mmHeader{}, err
	}
	f := splitFields(nil, ln)
	if len(f) != 5 || !bytes.EqualFold(f[0], []byte(mmBanner)) {
		return mmHeader{}, s.errorf(nil, "banner %q: want \"%%%%MatrixMarket matrix <format> <field> <symmetry>\"", clip(ln))
	}
	h := mmHeader{
		format:   string(bytes.ToLower(f[2])),
		field:    string(bytes.ToLower(f[3])),
		symmetry: string(bytes.ToLower(f[4])),
	}
	if obj := string(bytes.ToLower(f[1])); obj != "matrix" {
		return h, s.errorf(nil, "object %q is not supported: want \"matrix\"", clip(f[1]))
	}
	if h.format != "coordinate" && h.format != "array" {
		return h, s.errorf(nil, "format %q: want \"coordinate\" or \"array\"", clip(f[2]))
	}
	if h.field != "real" && h.field != "integer" {
		return h, s.errorf(nil, "field %q is not supported: want \"real\" or \"integer\"", clip(f[3]))
	}
	if h.symmetry != "general" && h.symmetry != "symmetric" {
		return h, s.errorf(nil, "symmetry %q is not supported: want \"general\" or \"symmetric\"", clip(f[4]))
	}
	return h, nil
}

// clip shortens a byte string for an error message.
func clip(b []byte) string {
	if len(b) > 40 {
		return string(b[:40]) + "…"
	}
	return string(b)
}

// sizeLine reads the size line: want integers (2 for array, 3 for
// coordinate).
func (s *mmScanner) sizeLine(want int) ([]int, error) {
	f, err := s.nextData()
	if errors.Is(err, io.EOF) {
		return nil, s.errorf(io.ErrUnexpectedEOF, "missing size line")
	}
	if err != nil {
		return nil, err
	}
	if len(f) != want {
		return nil, s.errorf(nil, "size line has %d fields, want %d", len(f), want)
	}
	v := make([]int, want)
	for k, t := range f {
		x, err := strconv.Atoi(string(t))
		if err != nil || x < 0 || x > mmMaxDim {
			return nil, s.errorf(nil, "size %q: want an integer in [0, %d]", clip(t), mmMaxDim)
		}
		v[k] = x
	}
	return v, nil
}

// parseValue parses a finite real.
func (s *mmScanner) parseValue(t []byte) (float64, error) {
	v, err := strconv.ParseFloat(string(t), 64)
	if err != nil || math.IsInf(v, 0) || math.IsNaN(v) {
		return 0, s.errorf(nil, "value %q: want a finite real number", clip(t))
	}
	return v, nil
}

// parseIndex parses a 1-based index in [1, n] and returns it 0-based.
func (s *mmScanner) parseIndex(t []byte, n int, what string) (int, error) {
	x, err := strconv.Atoi(string(t))
	if err != nil || x < 1 || x > n {
		return 0, s.errorf(nil, "%s index %q: want an integer in [1, %d]", what, clip(t), n)
	}
	return x - 1, nil
}

// ReadMatrixMarket reads a square sparse matrix in coordinate format,
// general or symmetric (mirrored into both triangles). Duplicate entries
// are summed; entries with value zero stay in the pattern.
func ReadMatrixMarket(r io.Reader) (*CSR, error) {
	return readMatrixMarket(r, mmMaxDim)
}

// readMatrixMarket is ReadMatrixMarket with a cap on the order.
func readMatrixMarket(r io.Reader, maxDim int) (*CSR, error) {
	s := newMMScanner(r)
	h, err := s.header()
	if err != nil {
		return nil, err
	}
	if h.format != "coordinate" {
		return nil, s.errorf(nil, "format %q: a sparse matrix must be \"coordinate\"", h.format)
	}
	size, err := s.sizeLine(3)
	if err != nil {
		return nil, err
	}
	m, n, nnz := size[0], size[1], size[2]
	if m != n {
		return nil, s.errorf(nil, "matrix is %d × %d: want a square matrix", m, n)
	}
	if n > maxDim {
		return nil, s.errorf(nil, "order %d exceeds the limit %d", n, maxDim)
	}
	sym := h.symmetry == "symmetric"
	t := newTriplets(min(nnz, mmPrealloc))
	for range nnz {
		f, err := s.nextData()
		if errors.Is(err, io.EOF) {
			return nil, s.errorf(io.ErrUnexpectedEOF, "file ends after %d of %d entries", len(t.v), nnz)
		}
		if err != nil {
			return nil, err
		}
		if len(f) != 3 {
			return nil, s.errorf(nil, "entry has %d fields, want 3 (row, column, value)", len(f))
		}
		i, err := s.parseIndex(f[0], n, "row")
		if err != nil {
			return nil, err
		}
		j, err := s.parseIndex(f[1], n, "column")
		if err != nil {
			return nil, err
		}
		v, err := s.parseValue(f[2])
		if err != nil {
			return nil, err
		}
		if sym && i < j {
			return nil, s.errorf(nil, "entry (%d, %d) above the diagonal in a symmetric file: list the lower triangle only", i+1, j+1)
		}
		t.add(i, j, v)
		if sym && i != j {
			t.add(j, i, v)
		}
	}
	if _, err := s.nextData(); !errors.Is(err, io.EOF) {
		if err != nil {
			return nil, err
		}
		return nil, s.errorf(nil, "more entries than the %d declared", nnz)
	}
	a, err := t.toCSR(n)
	if err != nil {
		return nil, &FormatError{Line: s.line, Msg: err.Error()}
	}
	return a, nil
}

// triplets collects coordinate entries.
type triplets struct {
	i, j []int32
	v    []float64
}

func newTriplets(capacity int) *triplets {
	return &triplets{i: make([]int32, 0, capacity), j: make([]int32, 0, capacity), v: make([]float64, 0, capacity)}
}

func (t *triplets) add(i, j int, v float64) {
	t.i = append(t.i, int32(i))
	t.j = append(t.j, int32(j))
	t.v = append(t.v, v)
}

// toCSR builds the CSR matrix of order n, summing duplicates. It fails if
// a sum overflows to infinity.
func (t *triplets) toCSR(n int) (*CSR, error) {
	rowPtr := make([]int, n+1)
	for _, i := range t.i {
		rowPtr[i+1]++
	}
	for r := range n {
		rowPtr[r+1] += rowPtr[r]
	}
	fill := make([]int, n)
	copy(fill, rowPtr[:n])
	col := make([]int, len(t.i))
	val := make([]float64, len(t.i))
	for k, i := range t.i {
		col[fill[i]] = int(t.j[k])
		val[fill[i]] = t.v[k]
		fill[i]++
	}
	out := 0
	for r := range n {
		lo, hi := rowPtr[r], rowPtr[r+1]
		sortPaired(col[lo:hi], val[lo:hi])
		rowPtr[r] = out
		for p := lo; p < hi; p++ {
			if out > rowPtr[r] && col[out-1] == col[p] {
				val[out-1] += val[p]
				if math.IsInf(val[out-1], 0) {
					return nil, fmt.Errorf("duplicate entries of (%d, %d) sum to infinity", r+1, col[p]+1)
				}
				continue
			}
			col[out], val[out] = col[p], val[p]
			out++
		}
	}
	rowPtr[n] = out
	return &CSR{N: n, RowPtr: rowPtr, ColIdx: col[:out:out], Val: val[:out:out]}, nil
}

// ReadMatrixMarketVector reads a dense column vector stored as "array
// real general" with one column.
func ReadMatrixMarketVector(r io.Reader) ([]float64, error) {
	s := newMMScanner(r)
	h, err := s.header()
	if err != nil {
		return nil, err
	}
	if h.format != "array" || h.symmetry != "general" {
		return nil, s.errorf(nil, "%s %s: a vector must be \"array\" \"general\"", h.format, h.symmetry)
	}
	size, err := s.sizeLine(2)
	if err != nil {
		return nil, err
	}
	m, n := size[0], size[1]
	if n != 1 {
		return nil, s.errorf(nil, "array is %d × %d: want one column", m, n)
	}
	v := make([]float64, 0, min(m, mmPrealloc))
	for range m {
		f, err := s.nextData()
		if errors.Is(err, io.EOF) {
			return nil, s.errorf(io.ErrUnexpectedEOF, "file ends after %d of %d values", len(v), m)
		}
		if err != nil {
			return nil, err
		}
		if len(f) != 1 {
			return nil, s.errorf(nil, "line has %d fields, want 1 value", len(f))
		}
		x, err := s.parseValue(f[0])
		if err != nil {
			return nil, err
		}
		v = append(v, x)
	}
	if _, err := s.nextData(); !errors.Is(err, io.EOF) {
		if err != nil {
			return nil, err
		}
		return nil, s.errorf(nil, "more values than the %d declared", m)
	}
	return v, nil
}

// WriteMatrixMarket writes a in coordinate real format. With
// MatrixMarketSymmetric the lower triangle is written, and a must be
// symmetric in pattern and values (it is an error otherwise). Each comment
// is written on its own "%" line. Values are written in the shortest form
// that reads back to the same float64.
func WriteMatrixMarket(w io.Writer, a *CSR, sym MatrixMarketSymmetry, comments ...string) error {
	if err := a.Validate(); err != nil {
		return err
	}
	kind, nnz := "general", a.NNZ()
	if sym == MatrixMarketSymmetric {
		if err := checkSymmetricValues(a); err != nil {
			return err
		}
		kind, nnz = "symmetric", 0
		for r := range a.N {
			for _, c := range a.ColIdx[a.RowPtr[r]:a.RowPtr[r+1]] {
				if c <= r {
					nnz++
				}
			}
		}
	}
	bw := bufio.NewWriterSize(w, 1<<16)
	fmt.Fprintf(bw, "%s matrix coordinate real %s\n", mmBanner, kind)
	writeComments(bw, comments)
	fmt.Fprintf(bw, "%d %d %d\n", a.N, a.N, nnz)
	var line []byte
	for r := range a.N {
		for p := a.RowPtr[r]; p < a.RowPtr[r+1]; p++ {
			c := a.ColIdx[p]
			if sym == MatrixMarketSymmetric && c > r {
				continue
			}
			line = strconv.AppendInt(line[:0], int64(r+1), 10)
			line = append(line, ' ')
			line = strconv.AppendInt(line, int64(c+1), 10)
			line = append(line, ' ')
			line = strconv.AppendFloat(line, a.Val[p], 'g', -1, 64)
			line = append(line, '\n')
			if _, err := bw.Write(line); err != nil {
				return err
			}
		}
	}
	return bw.Flush()
}

// WriteMatrixMarketVector writes v as an "array real general" column.
func WriteMatrixMarketVector(w io.Writer, v []float64, comments ...string) error {
	bw := bufio.NewWriterSize(w, 1<<16)
	fmt.Fprintf(bw, "%s matrix array real general\n", mmBanner)
	writeComments(bw, comments)
	fmt.Fprintf(bw, "%d 1\n", len(v))
	var line []byte
	for _, x := range v {
		line = strconv.AppendFloat(line[:0], x, 'g', -1, 64)
		line = append(line, '\n')
		if _, err := bw.Write(line); err != nil {
			return err
		}
	}
	return bw.Flush()
}

// writeComments writes each comment line (split at newlines) after '%'.
func writeComments(bw *bufio.Writer, comments []string) {
	for _, c := range comments {
		for ln := range bytes.Lines([]byte(c)) {
			bw.WriteString("% ")
			bw.Write(bytes.TrimRight(ln, "\r\n"))
			bw.WriteByte('\n')
		}
	}
}

// checkSymmetricValues returns an error naming the first off-diagonal
// entry whose mirror is missing or holds a different value.
func checkSymmetricValues(a *CSR) error {
	for r := range a.N {
		for p := a.RowPtr[r]; p < a.RowPtr[r+1]; p++ {
			c := a.ColIdx[p]
			if c == r {
				continue
			}
			lo, hi := a.RowPtr[c], a.RowPtr[c+1]
			q, ok := slices.BinarySearch(a.ColIdx[lo:hi], r)
			if !ok {
				return asymmetryError(r, c)
			}
			if mirror := a.Val[lo+q]; a.Val[p] != mirror {
				return fmt.Errorf("flow: A[%d][%d] = %g but A[%d][%d] = %g: cannot write as symmetric", r, c, a.Val[p], c, r, mirror)
			}
		}
	}
	return nil
}
