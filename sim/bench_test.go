package sim

import (
	"context"
	"testing"

	"slipfront/dfn"
	"slipfront/flow"
	"slipfront/scenarios"
)

// BenchmarkDemo runs the whole embedded demo (the README's performance
// table): two stages of 3 000 bbl at 80 bbl/min, five growing fractures
// each through limited entry, matrix leak-off, elastic interaction.
func BenchmarkDemo(b *testing.B) {
	s, err := scenarios.LoadExample("demo")
	if err != nil {
		b.Fatal(err)
	}
	benchmarkRun(b, s)
}

// BenchmarkZipperPad runs the whole zipper-pad example: two wells of three
// 200 bbl stages pumped in zipper order into a natural network with a
// mapped fault (the demo before growth and field-size stages existed).
func BenchmarkZipperPad(b *testing.B) {
	s, err := scenarios.LoadExample("zipper-pad")
	if err != nil {
		b.Fatal(err)
	}
	benchmarkRun(b, s)
}

// BenchmarkGrowthKGD runs testdata/kgd-toughness: one fracture growing
// from 4 m to 120 m over 60 s on 2 m elements (30 openings per tip).
func BenchmarkGrowthKGD(b *testing.B) {
	s, err := scenarios.Load("../testdata/kgd-toughness/scenario.toml")
	if err != nil {
		b.Fatal(err)
	}
	benchmarkRun(b, s)
}

// benchmarkRun times whole runs of realization 0 of s.
func benchmarkRun(b *testing.B, s *scenarios.Scenario) {
	net, err := dfn.Generate(s, 0)
	if err != nil {
		b.Fatal(err)
	}
	b.ResetTimer()
	for range b.N {
		res, err := Run(context.Background(), s, net, Options{})
		if err != nil {
			b.Fatal(err)
		}
		b.ReportMetric(float64(res.Steps), "steps")
		b.ReportMetric(float64(len(res.Elements)), "elements")
	}
}

// BenchmarkDepleteZipperPad computes the depletion of the zipper pad after two
// years of production from well W1 (its six stages' clusters) and the
// stress change it leaves, on the default 10 m grid over the 1.6 × 1 km
// map: the cost the depletion work must keep below one stimulation run
// (BenchmarkZipperPad).
func BenchmarkDepleteZipperPad(b *testing.B) {
	ov, err := scenarios.ParseOverrides([]string{`depletion.wells=["W1"]`, "depletion.bottomhole_pressure=15 MPa",
		"depletion.duration=2 yr", "matrix.permeability=1.5 uD"})
	if err != nil {
		b.Fatal(err)
	}
	s, err := scenarios.LoadExample("zipper-pad", ov...)
	if err != nil {
		b.Fatal(err)
	}
	b.ResetTimer()
	for range b.N {
		d, err := Deplete(s)
		if err != nil {
			b.Fatal(err)
		}
		b.ReportMetric(float64(d.Grid.Cells()), "cells")
	}
}

// benchmarkCoupledStep times one coupled step (flow ⇄ mechanics, all
// Picard iterations, factorizations included) of the zipper pad's first stage on
// a map enlarged by the given overrides, from the initial state.
func benchmarkCoupledStep(b *testing.B, overrides ...string) {
	ov, err := scenarios.ParseOverrides(overrides)
	if err != nil {
		b.Fatal(err)
	}
	s, err := scenarios.LoadExample("zipper-pad", ov...)
	if err != nil {
		b.Fatal(err)
	}
	net, err := dfn.Generate(s, 0)
	if err != nil {
		b.Fatal(err)
	}
	m, err := newModel(s, net, nil)
	if err != nil {
		b.Fatal(err)
	}
	r, err := newRunner(m, Options{})
	if err != nil {
		b.Fatal(err)
	}
	if err := r.initialise(); err != nil {
		b.Fatal(err)
	}
	sys, err := r.system(0)
	if err != nil {
		b.Fatal(err)
	}
	ps := m.order[0]
	ctl := flow.Control{Mode: flow.RateControl, Rate: ps.Rate, Cap: ps.PressureCap}
	start := r.cur
	work := sys.NewState(m.p0, r.ms.apertures)
	b.ResetTimer()
	var iterations int
	for range b.N {
		res, err := sys.Step(start, work, s.Numerics.TimeStepInitial, ctl, r.ms.apertures,
			flow.StepSettings{MaxIterationChange: s.Numerics.PressureChangeMax})
		if err != nil {
			b.Fatal(err)
		}
		if _, err := r.ms.solve(start.Pressure, work.Pressure); err != nil {
			b.Fatal(err)
		}
		iterations += res.Iterations
	}
	b.ReportMetric(float64(iterations)/float64(b.N), "iterations/op")
	b.ReportMetric(float64(len(m.elements)), "elements")
	b.ReportMetric(float64(sys.Solver().CholeskyEntries()), "nnz(L)")
}

// About 1.1·10⁵ elements: the zipper pad's network over a 4 km × 4 km map.
func BenchmarkCoupledStep1e5(b *testing.B) {
	benchmarkCoupledStep(b, "domain.x_min=-2000 m", "domain.x_max=2000 m", "domain.y_min=-2000 m", "domain.y_max=2000 m")
}

// About 1.1·10⁴ elements: the zipper pad as it is.
func BenchmarkCoupledStep1e4(b *testing.B) { benchmarkCoupledStep(b) }
