package pipeline

import (
	"strings"
	"testing"
)

// The inputs table shows the resolved scenario in the trade's units, by
// the dotted keys of --set, with the defaults filled in.
func TestInputsTable(t *testing.T) {
	s := loadExample(t, "zipper-pad")
	rows := map[string]string{}
	for _, r := range InputsTable(s).Rows {
		if _, dup := rows[r[0]]; dup {
			t.Errorf("key %s listed twice", r[0])
		}
		rows[r[0]] = r[1]
	}
	// The zipper pad's own values (scenarios/examples/zipper-pad.toml) and two
	// defaults (scenarios.Rock and FractureSet tags).
	for key, want := range map[string]string{
		"name":                             `"Zipper pad (invented)"`,
		"layer.depth":                      "2600 m",
		"stress.sv_gradient":               "25 kPa/m",
		"stress.shmax_azimuth":             "75 ° from north",
		"sets[0].orientation.dip":          "85 °",
		"sets[1].intensity.p10":            "0.008 1/m",
		"rock.poisson_ratio":               "0.22",
		"rock.closure_stress":              "25 MPa",
		"fluids.linear_gel.viscosity":      "20 cP",
		"schedule.pressure_cap":            "55 MPa",
		"wells[0].path":                    "(-600, -120, 2600) m; (600, -120, 2600) m",
		"wells[1].stages[2].clusters":      "440 m; 410 m; 380 m",
		"wells[0].stages[0].rate":          "(schedule's value)",
		"numerics.coupling_max_iterations": "30",
		"sets[0].aspect_ratio":             "1",
	} {
		if got := rows[key]; got != want {
			t.Errorf("%s = %q, want %q", key, got, want)
		}
	}
	if got := rows["schedule.rate"]; !strings.HasSuffix(got, " m³/min") {
		t.Errorf("schedule.rate = %q, want m³/min", got)
	}
}
