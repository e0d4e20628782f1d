package mechanics

import "slipfront/scenarios"

// StressFromScenario returns the stress state at true vertical depth z, m,
// from a scenario's stress gradients (SI units, radians).
func StressFromScenario(st scenarios.Stress, z float64) (Stress, error) {
	return StressAtDepth(Gradients{
		Sv:           st.SvGradient,
		SHmax:        st.SHmaxGradient,
		Shmin:        st.ShminGradient,
		PorePressure: st.PorePressureGradient,
		SHmaxAzimuth: st.SHmaxAzimuth,
	}, z)
}

// CoulombFromScenario returns the slip criterion of a scenario's rock:
// static friction and cohesion.
func CoulombFromScenario(r scenarios.Rock) (Coulomb, error) {
	c := Coulomb{Friction: r.FrictionStatic, Cohesion: r.Cohesion}
	if err := c.Validate(); err != nil {
		return Coulomb{}, err
	}
	return c, nil
}

// FrictionFromScenario returns the slip-weakening friction of a
// scenario's rock: μs, μd, Dc and cohesion.
func FrictionFromScenario(r scenarios.Rock) (SlipWeakening, error) {
	f := SlipWeakening{Static: r.FrictionStatic, Residual: r.FrictionResidual,
		CriticalSlip: r.SlipWeakeningDistance, Cohesion: r.Cohesion}
	if err := f.Validate(); err != nil {
		return SlipWeakening{}, err
	}
	return f, nil
}

// ApertureFromScenario returns the aperture model of a scenario's rock.
func ApertureFromScenario(r scenarios.Rock) (ApertureModel, error) {
	m := ApertureModel{
		ZeroStress:        r.ZeroStressAperture,
		ClosureStress:     r.ClosureStress,
		DilationAngle:     r.DilationAngle,
		DilationSlipLimit: r.DilationSlipLimit,
		ShearModulus:      r.ShearModulus,
		PoissonRatio:      r.PoissonRatio,
	}
	if err := m.Validate(); err != nil {
		return ApertureModel{}, err
	}
	return m, nil
}

// LayerFromScenario returns the depletion model of a scenario's layer: its
// rock's Poisson's ratio, its thickness and Biot's coefficient biot (the
// scenario has no key for it yet; 1 is the upper bound and the value the
// demo's figures use).
func LayerFromScenario(r scenarios.Rock, l scenarios.Layer, biot float64) (Layer, error) {
	m := Layer{Poroelastic: Poroelastic{Biot: biot, Poisson: r.PoissonRatio}, Thickness: l.Thickness}
	if err := m.Validate(); err != nil {
		return Layer{}, err
	}
	return m, nil
}

// DepletionGridFromScenario returns the depletion grid with the cells of a
// scenario's map grid (same order: row·Cols + col, rows south to north).
func DepletionGridFromScenario(g scenarios.Grid) DepletionGrid {
	return DepletionGrid{Cols: g.Cols, Rows: g.Rows, DX: g.CellSize, DY: g.CellSize}
}
