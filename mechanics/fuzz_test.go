package mechanics

import (
	"math"
	"testing"

	"gonum.org/v1/gonum/spatial/r3"

	"slipfront/internal/numtest"
)

// FuzzResolve checks the bounds every resolved stress obeys (Jaeger, Cook
// & Zimmerman 2007, ch. 2): the point (σn, τ) lies inside the Mohr circle
// of S1 and S3 and outside those of S1–S2 and S2–S3, so S3 ≤ σn ≤ S1,
// 0 ≤ τ ≤ (S1 − S3)/2 and the dilation tendency is in [0, 1]; the slip
// direction is a unit vector in the plane.
func FuzzResolve(f *testing.F) {
	f.Add(90.0, 55.0, 75.0, 60.0, 0.852869, -0.492404, 0.173648)
	f.Add(60.0, 45.0, 75.0, 0.0, 0.866025, 0.0, 0.5)
	f.Add(100.0, 80.0, 60.0, 0.0, 0.0, 0.5, 0.866025)
	f.Add(50.0, 50.0, 50.0, 10.0, 1.0, 2.0, 3.0)
	f.Add(70.0, 40.0, 40.0, 123.0, 0.0, 0.0, -1.0)
	f.Fuzz(func(t *testing.T, shmax, shmin, sv, az, nx, ny, nz float64) {
		n := r3.Vec{X: nx, Y: ny, Z: nz}
		for _, v := range []float64{shmax, shmin, sv, az, nx, ny, nz} {
			if math.IsNaN(v) || math.IsInf(v, 0) || math.Abs(v) > 1e6 {
				return
			}
		}
		if r3.Norm(n) < 1e-6 {
			return
		}
		s, err := NewAndersonian(Andersonian{SHmax: shmax * mpa, Shmin: shmin * mpa, Sv: sv * mpa,
			SHmaxAzimuth: az * deg})
		if err != nil {
			return // invalid magnitudes are rejected, which is what we want
		}
		p := s.Principal()
		s1, s2, s3 := p[0].Value, p[1].Value, p[2].Value
		r := s.Resolve(n)
		tol := 1e-12 * s1 * 8 // round-off of a few operations on stresses ≤ S1
		if r.SigmaN < s3-tol || r.SigmaN > s1+tol {
			t.Fatalf("σn = %g outside [S3, S1] = [%g, %g]", r.SigmaN, s3, s1)
		}
		if r.Tau < 0 || r.Tau > (s1-s3)/2+tol {
			t.Fatalf("τ = %g outside [0, (S1−S3)/2 = %g]", r.Tau, (s1-s3)/2)
		}
		inside := func(a, b float64) float64 { // ≤ 0 inside the circle on [b, a]
			c, rad := (a+b)/2, (a-b)/2
			return (r.SigmaN-c)*(r.SigmaN-c) + r.Tau*r.Tau - rad*rad
		}
		sq := tol * s1 * 4
		if inside(s1, s3) > sq || inside(s1, s2) < -sq || inside(s2, s3) < -sq {
			t.Fatalf("(σn, τ) = (%g, %g) outside the Mohr region of %g, %g, %g", r.SigmaN, r.Tau, s1, s2, s3)
		}
		if td := s.DilationTendency(r.SigmaN); td < -1e-9 || td > 1+1e-9 {
			t.Fatalf("dilation tendency %g", td)
		}
		if r.Slip != (r3.Vec{}) {
			if math.Abs(r3.Norm(r.Slip)-1) > 1e-9 || math.Abs(r3.Dot(r.Slip, r.Normal)) > 1e-9 {
				t.Fatalf("slip %v is not a unit vector in the plane with normal %v", r.Slip, r.Normal)
			}
		}
		if r.Rake <= -math.Pi-1e-15 || r.Rake > math.Pi {
			t.Fatalf("rake %g outside (−π, π]", r.Rake)
		}
	})
}

// FuzzSeismicityAdvance checks what every exact step of the Dieterich
// (1994) model obeys: the state stays positive, the expected count is
// non-negative, and the count equals r·t_a·[ΔS/Aσ + ln(γ1/γ0)], the
// integral of the evolution law divided by γ, however the two were
// evaluated; inverting the count at half of it gives a time inside the
// interval.
func FuzzSeismicityAdvance(f *testing.F) {
	f.Add(1e-3, 5e4, 1.0, 1e-3, 1e6)
	f.Add(1e-3, 5e4, 1e-3, 10.0, 1e4)
	f.Add(1e-3, 5e4, 1e3, -1e-2, 1e7)
	f.Add(1e-2, 1e3, 0.5, 0.0, 3e5)
	f.Fuzz(func(t *testing.T, tauDot, aSigma, gammaScale, rate, dt float64) {
		if !(tauDot >= 1e-9 && tauDot <= 1e3 && aSigma >= 1 && aSigma <= 1e8 &&
			gammaScale >= 1e-6 && gammaScale <= 1e6 && math.Abs(rate) <= 1e4 && dt >= 0 && dt <= 1e9) {
			return
		}
		m := SeismicityRate{BackgroundRate: 1, StressingRate: tauDot, ASigma: aSigma}
		g0 := gammaScale * m.SteadyState()
		if x := rate * dt / aSigma; math.Abs(x) > 600 {
			return // γ would leave the float range
		}
		g1, n := m.Advance(g0, rate, dt)
		if !(g1 > 0) || math.IsInf(g1, 0) || !(n >= 0) || math.IsInf(n, 0) {
			t.Fatalf("γ1 = %g, N = %g", g1, n)
		}
		identity := m.AftershockDuration() * (rate*dt/aSigma + math.Log(g1/g0))
		// ln(γ1/γ0) and ΔS/Aσ can each reach 600 and cancel: absolute
		// round-off ≈ 600·1e−15 relative to them.
		numtest.Close(t, "N identity", n, identity, 1e-12*m.AftershockDuration()*(1+math.Abs(rate*dt/aSigma)), 1e-9)
		if n > 0 {
			if tau := m.eventTime(g0, rate, n/2); !(tau >= 0 && tau <= dt*(1+1e-9)) {
				t.Fatalf("half the count reached at %g s, outside [0, %g]", tau, dt)
			}
		}
	})
}
