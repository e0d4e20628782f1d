package elastic_test

import (
	"fmt"

	"gonum.org/v1/gonum/spatial/r2"

	"slipfront/elastic"
)

// Two parallel vertical fractures 10 m apart, each meshed into four
// elements: opening the southern one compresses the northern one (its
// stress shadow) and the stress change at a point between them.
func Example() {
	var elems []elastic.Element
	for _, y := range []float64{0, 10} {
		for k := range 4 {
			x := -20 + 10*float64(k)
			elems = append(elems, elastic.Element{P0: r2.Vec{X: x, Y: y}, P1: r2.Vec{X: x + 10, Y: y}, Height: 30})
		}
	}
	rock := elastic.Material{ShearModulus: 20e9, PoissonRatio: 0.25}
	op, err := elastic.New(elems, rock, elastic.Settings{})
	if err != nil {
		fmt.Println(err)
		return
	}
	slip := make([]float64, op.Len())
	opening := []float64{1e-4, 1e-4, 1e-4, 1e-4, 0, 0, 0, 0} // southern fracture opened by 0.1 mm
	shear, normal := make([]float64, op.Len()), make([]float64, op.Len())
	op.MulVecTo(shear, normal, slip, opening)
	fmt.Printf("self-influence of element 0: ∂Δσn/∂w = %.4g Pa/m\n", op.At(0, 0).NormalOpening)
	fmt.Printf("southern fracture, element 1: Δσn = %+.3f MPa\n", normal[1]/1e6)
	fmt.Printf("northern fracture, element 5: Δσn = %+.3f MPa, Δτ = %+.3f MPa\n", normal[5]/1e6, shear[5]/1e6)

	f, err := elastic.NewField(elems, rock, []r2.Vec{{X: 0, Y: 5}}, elastic.Settings{})
	if err != nil {
		fmt.Println(err)
		return
	}
	s := make([]elastic.Stress, 1)
	f.StressTo(s, slip, opening)
	fmt.Printf("at (0, 5): ΔSxx = %+.3f MPa, ΔSyy = %+.3f MPa\n", s[0].XX/1e6, s[0].YY/1e6)
	// Output:
	// self-influence of element 0: ∂Δσn/∂w = 1.698e+09 Pa/m
	// southern fracture, element 1: Δσn = +0.056 MPa
	// northern fracture, element 5: Δσn = +0.052 MPa, Δτ = -0.001 MPa
	// at (0, 5): ΔSxx = +0.035 MPa, ΔSyy = +0.050 MPa
}

// The Coulomb stress change on a receiver plane striking N045°E from an
// east–west compression of 2 MPa with a north–south one of 1 MPa, for
// right-lateral slip and a friction of 0.4 (King, Stein & Lin 1994).
func ExampleStress_Coulomb() {
	s := elastic.Stress{XX: 2e6, YY: 1e6}
	t := r2.Unit(r2.Vec{X: 1, Y: 1})
	shear, normal := s.OnPlane(t)
	fmt.Printf("Δτ = %.2f MPa, Δσn = %.2f MPa, ΔCFS = %.2f MPa\n", shear/1e6, normal/1e6,
		s.Coulomb(t, 0.4, elastic.RightLateral)/1e6)
	// Output:
	// Δτ = 0.50 MPa, Δσn = 1.50 MPa, ΔCFS = -0.10 MPa
}

// The memory of an operator is known before it is assembled.
func ExampleEstimateMemory() {
	elems := make([]elastic.Element, 100)
	for k := range elems {
		elems[k] = elastic.Element{P0: r2.Vec{X: 5 * float64(k)}, P1: r2.Vec{X: 5 * float64(k+1)}, Height: 20}
	}
	bytes, err := elastic.EstimateMemory(elems, elastic.Material{ShearModulus: 20e9, PoissonRatio: 0.25}, elastic.Settings{})
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Printf("%d elements: %d kB (dense)\n", len(elems), bytes/1000)
	// Output:
	// 100 elements: 320 kB (dense)
}
