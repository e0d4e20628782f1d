package mechanics_test

import (
	"fmt"
	"math"

	"slipfront/mechanics"
)

// inMPa returns v, Pa, in MPa rounded to 1 kPa, with −0 printed as 0.
func inMPa(v float64) float64 { return math.Round(v/1e3)/1e3 + 0 }

// The uniaxial-strain stress path of the zipper pad's rock (ν = 0.22) with
// α = 1: 10 MPa of depletion lowers both horizontal stresses by 7.18 MPa
// and leaves Sv.
func ExamplePoroelastic_Uniaxial() {
	p := mechanics.Poroelastic{Biot: 1, Poisson: 0.22}
	c := p.Uniaxial(-10e6)
	fmt.Printf("A = %.6f\n", p.StressPath())
	fmt.Printf("ΔSxx %.3f MPa, ΔSyy %.3f MPa, ΔSv %.3f MPa, Δp %.3f MPa\n", c.XX/1e6, c.YY/1e6, c.ZZ/1e6, c.Pore/1e6)
	// Output:
	// A = 0.717949
	// ΔSxx -7.179 MPa, ΔSyy -7.179 MPa, ΔSv 0.000 MPa, Δp -10.000 MPa
}

// A depleted zone 600 m long and 200 m wide along east, in a 30 m layer:
// inside, the stress falls by nearly the uniaxial-strain value; beyond its
// tip the radial (east) stress falls and the tangential (north) one rises.
// SHmax, in situ 52 MPa at N60E over Shmin 48 MPa, turns a few degrees:
// the layer holds the change close to uniaxial strain, so it is nearly
// isotropic inside a zone this much wider than the layer is thick.
func ExampleNewDepletedEllipse() {
	layer := mechanics.Layer{Poroelastic: mechanics.Poroelastic{Biot: 1, Poisson: 0.22}, Thickness: 30}
	d, err := mechanics.NewDepletedEllipse(layer, mechanics.Ellipse{
		SemiMajor: 300, SemiMinor: 100, Azimuth: 90 * deg, Depletion: -10e6})
	if err != nil {
		fmt.Println(err)
		return
	}
	insitu := mechanics.Horizontal{SHmax: 52e6, Shmin: 48e6, Azimuth: 60 * deg}
	for _, p := range [][2]float64{{0, 0}, {350, 0}, {250, 150}} {
		c := d.At(p[0], p[1])
		after := insitu.Changed(c)
		fmt.Printf("(%3.0f, %3.0f) m: ΔSxx %6.3f ΔSyy %6.3f ΔSxy %6.3f MPa; SHmax %.3f MPa at N%.1fE, turned %+.1f°\n",
			p[0], p[1], inMPa(c.XX), inMPa(c.YY), inMPa(c.XY), inMPa(after.SHmax), after.Azimuth/deg,
			mechanics.SHmaxRotation(insitu.Azimuth, after.Azimuth)/deg)
	}
	// Output:
	// (  0,   0) m: ΔSxx -7.059 ΔSyy -6.542 ΔSxy  0.000 MPa; SHmax 45.084 MPa at N56.6E, turned -3.4°
	// (350,   0) m: ΔSxx -0.440 ΔSyy  0.201 ΔSxy  0.000 MPa; SHmax 51.741 MPa at N55.7E, turned -4.3°
	// (250, 150) m: ΔSxx -0.004 ΔSyy -0.167 ΔSxy -0.154 MPa; SHmax 51.828 MPa at N62.2E, turned +2.2°
}

// A depletion field on a small grid of 50 m cells: one depleted row of
// three cells in a 30 m layer. The response is built once and applied to
// any field. Inside, the stress falls more along the row than across it,
// and the vertical stress falls too (the model's ΔSzz, which the screening
// does not apply); beside the row the stress across it rises.
func ExampleGridResponse_Change() {
	layer := mechanics.Layer{Poroelastic: mechanics.Poroelastic{Biot: 1, Poisson: 0.22}, Thickness: 30}
	grid := mechanics.DepletionGrid{Cols: 5, Rows: 3, DX: 50, DY: 50}
	r, err := mechanics.NewGridResponse(layer, grid)
	if err != nil {
		fmt.Println(err)
		return
	}
	dp := make([]float64, grid.Cells())
	for col := 1; col <= 3; col++ {
		dp[1*grid.Cols+col] = -10e6 // row 1, cols 1–3
	}
	changes := make([]mechanics.StressChange, grid.Cells())
	if err := r.Change(changes, dp, mechanics.AutoSummation); err != nil {
		fmt.Println(err)
		return
	}
	for _, cell := range [][2]int{{2, 1}, {4, 1}, {2, 2}} {
		c := changes[cell[1]*grid.Cols+cell[0]]
		fmt.Printf("cell (%d, %d): ΔSxx %6.3f ΔSyy %6.3f ΔSxy %6.3f ΔSzz %6.3f Δp %6.3f MPa\n",
			cell[0], cell[1], inMPa(c.XX), inMPa(c.YY), inMPa(c.XY), inMPa(c.ZZ), inMPa(c.Pore))
	}
	// Output:
	// cell (2, 1): ΔSxx -6.896 ΔSyy -4.849 ΔSxy  0.000 ΔSzz -2.614 Δp -10.000 MPa
	// cell (4, 1): ΔSxx -0.823 ΔSyy  0.370 ΔSxy  0.000 ΔSzz  0.453 Δp  0.000 MPa
	// cell (2, 2): ΔSxx  0.176 ΔSyy -0.847 ΔSxy  0.000 ΔSzz  0.671 Δp  0.000 MPa
}

// The zipper pad's stress at 2600 m after 10 MPa of uniform depletion along the
// uniaxial-strain path: SHmax and Shmin fall by 7.18 MPa, Sv stays, and
// the state is still strike-slip, just.
func ExampleStress_Changed() {
	s, err := mechanics.StressAtDepth(mechanics.Gradients{Sv: 25e3, SHmax: 28e3, Shmin: 18.5e3,
		PorePressure: 12e3, SHmaxAzimuth: 75 * deg}, 2600)
	if err != nil {
		fmt.Println(err)
		return
	}
	depleted, err := s.Changed(mechanics.Poroelastic{Biot: 1, Poisson: 0.22}.Uniaxial(-10e6))
	if err != nil {
		fmt.Println(err)
		return
	}
	for _, p := range depleted.Principal() {
		fmt.Printf("%-5s %.3f MPa\n", p.Name, p.Value/1e6)
	}
	fmt.Printf("pore pressure %.3f MPa, %s regime\n", depleted.PorePressure()/1e6, depleted.Regime())
	// Output:
	// SHmax 65.621 MPa
	// Sv    65.000 MPa
	// Shmin 40.921 MPa
	// pore pressure 21.200 MPa, strike-slip regime
}
