package pipeline

import (
	"errors"
	"io"

	"gonum.org/v1/gonum/spatial/r2"

	"slipfront/dfn"
	"slipfront/internal/badinput"
	"slipfront/mechanics"
	"slipfront/scenarios"
	"slipfront/sim"
)

// Generate generates realization 0 of the scenario's network and writes
// the generate folder: ScenarioFile (for the report), NetworkFracturesFile,
// TracesFile, NetworkFile and CSVMetadataFile. It returns the network and its statistics. A network
// larger than the memory limit is refused before it is drawn.
func Generate(s *scenarios.Scenario, out Folder, lim Limits) (*dfn.Network, dfn.NetworkStats, error) {
	if err := lim.CheckNetwork(s); err != nil {
		return nil, dfn.NetworkStats{}, err
	}
	st, err := out.begin()
	if err != nil {
		return nil, dfn.NetworkStats{}, err
	}
	net, err := dfn.Generate(s, 0)
	if err != nil {
		return nil, dfn.NetworkStats{}, errors.Join(err, st.Abandon())
	}
	stats := net.Stats()
	err = writeFiles(st.Dir,
		scenarioWriter(s),
		namedWriter{NetworkFracturesFile, func(w io.Writer) error { return dfn.WriteFractures(w, net) }},
		namedWriter{TracesFile, func(w io.Writer) error { return dfn.WriteTraces(w, net) }},
		namedWriter{NetworkFile, func(w io.Writer) error { return dfn.WriteNetworkJSON(w, net, stats) }},
		generateMetadata(s),
	)
	if err != nil {
		return nil, dfn.NetworkStats{}, err
	}
	return net, stats, st.Commit()
}

// scenarioWriter writes the resolved scenario (ScenarioFile).
func scenarioWriter(s *scenarios.Scenario) namedWriter {
	return namedWriter{ScenarioFile, func(w io.Writer) error { return scenarios.WriteResolved(w, s) }}
}

// Screen resolves the in-situ stress on every fracture of realization 0
// and writes the screen folder: ScenarioFile, ScreenTableFile,
// ScreenSummaryFile, SlipCurveFile, CSVMetadataFile and the pictures
// (SlipTendencyNetFile, CriticalNetFile, MohrPictureFile,
// SlipSharesPictureFile, CriticalMapFile). The stress, the friction and
// the network's size are checked before the folder is touched.
func Screen(s *scenarios.Scenario, out Folder, lim Limits) (*mechanics.Screening, error) {
	if _, _, err := screenCriteria(s); err != nil {
		return nil, err
	}
	if err := lim.CheckNetwork(s); err != nil {
		return nil, err
	}
	st, err := out.begin()
	if err != nil {
		return nil, err
	}
	net, sc, d, err := screen(s)
	if err != nil {
		return nil, errors.Join(err, st.Abandon())
	}
	pl, err := mapPlacement(s)
	if err != nil {
		return nil, errors.Join(err, st.Abandon())
	}
	if err := writeDepletionRasters(st.Dir, pl, d); err != nil {
		return nil, err
	}
	err = writeFiles(st.Dir,
		scenarioWriter(s),
		namedWriter{ScreenTableFile, sc.WriteCSV},
		namedWriter{ScreenSummaryFile, sc.WriteJSON},
		namedWriter{SlipCurveFile, sc.WriteCurveCSV},
		screenMetadata(s),
	)
	if err != nil {
		return nil, err
	}
	ticks, err := stressTicks(s, d)
	if err != nil {
		return nil, err
	}
	if err := writePictures(st.Dir, screenPictures(s, net, sc, ticks)); err != nil {
		return nil, err
	}
	return sc, st.Commit()
}

// screenCriteria returns the scenario's stress at the layer and its slip
// criterion.
func screenCriteria(s *scenarios.Scenario) (mechanics.Stress, mechanics.Coulomb, error) {
	stress, err := mechanics.StressFromScenario(s.Stress, s.Layer.Depth)
	if err != nil {
		return stress, mechanics.Coulomb{}, err
	}
	crit, err := mechanics.CoulombFromScenario(s.Rock)
	return stress, crit, err
}

// screen generates realization 0 and screens every fracture of it, in
// the depleted state after the scenario's production if it has any (d;
// nil for none).
func screen(s *scenarios.Scenario) (net *dfn.Network, sc *mechanics.Screening, d *sim.Depletion, err error) {
	stress, crit, err := screenCriteria(s)
	if err != nil {
		return nil, nil, nil, err
	}
	if net, err = dfn.Generate(s, 0); err != nil {
		return nil, nil, nil, err
	}
	if d, err = sim.Deplete(s); err != nil {
		return nil, nil, nil, err
	}
	opt := mechanics.ScreenOptions{SetNames: setNames(s)}
	if opt.Local, err = depletedStresses(net, stress, d); err != nil {
		return nil, nil, nil, err
	}
	sc, err = mechanics.Screen(screenPlanes(net), stress, crit, opt)
	return net, sc, d, err
}

// depletedStresses returns the stress state at the centre of every
// fracture after the production d, or nil for none.
func depletedStresses(net *dfn.Network, stress mechanics.Stress, d *sim.Depletion) ([]mechanics.Stress, error) {
	if d == nil {
		return nil, nil
	}
	var err error
	local := make([]mechanics.Stress, len(net.Fractures))
	for i, f := range net.Fractures {
		if local[i], err = stress.Changed(d.At(r2.Vec{X: f.Centre.X, Y: f.Centre.Y})); err != nil {
			return nil, badinput.Errorf("fracture %d: the depleted stress at (%.1f, %.1f) m: %v", i, f.Centre.X, f.Centre.Y, err)
		}
	}
	return local, nil
}

// screenPlanes lists every fracture with its trace length on the
// mid-plane, in the network's set numbering (dfn.KnownSet for mapped
// fractures).
func screenPlanes(net *dfn.Network) []mechanics.Plane {
	traceLength := make([]float64, len(net.Fractures))
	for _, t := range net.Traces {
		traceLength[t.Fracture] += t.Length
	}
	planes := make([]mechanics.Plane, len(net.Fractures))
	for i, f := range net.Fractures {
		planes[i] = mechanics.Plane{ID: i, Set: f.Set, Normal: f.Normal, Area: f.Area, TraceLength: traceLength[i]}
	}
	return planes
}

// setNames names the generated sets and the mapped fractures.
func setNames(s *scenarios.Scenario) map[int]string {
	names := map[int]string{dfn.KnownSet: dfn.KnownSetName}
	for i, set := range s.Sets {
		names[i] = set.Name
	}
	return names
}
