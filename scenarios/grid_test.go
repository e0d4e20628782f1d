package scenarios

import (
	"strings"
	"testing"

	"slipfront/internal/numtest"
)

func TestMapGrid(t *testing.T) {
	s, err := parseText(t, strings.Replace(minimal, `volume = "100 m3"`, "volume = \"100 m3\"\n[numerics]\ncell_size = \"30 m\"", 1))
	if err != nil {
		t.Fatal(err)
	}
	g := s.MapGrid()
	// 1000 m / 30 m = 33.3 → 34 cells, the last one reaching past the edge.
	if g.Cols != 34 || g.Rows != 34 || g.Cells() != 34*34 {
		t.Fatalf("grid %+v", g)
	}
	x, y := g.Centre(34 + 2) // column 2, row 1
	numtest.Abs(t, "x", x, -500+2.5*30, 1e-12)
	numtest.Abs(t, "y", y, -500+1.5*30, 1e-12)
}
