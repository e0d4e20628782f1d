package flow

import (
	"bytes"
	"errors"
	"fmt"
	"io"
	"math"
	"math/rand/v2"
	"os"
	"path/filepath"
	"slices"
	"strings"
	"testing"

	"slipfront/internal/numtest"
)

// sameBits reports whether two slices hold bit-identical values. Writing
// with strconv's shortest representation ('g', −1) and reading with
// ParseFloat returns exactly the same float64 (the strconv contract), so
// a round trip is checked for identity, not within a tolerance.
func sameBits(a, b []float64) bool {
	return slices.EqualFunc(a, b, func(x, y float64) bool { return math.Float64bits(x) == math.Float64bits(y) })
}

func sameMatrix(a, b *CSR) bool {
	return a.N == b.N && slices.Equal(a.RowPtr, b.RowPtr) && slices.Equal(a.ColIdx, b.ColIdx) && sameBits(a.Val, b.Val)
}

// sameValues is sameMatrix with values compared numerically (−0 == +0).
func sameValues(a, b *CSR) bool {
	return a.N == b.N && slices.Equal(a.RowPtr, b.RowPtr) && slices.Equal(a.ColIdx, b.ColIdx) && slices.Equal(a.Val, b.Val)
}

func readFile(t *testing.T, name string) *CSR {
	t.Helper()
	f, err := os.Open(filepath.Join("testdata", name))
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	a, err := ReadMatrixMarket(f)
	if err != nil {
		t.Fatal(err)
	}
	return a
}

func TestReadMatrixMarketFiles(t *testing.T) {
	// Expected entries are those written in the files (by hand).
	tests := []struct {
		file string
		n    int
		want map[[2]int]float64
	}{
		{"general.mtx", 4, map[[2]int]float64{
			{0, 0}: 2, {0, 1}: -1, {1, 0}: -1, {1, 1}: 3, {1, 2}: -1, {2, 1}: -1,
			{2, 2}: 2.25, {2, 3}: -0.25, {3, 2}: -0.25, {3, 3}: 1}},
		{"symmetric.mtx", 3, map[[2]int]float64{
			{0, 0}: 4, {1, 0}: -1, {0, 1}: -1, {1, 1}: 4, {2, 1}: -1, {1, 2}: -1, {2, 2}: 4}},
		{"integer.mtx", 2, map[[2]int]float64{{0, 0}: 5, {1, 0}: -1, {1, 1}: 7}},
	}
	for _, tt := range tests {
		a := readFile(t, tt.file)
		if a.N != tt.n || a.NNZ() != len(tt.want) {
			t.Errorf("%s: order %d with %d entries, want %d with %d", tt.file, a.N, a.NNZ(), tt.n, len(tt.want))
			continue
		}
		if err := a.Validate(); err != nil {
			t.Errorf("%s: %v", tt.file, err)
		}
		for ij, v := range tt.want {
			// Decimal fractions of powers of two are exact: tolerance 0.
			numtest.Abs(t, tt.file+" entry", a.At(ij[0], ij[1]), v, 0)
		}
	}
	f, err := os.Open(filepath.Join("testdata", "vector.mtx"))
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	v, err := ReadMatrixMarketVector(f)
	if err != nil {
		t.Fatal(err)
	}
	if !sameBits(v, []float64{1, -2.5, 3e-3}) {
		t.Errorf("vector.mtx: %v, want [1 -2.5 0.003]", v)
	}
}

func TestMatrixMarketRoundTrip(t *testing.T) {
	sys := newNetwork(defaultNetwork(2000), rand.New(rand.NewPCG(1, 2)))
	a := sys.assembler().Matrix()
	for _, sym := range []MatrixMarketSymmetry{MatrixMarketGeneral, MatrixMarketSymmetric} {
		var buf bytes.Buffer
		if err := WriteMatrixMarket(&buf, a, sym, "network test matrix", "second line\nthird line"); err != nil {
			t.Fatal(err)
		}
		if got := strings.Count(buf.String(), "\n% "); got != 3 {
			t.Errorf("symmetry %d: %d comment lines, want 3", sym, got)
		}
		b, err := ReadMatrixMarket(&buf)
		if err != nil {
			t.Fatal(err)
		}
		if !sameMatrix(a, b) {
			t.Errorf("symmetry %d: matrix changed in a write/read round trip", sym)
		}
	}
	var buf bytes.Buffer
	if err := WriteMatrixMarketVector(&buf, sys.rhs, "rhs"); err != nil {
		t.Fatal(err)
	}
	v, err := ReadMatrixMarketVector(&buf)
	if err != nil {
		t.Fatal(err)
	}
	if !sameBits(v, sys.rhs) {
		t.Error("vector changed in a write/read round trip")
	}
}

func TestWriteMatrixMarketRejectsAsymmetric(t *testing.T) {
	a := readFile(t, "integer.mtx") // (2,1) stored without (1,2)
	err := WriteMatrixMarket(io.Discard, a, MatrixMarketSymmetric)
	if err == nil || !strings.Contains(err.Error(), "(1, 0) is stored but (0, 1) is not") {
		t.Errorf("error %v, want an asymmetry error", err)
	}
	b := readFile(t, "general.mtx")
	b.Val[1] = 5 // A[0][1] = 5 but A[1][0] = −1
	err = WriteMatrixMarket(io.Discard, b, MatrixMarketSymmetric)
	if err == nil || !strings.Contains(err.Error(), "A[0][1] = 5 but A[1][0] = -1") {
		t.Errorf("error %v, want a value mismatch error", err)
	}
}

func TestReadMatrixMarketErrors(t *testing.T) {
	const banner = "%%MatrixMarket matrix coordinate real general\n"
	tests := []struct {
		name  string
		input string
		line  int
		msg   string
		cut   bool
	}{
		{"empty", "", 1, "empty input", true},
		{"bad banner", "%%MatrixMarkt matrix coordinate real general\n", 1, "banner", false},
		{"pattern field", "%%MatrixMarket matrix coordinate pattern general\n", 1, `field "pattern"`, false},
		{"complex field", "%%MatrixMarket matrix coordinate complex general\n", 1, `field "complex"`, false},
		{"hermitian", "%%MatrixMarket matrix coordinate real hermitian\n", 1, `symmetry "hermitian"`, false},
		{"array for a sparse matrix", "%%MatrixMarket matrix array real general\n2 2\n", 1, "must be \"coordinate\"", false},
		{"vector object", "%%MatrixMarket vector coordinate real general\n", 1, `object "vector"`, false},
		{"no size line", banner + "% only a comment\n", 2, "missing size line", true},
		{"short size line", banner + "3 3\n", 2, "size line has 2 fields", false},
		{"negative size", banner + "-3 -3 1\n", 2, `size "-3"`, false},
		{"not square", banner + "3 4 0\n", 2, "3 × 4", false},
		{"row out of range", banner + "2 2 1\n3 1 1.0\n", 3, `row index "3"`, false},
		{"column zero", banner + "2 2 1\n1 0 1.0\n", 3, `column index "0"`, false},
		{"bad value", banner + "2 2 1\n1 1 abc\n", 3, `value "abc"`, false},
		{"infinite value", banner + "2 2 1\n1 1 Inf\n", 3, `value "Inf"`, false},
		{"NaN value", banner + "2 2 1\n1 1 nan\n", 3, `value "nan"`, false},
		{"two fields", banner + "2 2 1\n1 1\n", 3, "entry has 2 fields", false},
		{"cut file", banner + "2 2 3\n1 1 1\n2 2 1\n", 4, "file ends after 2 of 3 entries", true},
		{"extra entry", banner + "2 2 1\n1 1 1\n2 2 1\n", 4, "more entries than the 1 declared", false},
		{"upper entry in symmetric file", "%%MatrixMarket matrix coordinate real symmetric\n2 2 1\n1 2 1\n", 3, "above the diagonal", false},
		{"overflowing duplicates", banner + "1 1 2\n1 1 1e308\n1 1 1e308\n", 4, "sum to infinity", false},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			_, err := ReadMatrixMarket(strings.NewReader(tt.input))
			var fe *FormatError
			if !errors.As(err, &fe) {
				t.Fatalf("error %v, want a *FormatError", err)
			}
			if !errors.Is(err, ErrFormat) {
				t.Error("error does not match ErrFormat")
			}
			if fe.Line != tt.line || !strings.Contains(fe.Msg, tt.msg) {
				t.Errorf("error %q at line %d, want %q at line %d", fe.Msg, fe.Line, tt.msg, tt.line)
			}
			if want := fmt.Sprintf("flow: Matrix Market line %d: ", tt.line); !strings.HasPrefix(err.Error(), want) {
				t.Errorf("message %q does not start with %q", err.Error(), want)
			}
			if got := errors.Is(err, io.ErrUnexpectedEOF); got != tt.cut {
				t.Errorf("errors.Is(err, io.ErrUnexpectedEOF) = %v, want %v", got, tt.cut)
			}
		})
	}
}

func TestReadMatrixMarketVectorErrors(t *testing.T) {
	const banner = "%%MatrixMarket matrix array real general\n"
	tests := []struct {
		name, input, msg string
		line             int
	}{
		{"coordinate", "%%MatrixMarket matrix coordinate real general\n1 1 0\n", "must be \"array\"", 1},
		{"two columns", banner + "2 2\n1\n2\n3\n4\n", "want one column", 2},
		{"cut", banner + "3 1\n1\n2\n", "file ends after 2 of 3 values", 4},
		{"two values on a line", banner + "2 1\n1 2\n", "2 fields", 3},
		{"extra value", banner + "1 1\n1\n2\n", "more values than the 1 declared", 4},
	}
	for _, tt := range tests {
		_, err := ReadMatrixMarketVector(strings.NewReader(tt.input))
		var fe *FormatError
		if !errors.As(err, &fe) || fe.Line != tt.line || !strings.Contains(fe.Msg, tt.msg) {
			t.Errorf("%s: error %v, want %q at line %d", tt.name, err, tt.msg, tt.line)
		}
	}
}

func TestReadMatrixMarketLongLines(t *testing.T) {
	// A comment longer than the reader's buffer is skipped; a line over
	// the cap is an error.
	long := "%" + strings.Repeat("x", 200_000) + "\n"
	in := "%%MatrixMarket matrix coordinate real general\n" + long + "1 1 1\n1 1 2.5\n"
	a, err := ReadMatrixMarket(strings.NewReader(in))
	if err != nil {
		t.Fatal(err)
	}
	numtest.Abs(t, "A[0][0]", a.At(0, 0), 2.5, 0)
	tooLong := "%%MatrixMarket matrix coordinate real general\n%" + strings.Repeat("x", mmMaxLine) + "\n1 1 0\n"
	_, err = ReadMatrixMarket(strings.NewReader(tooLong))
	var fe *FormatError
	if !errors.As(err, &fe) || fe.Line != 2 {
		t.Errorf("error %v, want a line-length error at line 2", err)
	}
}

// fuzzMaxDim keeps the fuzzer's matrices small: a size line may declare
// any order, and an order allocates its row pointers.
const fuzzMaxDim = 1 << 12

func addSeeds(f *testing.F) {
	files, err := filepath.Glob(filepath.Join("testdata", "*.mtx"))
	if err != nil || len(files) == 0 {
		f.Fatalf("no seed files in testdata: %v", err)
	}
	for _, name := range files {
		data, err := os.ReadFile(name)
		if err != nil {
			f.Fatal(err)
		}
		f.Add(data)
	}
}

func FuzzReadMatrixMarket(f *testing.F) {
	addSeeds(f)
	f.Fuzz(func(t *testing.T, data []byte) {
		a, err := readMatrixMarket(bytes.NewReader(data), fuzzMaxDim)
		if err != nil {
			if !errors.Is(err, ErrFormat) {
				t.Fatalf("error %v does not match ErrFormat", err)
			}
			return
		}
		if err := a.Validate(); err != nil {
			t.Fatalf("reader built an invalid matrix: %v", err)
		}
		var buf bytes.Buffer
		if err := WriteMatrixMarket(&buf, a, MatrixMarketGeneral); err != nil {
			t.Fatal(err)
		}
		b, err := readMatrixMarket(&buf, fuzzMaxDim)
		if err != nil {
			t.Fatalf("re-reading the written matrix: %v", err)
		}
		if !sameMatrix(a, b) {
			t.Fatal("matrix changed in a write/read round trip")
		}
		if checkSymmetricValues(a) == nil {
			buf.Reset()
			if err := WriteMatrixMarket(&buf, a, MatrixMarketSymmetric); err != nil {
				t.Fatal(err)
			}
			// The symmetric format stores one of each mirrored pair, so a
			// −0 mirrored by +0 comes back as one of them: compare values,
			// not bits.
			if b, err = readMatrixMarket(&buf, fuzzMaxDim); err != nil || !sameValues(a, b) {
				t.Fatalf("symmetric round trip: %v", err)
			}
		}
	})
}

func FuzzReadMatrixMarketVector(f *testing.F) {
	addSeeds(f)
	f.Fuzz(func(t *testing.T, data []byte) {
		v, err := ReadMatrixMarketVector(bytes.NewReader(data))
		if err != nil {
			if !errors.Is(err, ErrFormat) {
				t.Fatalf("error %v does not match ErrFormat", err)
			}
			return
		}
		var buf bytes.Buffer
		if err := WriteMatrixMarketVector(&buf, v); err != nil {
			t.Fatal(err)
		}
		w, err := ReadMatrixMarketVector(&buf)
		if err != nil || !sameBits(v, w) {
			t.Fatalf("vector round trip: %v", err)
		}
	})
}

func ExampleWriteMatrixMarket() {
	as, err := NewAssembler(2, [][2]int{{0, 1}})
	if err != nil {
		panic(err)
	}
	as.AddDiagonal(0, 0.5)
	as.AddDiagonal(1, 0.25)
	as.AddConnection(0, 2)
	if err := WriteMatrixMarket(os.Stdout, as.Matrix(), MatrixMarketSymmetric, "two unknowns"); err != nil {
		panic(err)
	}
	// Output:
	// %%MatrixMarket matrix coordinate real symmetric
	// % two unknowns
	// 2 2 3
	// 1 1 2.5
	// 2 1 -2
	// 2 2 2.25
}

func ExampleReadMatrixMarket() {
	const file = `%%MatrixMarket matrix coordinate real symmetric
% lower triangle of a 3 × 3 system
3 3 5
1 1 4
2 1 -1
2 2 4
3 2 -1
3 3 4
`
	a, err := ReadMatrixMarket(strings.NewReader(file))
	if err != nil {
		panic(err)
	}
	fmt.Println(a.N, a.NNZ(), a.At(0, 1), a.At(1, 0))
	// Output:
	// 3 7 -1 -1
}

func TestReadMatrixMarketLongRowWithDuplicates(t *testing.T) {
	// Row 1 holds every column twice, with values c and 0.5, all lines
	// shuffled: the reader must sort the long row and sum each pair to
	// c + 0.5 (exact in floating point for these values).
	const n = 100
	rng := rand.New(rand.NewPCG(1, 2))
	var lines []string
	for c := range n {
		lines = append(lines, fmt.Sprintf("1 %d %d", c+1, c), fmt.Sprintf("1 %d 0.5", c+1))
	}
	rng.Shuffle(len(lines), func(i, j int) { lines[i], lines[j] = lines[j], lines[i] })
	in := fmt.Sprintf("%%%%MatrixMarket matrix coordinate real general\n%d %d %d\n%s\n", n, n, len(lines), strings.Join(lines, "\n"))
	a, err := ReadMatrixMarket(strings.NewReader(in))
	if err != nil {
		t.Fatal(err)
	}
	if a.NNZ() != n {
		t.Fatalf("%d entries, want %d", a.NNZ(), n)
	}
	for c := range n {
		numtest.Abs(t, "A[0][c]", a.At(0, c), float64(c)+0.5, 0)
	}
}
