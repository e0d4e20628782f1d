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

// SlipModelFromScenario returns the slip model of a scenario's rock with
// the plane-strain crack stiffness.
func SlipModelFromScenario(r scenarios.Rock) (SlipModel, error) {
	c, err := CoulombFromScenario(r)
	if err != nil {
		return SlipModel{}, err
	}
	k, err := NewPlaneStrainCrack(r.ShearModulus, r.PoissonRatio)
	if err != nil {
		return SlipModel{}, err
	}
	return NewSlipModel(c, r.FrictionResidual, k)
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
