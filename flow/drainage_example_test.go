package flow_test

import (
	"fmt"

	"slipfront/flow"
)

// Two years of production from a fracture 210 m long, held 10 MPa below
// the initial pressure in a 1 μD layer (k/μ = 1e−18 m² / 1e−3 Pa·s,
// φ c_t = 0.05 × 1e−9 1/Pa): the pressure change north of the fracture's
// middle and east of its tip, and the volume produced per metre of layer
// height.
func ExampleDrainage() {
	const cols, rows = 61, 41
	d := flow.Drainage{Cols: cols, Rows: rows, DX: 10, DY: 10, Storage: 0.05 * 1e-9, Mobility: make([]float64, cols*rows)}
	for i := range d.Mobility {
		d.Mobility[i] = 1e-18 / 1e-3
	}
	// The fracture: row 20, columns 20 to 40 (its middle at 30, its east
	// tip at 40).
	const row, middle, tip = 20, 30, 40
	for col := 20; col <= tip; col++ {
		d.Held = append(d.Held, row*cols+col)
	}
	dp, produced, err := d.Deplete(10e6, 2*365.25*86400, 24)
	if err != nil {
		fmt.Println(err)
		return
	}
	for _, k := range []int{1, 2, 4, 8} {
		fmt.Printf("%d m north: %.3f MPa, %d m east of the tip: %.3f MPa\n",
			10*k, dp[(row+k)*cols+middle]/1e6, 10*k, dp[row*cols+tip+k]/1e6)
	}
	fmt.Printf("produced: %.3f m³ per m of height\n", produced)
	// Output:
	// 10 m north: -8.387 MPa, 10 m east of the tip: -6.134 MPa
	// 20 m north: -6.843 MPa, 20 m east of the tip: -4.088 MPa
	// 40 m north: -4.179 MPa, 40 m east of the tip: -1.912 MPa
	// 80 m north: -1.101 MPa, 80 m east of the tip: -0.362 MPa
	// produced: 8.537 m³ per m of height
}
