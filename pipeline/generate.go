package pipeline

import (
	"errors"
	"io"

	"slipfront/dfn"
	"slipfront/mechanics"
	"slipfront/scenarios"
)

// Generate generates realization 0 of the scenario's network and writes
// the generate folder: NetworkFracturesFile, TracesFile and NetworkFile.
// It returns the network and its statistics. A network larger than the
// memory limit is refused before it is drawn.
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
		namedWriter{NetworkFracturesFile, func(w io.Writer) error { return dfn.WriteFractures(w, net) }},
		namedWriter{TracesFile, func(w io.Writer) error { return dfn.WriteTraces(w, net) }},
		namedWriter{NetworkFile, func(w io.Writer) error { return dfn.WriteNetworkJSON(w, net, stats) }},
	)
	if err != nil {
		return nil, dfn.NetworkStats{}, err
	}
	return net, stats, st.Commit()
}

// Screen resolves the in-situ stress on every fracture of realization 0
// and writes the screen folder: ScreenTableFile, ScreenSummaryFile and
// SlipCurveFile. The stress, the friction and the network's size are
// checked before the folder is touched.
func Screen(s *scenarios.Scenario, out Folder, lim Limits) (*mechanics.Screening, error) {
	stress, err := mechanics.StressFromScenario(s.Stress, s.Layer.Depth)
	if err != nil {
		return nil, err
	}
	crit, err := mechanics.CoulombFromScenario(s.Rock)
	if err != nil {
		return nil, err
	}
	if err := lim.CheckNetwork(s); err != nil {
		return nil, err
	}
	st, err := out.begin()
	if err != nil {
		return nil, err
	}
	net, err := dfn.Generate(s, 0)
	if err != nil {
		return nil, errors.Join(err, st.Abandon())
	}
	sc, err := mechanics.Screen(screenPlanes(net), stress, crit, mechanics.ScreenOptions{SetNames: setNames(s)})
	if err != nil {
		return nil, errors.Join(err, st.Abandon())
	}
	err = writeFiles(st.Dir,
		namedWriter{ScreenTableFile, sc.WriteCSV},
		namedWriter{ScreenSummaryFile, sc.WriteJSON},
		namedWriter{SlipCurveFile, sc.WriteCurveCSV},
	)
	if err != nil {
		return nil, err
	}
	return sc, st.Commit()
}

// screenPlanes lists every fracture with its trace length on the
// mid-plane. Mapped fractures get the set index after the generated sets.
func screenPlanes(net *dfn.Network) []mechanics.Plane {
	traceLength := make([]float64, len(net.Fractures))
	for _, t := range net.Traces {
		traceLength[t.Fracture] += t.Length
	}
	planes := make([]mechanics.Plane, len(net.Fractures))
	for i, f := range net.Fractures {
		set := f.Set
		if set == dfn.KnownSet {
			set = len(net.Sets)
		}
		planes[i] = mechanics.Plane{ID: i, Set: set, Normal: f.Normal, Area: f.Area, TraceLength: traceLength[i]}
	}
	return planes
}

// setNames names the generated sets and, after them, the mapped fractures.
func setNames(s *scenarios.Scenario) []string {
	names := make([]string, 0, len(s.Sets)+1)
	for _, set := range s.Sets {
		names = append(names, set.Name)
	}
	return append(names, dfn.KnownSetName)
}
