package mechanics_test

import (
	"math"
	"testing"

	"slipfront/dfn"
	"slipfront/internal/numtest"
	"slipfront/mechanics"
	"slipfront/scenarios"
)

// The motivating numbers of the depletion work, on the zipper pad scenario's
// network (depth 2600 m: Sv 65, SHmax 72.8 at N75E, Shmin 48.1 MPa, pore
// pressure 31.2 MPa; μ = 0.6, c = 0; ν = 0.22) with 10 MPa of uniform
// depletion and α = 1. Holding the total stresses (the screening before
// this work) the least critical increase is 15.246 MPa and no fracture
// slips at +10 MPa; with the uniaxial-strain path (ΔSh = A·ΔP = −7.179 MPa,
// Engelder & Fischer 1994; Zoback 2007) it is 8.067 MPa and 64.3 % of the
// fractures slip at +10 MPa (the request that started this work quoted
// 15.2 MPa and 0 % against 8.0 MPa and 65 %).
func TestZipperPadDepletionScreening(t *testing.T) {
	s, err := scenarios.LoadExample("zipper-pad")
	if err != nil {
		t.Fatal(err)
	}
	stress, err := mechanics.StressFromScenario(s.Stress, s.Layer.Depth)
	if err != nil {
		t.Fatal(err)
	}
	crit, err := mechanics.CoulombFromScenario(s.Rock)
	if err != nil {
		t.Fatal(err)
	}
	net, err := dfn.Generate(s, 0)
	if err != nil {
		t.Fatal(err)
	}
	if len(net.Fractures) < 1000 {
		t.Fatalf("the demo network has %d fractures; the shares below need a population", len(net.Fractures))
	}
	planes := make([]mechanics.Plane, len(net.Fractures))
	for i, f := range net.Fractures {
		planes[i] = mechanics.Plane{ID: i, Set: f.Set, Normal: f.Normal, Area: f.Area, TraceLength: 1}
	}
	const dp = -10e6
	poro := mechanics.Poroelastic{Biot: 1, Poisson: s.Rock.PoissonRatio}
	path := poro.Uniaxial(dp)
	numtest.Abs(t, "ΔSh", path.XX, -7.179487e6, 1) // 0.56/0.78 × 10 MPa, printed to 1 Pa
	tests := []struct {
		name   string
		change mechanics.StressChange
		// minShare and maxShare bound the share slipping at +10 MPa: none
		// when the stresses are held (every Δp_c ≥ 15.2 MPa), more than
		// half with the path, as the 65 % quoted (the network's own
		// figure, 64.3 %, is in the comment above and the log).
		minShare, maxShare float64
	}{
		{"total stresses held", mechanics.StressChange{Pore: dp}, 0, 0},
		{"uniaxial-strain path", path, 0.5, 1},
	}
	const (
		mu = 0.6
		// near is how far above the optimal plane's Δp_c the best of the
		// network's planes may lie: the zipper pad's sets scatter about
		// orientations 30° from SHmax, next to the optimal 29.5°, and
		// thousands of planes come within 0.05 MPa of it (observed
		// 0.0005 MPa).
		near = 0.05e6
		// below allows the closed form and the resolution to differ by
		// round-off on stresses of 73 MPa.
		below = 1e-6
	)
	for _, tc := range tests {
		changed, err := stress.Changed(tc.change)
		if err != nil {
			t.Fatal(err)
		}
		sc, err := mechanics.Screen(planes, changed, crit, mechanics.ScreenOptions{})
		if err != nil {
			t.Fatal(err)
		}
		if changed.Regime() != "strike-slip" {
			t.Errorf("%s: regime %q, want strike-slip (SHmax stays above Sv = 65 MPa)", tc.name, changed.Regime())
		}
		// The least critical increase of any plane is that of the
		// optimally oriented plane (Jaeger, Cook & Zimmerman 2007, ch. 4):
		// Δp_c* = (S1 + S3)/2 − p − ((S1 − S3)/2)·√(1 + μ²)/μ, with S1 =
		// SHmax, S3 = Shmin and p from the zipper pad's gradients plus the
		// change (isotropic, so the axes stay).
		s1 := 28e3*2600 + tc.change.XX
		s3 := 18.5e3*2600 + tc.change.YY
		p := 12e3*2600 + tc.change.Pore
		optimal := (s1+s3)/2 - p - (s1-s3)/2*math.Sqrt(1+mu*mu)/mu
		least, slipping, independent := math.Inf(1), 0, 0
		for i, r := range sc.Planes {
			least = math.Min(least, r.CriticalIncrease)
			if r.CriticalIncrease <= 10e6 {
				slipping++
			}
			if independentCriticalIncrease(changed, planes[i], mu) <= 10e6 {
				independent++
			}
		}
		if least < optimal-below || least > optimal+near {
			t.Errorf("%s: least Δp_c %.6f MPa, optimal plane %.6f MPa", tc.name, least/1e6, optimal/1e6)
		}
		// The share at +10 MPa (DefaultIncreases()[4]) counts the planes
		// whose Δp_c, resolved independently in the principal frame, is at
		// most 10 MPa.
		if slipping != independent {
			t.Errorf("%s: %d planes slip at +10 MPa, %d by the independent resolution", tc.name, slipping, independent)
		}
		share := sc.Total.FractureShare[4]
		if want := float64(slipping) / float64(len(planes)); share != want {
			t.Errorf("%s: share at +10 MPa %g, want %d/%d", tc.name, share, slipping, len(planes))
		}
		if share < tc.minShare || share > tc.maxShare {
			t.Errorf("%s: share at +10 MPa %.3f, want in [%g, %g]", tc.name, share, tc.minShare, tc.maxShare)
		}
		t.Logf("%s: least Δp_c %.3f MPa (optimal plane %.3f MPa); %d of %d fractures (%.1f %%, %.1f %% of the area) slip at +10 MPa",
			tc.name, least/1e6, optimal/1e6, slipping, len(planes), 100*share, 100*sc.Total.AreaShare[4])
	}
}

// independentCriticalIncrease returns Δp_c = σn − p − τ/μ (no cohesion)
// of the plane in the Andersonian state s, resolved in the principal frame:
// with direction cosines l_k of the normal, σn = Σ S_k·l_k² and
// τ² = Σ S_k²·l_k² − σn² (Jaeger, Cook & Zimmerman 2007, ch. 2).
func independentCriticalIncrease(s mechanics.Stress, pl mechanics.Plane, mu float64) float64 {
	n := pl.Normal
	norm := math.Sqrt(n.X*n.X + n.Y*n.Y + n.Z*n.Z)
	var sn, s2 float64
	for _, pr := range s.Principal() {
		l := (n.X*pr.Axis.X + n.Y*pr.Axis.Y + n.Z*pr.Axis.Z) / norm
		sn += pr.Value * l * l
		s2 += pr.Value * pr.Value * l * l
	}
	return sn - s.PorePressure() - math.Sqrt(math.Max(0, s2-sn*sn))/mu
}
