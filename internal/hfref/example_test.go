package hfref_test

import (
	"fmt"

	"slipfront/internal/hfref"
)

// A KGD fracture per unit height: which vertex applies, and its size after
// ten minutes.
func ExampleKGD() {
	k := hfref.KGD{PlaneModulus: 20e9, Viscosity: 1e-3, Toughness: 5e6, Rate: 1e-3}
	fmt.Printf("𝒦 = %.3f: %v\n", k.DimensionlessToughness(), k.Regime())
	s := k.ToughnessDominated(600)
	fmt.Printf("K-vertex: ℓ = %.1f m, w(0) = %.3f mm, p = %.3f MPa\n", s.HalfLength, s.InletWidth*1e3, s.NetPressure/1e6)
	// Output:
	// 𝒦 = 5.098: toughness-dominated
	// K-vertex: ℓ = 77.1 m, w(0) = 4.954 mm, p = 0.321 MPa
}

// A height-contained PKN fracture of 30 m after an hour.
func ExamplePKN() {
	f := hfref.PKN{PlaneModulus: 20e9, Viscosity: 0.1, Height: 30, Rate: 0.05}
	s := f.Nordgren(3600)
	fmt.Printf("ℓ = %.1f m, w(0) = %.2f mm, p = %.3f MPa\n", s.HalfLength, s.InletWidth*1e3, s.NetPressure/1e6)
	// Output:
	// ℓ = 530.5 m, w(0) = 9.56 mm, p = 3.187 MPa
}
