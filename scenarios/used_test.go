package scenarios

import (
	"errors"
	"reflect"
	"slices"
	"strings"
	"testing"

	"slipfront/internal/badinput"
)

// withGel is minimal with a second fluid that no stage pumps.
var withGel = strings.Replace(minimal, "[schedule]", "[fluids.gel]\nviscosity = \"20 cP\"\n[schedule]", 1)

// An override that would add an entry nothing uses, or change a value no
// run reads, is refused with a message naming the key; one that declares
// its entry new, names it, or changes a value a run reads is accepted.
func TestOverridesThatChangeNothing(t *testing.T) {
	refused := []struct {
		name string
		src  string
		sets []string
		want []string
	}{
		{"mistyped fluid", minimal, []string{"fluids.watr.viscosity=20cP"},
			[]string{`--set fluids.watr.viscosity=20cP: the scenario has no fluids.watr (did you mean "fluids.water"?) and nothing names it (it has fluids.water)`,
				"declare it with a leading +: --set +fluids.watr.viscosity=20cP"}},
		{"mistyped fluid, no close name", minimal, []string{"fluids.brine.compressibility=0.4/GPa"},
			[]string{"--set fluids.brine.compressibility=0.4/GPa: the scenario has no fluids.brine and nothing names it (it has fluids.water)"}},
		{"declared fluid exists", minimal, []string{"+fluids.water.viscosity=2cP"},
			[]string{"--set +fluids.water.viscosity=2cP: fluids.water exists already; drop the +"}},
		{"declared key outside a named table", minimal, []string{"+rock.cohesion=1MPa"},
			[]string{"--set +rock.cohesion=1MPa: a leading + declares a new entry of a named table"}},
		{"unpumped fluid", withGel, []string{"fluids.gel.viscosity=5cP"},
			[]string{"--set fluids.gel.viscosity=5cP: changes nothing a run uses: no stage pumps fluids.gel (the stages pump water)"}},
		{"kappa of a uniform set", minimal, []string{"sets[1].orientation.kappa=15"},
			[]string{`--set sets[1].orientation.kappa=15: changes nothing a run uses: sets[1].orientation.kappa is read only when sets[1].orientation.distribution is fisher (it is "uniform")`}},
		{"mean of a power law", minimal, []string{"sets[0].size.mean=30m"},
			[]string{`sets[0].size.mean is read only when sets[0].size.distribution is lognormal or exponential (it is "power_law")`}},
		{"conduit without length", minimal, []string{"wells[0].conduit_aperture=2mm"},
			[]string{"wells[0].conduit_aperture is read only when wells[0].conduit_half_length > 0 (it is 0 m)"}},
		{"injection pressure under rate control", minimal, []string{"schedule.injection_pressure=40MPa"},
			[]string{`schedule.injection_pressure is read only when schedule.control is pressure (it is "rate")`}},
		{"a stage beyond the list", minimal, []string{"wells[0].stages[2].name=3"},
			[]string{"--set wells[0].stages[2].name=3: index 2 out of range: the scenario has 2 entries in wells[0].stages"}},
		{"a well beyond the list", minimal, []string{"wells[1].name=B"},
			[]string{"--set wells[1].name=B: index 1 out of range: the scenario has 1 entry in wells"}},
		{"every such override at once", minimal, []string{"sets[1].orientation.kappa=15", "sets[0].size.mean=30m"},
			[]string{"sets[1].orientation.kappa=15: changes nothing", "sets[0].size.mean=30m: changes nothing"}},
	}
	for _, tc := range refused {
		t.Run(tc.name, func(t *testing.T) {
			_, err := parseText(t, tc.src, tc.sets...)
			if err == nil {
				t.Fatalf("--set %v accepted", tc.sets)
			}
			for _, w := range tc.want {
				if !strings.Contains(err.Error(), w) {
					t.Errorf("error:\n%v\nwant it to contain:\n%s", err, w)
				}
			}
		})
	}
	accepted := []struct {
		name     string
		src      string
		sets     []string
		warnings []string // each in one warning, in order
	}{
		{"declared new fluid", minimal, []string{"+fluids.gel.viscosity=5cP", "fluids.gel.compressibility=0.5/GPa"},
			[]string{"--set +fluids.gel.viscosity=5cP: no stage pumps this fluid (the stages pump water)"}},
		{"new fluid named by the schedule", minimal, []string{"fluids.gel.viscosity=5cP", "schedule.fluid=gel"},
			[]string{"test.toml:34: fluids.water: no stage pumps this fluid (the stages pump gel)"}},
		{"new fluid named by a stage", withGel, []string{"fluids.brine.viscosity=2cP", "wells[0].stages[0].fluid=brine"},
			[]string{"test.toml:36: fluids.gel: no stage pumps this fluid (the stages pump brine or water)"}},
		{"law chosen with its key", minimal, []string{"sets[0].size.distribution=lognormal", "sets[0].size.mean=30m"}, nil},
		{"value equal to the file's", minimal, []string{"fluids.water.viscosity=1cP"}, nil},
		{"fluid made pumped", withGel, []string{"fluids.gel.viscosity=5cP", "wells[0].stages[1].fluid=gel"}, nil},
	}
	for _, tc := range accepted {
		t.Run(tc.name, func(t *testing.T) {
			s, err := parseText(t, tc.src, tc.sets...)
			if err != nil {
				t.Fatal(err)
			}
			if len(s.Warnings) != len(tc.warnings) {
				t.Fatalf("warnings %q, want %d", s.Warnings, len(tc.warnings))
			}
			for i, w := range tc.warnings {
				if !strings.Contains(s.Warnings[i], w) {
					t.Errorf("warning %q, want it to contain %q", s.Warnings[i], w)
				}
			}
		})
	}
}

// UsedDigest changes with what a run uses and with nothing else; Digest
// covers everything.
func TestUsedDigest(t *testing.T) {
	parse := func(src string, sets ...string) *Scenario {
		t.Helper()
		s, err := parseText(t, src, sets...)
		if err != nil {
			t.Fatal(err)
		}
		return s
	}
	base := parse(minimal)
	same := []struct{ name, src string }{
		{"an unpumped fluid", withGel},
		{"kappa of a uniform set", strings.Replace(minimal, `distribution = "uniform"`, "distribution = \"uniform\"\nkappa = 3", 1)},
		{"the mean of a power law", strings.Replace(minimal, "kappa = 10", "kappa = 10\n[sets.size]\nmean = \"7 m\"", 1)},
	}
	for _, tc := range same {
		s := parse(tc.src)
		if s.Digest == base.Digest {
			t.Errorf("%s: Digest unchanged; the test changes nothing", tc.name)
		}
		if s.UsedDigest() != base.UsedDigest() {
			t.Errorf("%s: UsedDigest changed", tc.name)
		}
	}
	for _, sets := range [][]string{{"fluids.water.viscosity=2cP"}, {"sets[0].orientation.kappa=15"}, {"seed=8"},
		{"sets[1].orientation.distribution=fisher"}} {
		if parse(minimal, sets...).UsedDigest() == base.UsedDigest() {
			t.Errorf("--set %v: UsedDigest unchanged", sets)
		}
	}
	// UsedDigest clears a copy, not the scenario.
	s := parse(strings.Replace(minimal, `distribution = "uniform"`, "distribution = \"uniform\"\nkappa = 3", 1))
	s.UsedDigest()
	if s.Sets[1].Orientation.Kappa != 3 || digest(s) != s.Digest || len(s.Fluids) != 1 {
		t.Errorf("UsedDigest changed the scenario: kappa %g, fluids %v", s.Sets[1].Orientation.Kappa, s.Fluids)
	}
}

// Every when tag names a sibling key of the right type (evalWhen panics
// otherwise).
func TestWhenTagsNameSiblings(t *testing.T) {
	var tagged []string
	var walk func(t reflect.Type)
	walk = func(typ reflect.Type) {
		for i := range typ.NumField() {
			f := typ.Field(i)
			if cond := f.Tag.Get("when"); cond != "" {
				evalWhen(reflect.New(typ).Elem(), cond)
				tagged = append(tagged, typ.Name()+"."+f.Name)
			}
			switch ft := f.Type; {
			case ft.Kind() == reflect.Struct:
				walk(ft)
			case isTableList(ft), ft.Kind() == reflect.Map:
				walk(ft.Elem())
			}
		}
	}
	walk(reflect.TypeFor[Scenario]())
	for _, want := range []string{"Size.Mean", "Orientation.Kappa", "Well.ConduitAperture", "Schedule.InjectionPressure"} {
		if !slices.Contains(tagged, want) {
			t.Errorf("%s has no when tag; tagged: %v", want, tagged)
		}
	}
}

// The zipper pad keeps a second fluid for --set schedule.fluid=linear_gel; it
// is named in a warning with its line.
func TestExampleWarnings(t *testing.T) {
	demo, err := LoadExample("zipper-pad")
	if err != nil {
		t.Fatal(err)
	}
	if len(demo.Warnings) != 1 || !strings.HasPrefix(demo.Warnings[0], "zipper-pad.toml:122: fluids.linear_gel: no stage pumps this fluid") {
		t.Errorf("demo warnings %q", demo.Warnings)
	}
	if _, err := LoadExample("zipper-pad", Override{Key: "schedule.fluid", Value: "linear_gel"}); err != nil {
		t.Error(err)
	}
}

// Any override on a valid scenario either parses or fails with bad input
// and a message, never a panic; what parses has a used digest, and a
// refused key is named in the message.
func FuzzOverride(f *testing.F) {
	for _, set := range []string{"fluids.water.viscosity=2cP", "fluids.watr.viscosity=2cP", "+fluids.gel.viscosity=5cP",
		"+rock.cohesion=1MPa", "sets[1].orientation.kappa=15", "sets[0].size.mean=30m", "wells[0].conduit_aperture=2mm",
		"schedule.injection_pressure=40MPa", "wells[0].stages[0].fluid=gel", "fluids[0].viscosity=1cP", "fluids=3",
		"fluids.water=3", "+fluids.gel=3", "+fluids=3", "sets[9].name=x", "wells[0].stages[1].clusters=[\"480 m\"]"} {
		f.Add(set)
	}
	f.Fuzz(func(t *testing.T, set string) {
		ov, err := ParseOverride(set)
		if err != nil {
			if !errors.Is(err, badinput.Err) {
				t.Fatalf("%q: %v is not bad input", set, err)
			}
			return
		}
		s, err := Parse("fuzz.toml", []byte(withGel), nil, ov)
		if err != nil {
			if !errors.Is(err, badinput.Err) || err.Error() == "" {
				t.Fatalf("%q: %v", set, err)
			}
			return
		}
		if s.UsedDigest() == "" {
			t.Fatalf("%q: no used digest", set)
		}
	})
}
