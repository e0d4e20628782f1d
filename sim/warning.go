package sim

// Kinds of Warning.
const (
	// WarnBHPAboveShmin: the bottom-hole pressure of a stage exceeded
	// Shmin, so the run entered the tensile-fracturing regime, which the
	// model treats only approximately. One warning per stage that does.
	WarnBHPAboveShmin = "bhp_above_shmin"
	// WarnVolumeNotReached: a stage pumped to a volume was ended before
	// the volume was in, after a set multiple of its nominal length.
	WarnVolumeNotReached = "volume_not_reached"
	// WarnNucleationUnresolved: elements are longer than the nucleation
	// half-length of slip-weakening friction on some fracture, so the
	// size and number of ruptures (events) depend on element_length.
	WarnNucleationUnresolved = "nucleation_unresolved"
	// WarnDepletionAtEdge: production drew the pore pressure down at the
	// edge of the map area, whose closed edge then held fluid in that an
	// open reservoir would have let flow: the depletion near the edge is
	// overstated.
	WarnDepletionAtEdge = "depletion_at_edge"
	// WarnRegimeChanged: production changed the order of the principal
	// stresses (the faulting regime) somewhere in the map area.
	WarnRegimeChanged = "depletion_changed_regime"
	// WarnGrowthAtEnd: a growing fracture reached the end of the path
	// meshed for it (conduit_half_length) with a tip still able to grow.
	WarnGrowthAtEnd = "growth_reached_end"
	// WarnCapBelowClosure: a stage whose fractures grow may not raise its
	// pressure above Shmin, their closure stress (the pressure cap, or
	// the injection pressure under pressure control), so they cannot
	// open or grow and the stage pumps only what the network takes.
	WarnCapBelowClosure = "cap_below_closure"
	// WarnRateOverflow: the seismicity-rate model met a stress step
	// beyond any finite rate on some element.
	WarnRateOverflow = "seismicity_rate_overflow"
)

// Warning is a condition of a run that its result should be read with.
type Warning struct {
	// Kind is one of the Warn* constants.
	Kind string
	// Stage names the stage it happened in.
	Stage string
	// Message says what happened, with the numbers, for people.
	Message string
}

// String returns the message.
func (w Warning) String() string { return w.Message }
