package mechanics

import (
	"math"
	"math/rand/v2"
	"testing"

	"gonum.org/v1/gonum/spatial/r3"

	"slipfront/internal/numtest"
	"slipfront/internal/orient"
)

// angleDiff returns a − b wrapped into (−π, π], so that rakes of ±180°
// compare equal.
func angleDiff(a, b float64) float64 {
	d := math.Remainder(a-b, 2*math.Pi)
	return d
}

// docs/references.md §7.4 worked example (Jaeger, Cook & Zimmerman 2007;
// Morris et al. 1996): fracture 80/120 in the strike-slip state.
func TestWorkedExample(t *testing.T) {
	s := workedExample(t)
	r := s.Resolve(orient.Normal(80*deg, 120*deg))
	c := Coulomb{Friction: 0.6}
	p := s.PorePressure()

	numtest.Abs(t, "σn", r.SigmaN, 64.089229*mpa, digits6MPa)
	numtest.Abs(t, "τ", r.Tau, 15.048682*mpa, digits6MPa)
	const ratioTol = 1e-6 // printed with 6 decimals
	numtest.Abs(t, "slip tendency (effective)", SlipTendency(r.SigmaN, r.Tau, p), 0.441450, ratioTol)
	numtest.Abs(t, "slip tendency (total)", TotalSlipTendency(r.SigmaN, r.Tau), 0.234808, ratioTol)
	numtest.Abs(t, "CFF", c.FailureFunction(r.SigmaN, r.Tau, p), -5.404856*mpa, digits6MPa)
	if c.Slips(r.SigmaN, r.Tau, p) {
		t.Error("the §7.4 fracture slips at p0; it is stable")
	}
	numtest.Abs(t, "p_c", c.CriticalPressure(r.SigmaN, r.Tau), 39.008093*mpa, digits6MPa)
	numtest.Abs(t, "Δp_c", c.CriticalIncrease(r.SigmaN, r.Tau, p), 9.008093*mpa, digits6MPa)

	want := r3.Vec{X: -0.476672, Y: -0.870019, Z: -0.125900}
	const vecTol = 1e-6 // printed with 6 decimals
	numtest.Abs(t, "ŝ.X", r.Slip.X, want.X, vecTol)
	numtest.Abs(t, "ŝ.Y", r.Slip.Y, want.Y, vecTol)
	numtest.Abs(t, "ŝ.Z", r.Slip.Z, want.Z, vecTol)
	numtest.Abs(t, "rake", r.Rake, -172.655*deg, digits3Deg)
	numtest.Abs(t, "dip", r.Dip, 80*deg, digits6Deg)
	numtest.Abs(t, "dip direction", r.DipDirection, 120*deg, digits6Deg)
}

// docs/references.md §7.4 extra checks: a vertical plane, the optimal vertical
// plane, and normal and reverse regimes (rakes −90, +90, 180).
func TestResolveCases(t *testing.T) {
	type state struct{ sh, shmin, sv, az float64 } // MPa, MPa, MPa, degrees
	strikeSlip := state{90, 55, 75, 60}
	optimal := 60 + 90 - OptimalAngle(0.6)/deg // normal at 45° + φ/2 from SHmax
	tests := []struct {
		name        string
		st          state
		dip, dipDir float64 // degrees
		sn, tau, pc float64 // MPa
		tol         float64 // Pa
		rake        float64 // degrees
	}{
		{"vertical 90/120.5", strikeSlip, 90, 120.5, 63.486834, 15.000428, 38.486121, digits6MPa, 180},
		{"optimal vertical", strikeSlip, 90, optimal, 63.496324, 15.006126, 38.486114, digits6MPa, 180},
		{"normal regime 60/090", state{60, 45, 75, 0}, 60, 90, 52.5, 12.99038106, 30.84936491, digits8MPa, -90},
		{"reverse regime 30/000", state{100, 80, 60, 0}, 30, 0, 70.0, 17.32050808, 41.13248654, digits8MPa, 90},
	}
	for _, tc := range tests {
		s, err := NewAndersonian(Andersonian{SHmax: tc.st.sh * mpa, Shmin: tc.st.shmin * mpa, Sv: tc.st.sv * mpa,
			SHmaxAzimuth: tc.st.az * deg, PorePressure: 30 * mpa})
		if err != nil {
			t.Fatal(err)
		}
		r := s.Resolve(orient.Normal(tc.dip*deg, tc.dipDir*deg))
		numtest.Abs(t, tc.name+" σn", r.SigmaN, tc.sn*mpa, tc.tol)
		numtest.Abs(t, tc.name+" τ", r.Tau, tc.tau*mpa, tc.tol)
		numtest.Abs(t, tc.name+" p_c", Coulomb{Friction: 0.6}.CriticalPressure(r.SigmaN, r.Tau), tc.pc*mpa, tc.tol)
		numtest.Abs(t, tc.name+" rake", angleDiff(r.Rake, tc.rake*deg), 0, digits6Deg)
	}
	// The optimal plane recovers the frictional limit:
	// (S1 − p_c)/(S3 − p_c) = 3.1194285 (docs/references.md §7.4).
	pc := 38.486114
	numtest.Abs(t, "limit from p_c", (90-pc)/(55-pc), 3.1194285, 1e-6)
}

// The two routes of docs/references.md §7.4: σn = Σ Si·li² and
// τ² = Σ Si²·li² − σn², with li the direction cosines to the principal
// axes, against the tensor route of Resolve, on random planes.
func TestResolvePrincipalRoute(t *testing.T) {
	s := workedExample(t)
	rng := rand.New(rand.NewPCG(1, 2))
	for range 200 {
		n := orient.Normal(rng.Float64()*math.Pi/2, rng.Float64()*2*math.Pi)
		var sn, s2 float64
		for _, p := range s.Principal() {
			l := r3.Dot(n, p.Axis)
			sn += p.Value * l * l
			s2 += p.Value * p.Value * l * l
		}
		r := s.Resolve(n)
		// τ from the difference of squares loses digits when τ ≪ σn:
		// allow round-off relative to σn (1e-12) scaled by σn/τ.
		numtest.Rel(t, "σn", r.SigmaN, sn, roundOff)
		tau := math.Sqrt(math.Max(s2-sn*sn, 0))
		numtest.Abs(t, "τ", r.Tau, tau, 1e-12*sn*sn/math.Max(tau, 1))
	}
}

// Planes containing σ2 follow the 2-D Mohr circle (Jaeger, Cook &
// Zimmerman 2007, ch. 2): with θ the angle between the normal and σ1,
// σn = (σ1+σ3)/2 + (σ1−σ3)/2·cos 2θ and τ = (σ1−σ3)/2·sin 2θ; the dilation
// tendency (σ1−σn)/(σ1−σ3) is then sin²θ.
func TestMohrCircle(t *testing.T) {
	// Normal regime (σ1 = Sv, σ2 = SHmax north, σ3 = Shmin east): planes
	// striking north, dipping east by θ, have normals at θ from vertical.
	// Reverse regime (σ1 = SHmax north, σ2 = Shmin east, σ3 = Sv): planes
	// striking east, dipping north by δ, have normals at 90° − δ from σ1.
	tests := []struct {
		name     string
		a        Andersonian
		normal   func(theta float64) r3.Vec
		s1, s3   float64
		rakeSign float64
	}{
		{"normal", Andersonian{SHmax: 60 * mpa, Shmin: 45 * mpa, Sv: 75 * mpa, PorePressure: 30 * mpa},
			func(th float64) r3.Vec { return orient.Normal(th, 90*deg) }, 75 * mpa, 45 * mpa, -1},
		{"reverse", Andersonian{SHmax: 100 * mpa, Shmin: 80 * mpa, Sv: 60 * mpa, PorePressure: 30 * mpa},
			func(th float64) r3.Vec { return orient.Normal(math.Pi/2-th, 0) }, 100 * mpa, 60 * mpa, 1},
	}
	for _, tc := range tests {
		s, err := NewAndersonian(tc.a)
		if err != nil {
			t.Fatal(err)
		}
		centre, radius := (tc.s1+tc.s3)/2, (tc.s1-tc.s3)/2
		for th := 1.0; th < 90; th += 4 {
			r := s.Resolve(tc.normal(th * deg))
			numtest.Abs(t, tc.name+" σn", r.SigmaN, centre+radius*math.Cos(2*th*deg), roundOff*tc.s1)
			numtest.Abs(t, tc.name+" τ", r.Tau, radius*math.Sin(2*th*deg), roundOff*tc.s1)
			numtest.Abs(t, tc.name+" dilation tendency", s.DilationTendency(r.SigmaN), math.Pow(math.Sin(th*deg), 2), roundOff*10)
			// Dip-slip: rake ∓90° (docs/references.md §7.2).
			numtest.Abs(t, tc.name+" rake", r.Rake, tc.rakeSign*math.Pi/2, 1e-9)
		}
	}
}

// rotateTensor returns R·S·Rᵀ.
func rotateTensor(rot r3.Rotation, s [3][3]float64) [3][3]float64 {
	rm := rot.Mat()
	var out [3][3]float64
	for i := range 3 {
		for j := range 3 {
			for k := range 3 {
				for l := range 3 {
					out[i][j] += rm.At(i, k) * s[k][l] * rm.At(j, l)
				}
			}
		}
	}
	return out
}

// σn and τ are invariants of the pair (tensor, plane): rotating both by the
// same rotation leaves them unchanged and rotates the slip vector with them
// (Jaeger, Cook & Zimmerman 2007, ch. 2: traction transforms as a vector).
func TestRotationInvariance(t *testing.T) {
	rng := rand.New(rand.NewPCG(1, 2))
	base := workedExample(t)
	for range 100 {
		axis := r3.Vec{X: rng.NormFloat64(), Y: rng.NormFloat64(), Z: rng.NormFloat64()}
		rot := r3.NewRotation(rng.Float64()*2*math.Pi, axis)
		rs, err := NewStress(rotateTensor(rot, base.Tensor()), base.PorePressure())
		if err != nil {
			t.Fatal(err)
		}
		n := r3.Unit(r3.Vec{X: rng.NormFloat64(), Y: rng.NormFloat64(), Z: rng.NormFloat64()})
		a, b := base.Resolve(n), rs.Resolve(rot.Rotate(n))
		const tol = 1e-12 * 100 * mpa // round-off relative to the largest stress
		numtest.Abs(t, "σn", b.SigmaN, a.SigmaN, tol)
		numtest.Abs(t, "τ", b.Tau, a.Tau, tol)
		// Resolve turns normals up, so the rotated slip may have the
		// opposite sense when the rotation flips the normal's vertical sense.
		sa := rot.Rotate(a.Slip)
		if r3.Dot(rot.Rotate(a.Normal), b.Normal) < 0 {
			sa = r3.Scale(-1, sa)
		}
		const vecTol = 1e-9 // direction from τ of ~1e7 Pa with round-off ~1e-4 Pa
		numtest.Abs(t, "|ŝ − Rŝ|", r3.Norm(r3.Sub(b.Slip, sa)), 0, vecTol)
		numtest.Rel(t, "S1", rs.Principal()[0].Value, base.Principal()[0].Value, roundOff)
		numtest.Rel(t, "S3", rs.Principal()[2].Value, base.Principal()[2].Value, roundOff)
	}
}

// Resolve accepts either sense and any length of the normal.
func TestResolveNormalSense(t *testing.T) {
	s := workedExample(t)
	n := orient.Normal(80*deg, 120*deg)
	a := s.Resolve(n)
	b := s.Resolve(r3.Scale(-3.5, n))
	numtest.Rel(t, "σn", b.SigmaN, a.SigmaN, roundOff)
	numtest.Rel(t, "τ", b.Tau, a.Tau, roundOff)
	numtest.Abs(t, "rake", angleDiff(b.Rake, a.Rake), 0, 1e-12)
	if b.Normal.Z < 0 {
		t.Errorf("normal not turned up: %v", b.Normal)
	}
}

// A principal plane carries no shear: slip direction and rake are zero.
func TestResolvePrincipalPlane(t *testing.T) {
	s := workedExample(t)
	r := s.Resolve(r3.Vec{Z: 1}) // horizontal plane, normal along Sv
	numtest.Rel(t, "σn", r.SigmaN, 75*mpa, roundOff)
	numtest.Abs(t, "τ", r.Tau, 0, 1e-6)
	if r.Slip != (r3.Vec{}) || r.Rake != 0 {
		t.Errorf("principal plane has slip %v rake %g", r.Slip, r.Rake)
	}
}

// The Coulomb quantities agree with each other: CFF = 0 at p_c, the plane
// slips at p ≥ p_c and not below (docs/references.md §7.2).
func TestCoulombConsistency(t *testing.T) {
	c := Coulomb{Friction: 0.6, Cohesion: 2 * mpa}
	sn, tau := 64*mpa, 20*mpa
	pc := c.CriticalPressure(sn, tau)
	numtest.Abs(t, "p_c", pc, sn-(tau-c.Cohesion)/c.Friction, roundOff*sn)
	numtest.Abs(t, "CFF(p_c)", c.FailureFunction(sn, tau, pc), 0, roundOff*sn)
	if c.Slips(sn, tau, pc-1) || !c.Slips(sn, tau, pc+1) {
		t.Error("slip onset not at p_c")
	}
	numtest.Abs(t, "Δp_c", c.CriticalIncrease(sn, tau, 30*mpa), pc-30*mpa, 0)
	if got := SlipTendency(sn, tau, sn); !math.IsInf(got, 1) {
		t.Errorf("slip tendency of an open fracture = %g, want +Inf", got)
	}
}

// The dilation tendency is 1 on the plane normal to S3 and 0 on the plane
// normal to S1 (Ferrill et al. 1999).
func TestDilationTendencyEnds(t *testing.T) {
	s := workedExample(t)
	p := s.Principal()
	numtest.Abs(t, "Td(S3 plane)", s.DilationTendency(s.Resolve(p[2].Axis).SigmaN), 1, roundOff)
	numtest.Abs(t, "Td(S1 plane)", s.DilationTendency(s.Resolve(p[0].Axis).SigmaN), 0, roundOff)
	iso, err := NewStress([3][3]float64{{50 * mpa, 0, 0}, {0, 50 * mpa, 0}, {0, 0, 50 * mpa}}, 10*mpa)
	if err != nil {
		t.Fatal(err)
	}
	if got := iso.DilationTendency(50 * mpa); got != 0 {
		t.Errorf("isotropic dilation tendency = %g, want 0", got)
	}
}

// TestOptimalCriticalIncrease: the closed form (the Mohr circle of S1 and
// S3 tangent to the Coulomb line; Jaeger, Cook & Zimmerman 2007, §4.6,
// from memory) is the least Δp_c over plane orientations, found by brute
// force over 200 000 random normals (the minimum of a smooth function on
// the sphere is flat, so the sampled minimum lies within 0.1 % of the
// stress difference above it, and never below it), in the three regimes,
// with cohesion and after a change that rotates the horizontal stresses.
func TestOptimalCriticalIncrease(t *testing.T) {
	rotated, err := NewAndersonian(Andersonian{SHmax: 60e6, Shmin: 40e6, Sv: 55e6, PorePressure: 25e6, SHmaxAzimuth: 1})
	if err != nil {
		t.Fatal(err)
	}
	if rotated, err = rotated.Changed(StressChange{XX: -3e6, YY: 1e6, XY: 4e6, Pore: -5e6}); err != nil {
		t.Fatal(err)
	}
	cases := []struct {
		name string
		a    Andersonian
		c    Coulomb
	}{
		{"strike-slip", Andersonian{SHmax: 72.8e6, Shmin: 48.1e6, Sv: 65e6, PorePressure: 31.2e6, SHmaxAzimuth: 75 * math.Pi / 180}, Coulomb{Friction: 0.6}},
		{"normal", Andersonian{SHmax: 50e6, Shmin: 40e6, Sv: 65e6, PorePressure: 30e6}, Coulomb{Friction: 0.6, Cohesion: 2e6}},
		{"reverse", Andersonian{SHmax: 90e6, Shmin: 70e6, Sv: 50e6, PorePressure: 20e6, SHmaxAzimuth: 0.3}, Coulomb{Friction: 0.8}},
	}
	rng := rand.New(rand.NewPCG(5, 6))
	check := func(name string, s Stress, c Coulomb) {
		want := c.OptimalCriticalIncrease(s)
		best := math.Inf(1)
		for range 200_000 {
			n := r3.Vec{X: rng.NormFloat64(), Y: rng.NormFloat64(), Z: rng.NormFloat64()}
			r := s.Resolve(n)
			best = math.Min(best, c.CriticalIncrease(r.SigmaN, r.Tau, s.PorePressure()))
		}
		pr := s.Principal()
		spread := pr[0].Value - pr[2].Value
		if best < want-1e-6*spread || best > want+1e-3*spread {
			t.Errorf("%s: sampled least Δp_c %.6g Pa, closed form %.6g Pa", name, best, want)
		}
	}
	for _, tc := range cases {
		s, err := NewAndersonian(tc.a)
		if err != nil {
			t.Fatal(err)
		}
		check(tc.name, s, tc.c)
	}
	check("rotated and depleted", rotated, Coulomb{Friction: 0.6})
}
