package flow_test

import (
	"fmt"

	"slipfront/flow"
)

// Five clusters of a stage share 0.2 m³/s; the middle one meets fractures
// already 1 MPa above the others and takes less.
func ExampleLimitedEntry_Split() {
	perfs := flow.Perforations{Count: 6, Diameter: 8.89e-3, Discharge: 0.8}
	l, err := flow.NewLimitedEntry([]flow.Perforations{perfs, perfs, perfs, perfs, perfs}, 1000)
	if err != nil {
		fmt.Println(err)
		return
	}
	entry := []float64{40e6, 40e6, 41e6, 40e6, 40e6}
	q := make([]float64, l.Len())
	pw := l.Split(q, entry, 0.2)
	fmt.Printf("p_w = %.3f MPa\n", pw/1e6)
	for k := range q {
		fmt.Printf("cluster %d: %.4f m³/s, Δp %.3f MPa\n", k, q[k], l.PressureDrop(k, q[k])/1e6)
	}
	// Output:
	// p_w = 49.217 MPa
	// cluster 0: 0.0405 m³/s, Δp 9.217 MPa
	// cluster 1: 0.0405 m³/s, Δp 9.217 MPa
	// cluster 2: 0.0382 m³/s, Δp 8.217 MPa
	// cluster 3: 0.0405 m³/s, Δp 9.217 MPa
	// cluster 4: 0.0405 m³/s, Δp 9.217 MPa
}

// A tight matrix beside the fractures: its diffusivity and the cells of
// one face for steps from 1 s to a day.
func ExampleMatrix_CellSizes() {
	m := flow.Matrix{Permeability: 1e-18, Porosity: 0.05, Compressibility: 2e-9, Viscosity: 1e-3,
		Cells: 8, ShortestTime: 1, LongestTime: 86400}
	fmt.Printf("D = %.0e m²/s\n", m.Diffusivity())
	for j, h := range m.CellSizes() {
		fmt.Printf("cell %d: %.4f m\n", j, h)
	}
	// Output:
	// D = 1e-05 m²/s
	// cell 0: 0.0016 m
	// cell 1: 0.0045 m
	// cell 2: 0.0128 m
	// cell 3: 0.0366 m
	// cell 4: 0.1043 m
	// cell 5: 0.2972 m
	// cell 6: 0.8470 m
	// cell 7: 2.4140 m
}
