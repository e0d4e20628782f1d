package sim

import (
	"strings"

	"slipfront/internal/csvw"
)

// The tables of a run, described for csv-metadata.json (package csvw).
// Their URLs are left to the folder's owner. Pressures are in MPa, slip
// and aperture in mm, times in s from the start of pumping, depth TVD
// positive down, stages by name.
var (
	TimelineTable = csvw.Table{
		Title: "timeline",
		Description: "The run over time: one row at the end of the first time step at or after every output time (k times numerics.output_interval) and at every stage boundary, " +
			"times in s from schedule.start.",
		Columns: []csvw.Column{
			{Title: "time_s", Datatype: csvw.Double, Unit: "s", Description: "time since the start of pumping"},
			{Title: "stage", Datatype: csvw.String, Description: "name of the stage pumping or shut in (well:stage); empty before the first stage"},
			{Title: "rate_m3_s", Datatype: csvw.Double, Unit: "m3/s", Description: "injection rate into the network at the active stage's well; empty before the first stage"},
			{Title: "injected_volume_m3", Datatype: csvw.Double, Unit: "m3", Description: "volume injected since the start"},
			{Title: "bhp_MPa", Datatype: csvw.Double, Unit: "MPa", Description: "bottom-hole pressure of the active stage's well, absolute; empty before the first stage"},
			{Title: "stimulated_area_m2", Datatype: csvw.Double, Unit: "m2", Description: "stimulated area: the exact map area within numerics.stimulated_reach of a stimulated element, overlaps counted once (no grid enters it)"},
			{Title: "stimulated_fracture_area_m2", Datatype: csvw.Double, Unit: "m2", Description: "stimulated fracture surface: sum of length times conducting height of the stimulated elements"},
			{Title: "stimulated_volume_m3", Datatype: csvw.Double, Unit: "m3", Description: "stimulated area times the layer thickness"},
			{Title: "slipped_elements", Datatype: csvw.Integer, Description: "elements that have slipped at least once"},
			{Title: "events", Datatype: csvw.Integer, Description: "synthetic microseismic events so far"},
			{Title: "max_pressure_MPa", Datatype: csvw.Double, Unit: "MPa", Description: "highest pore pressure of any element, absolute"},
			{Title: "seismic_moment_Nm", Datatype: csvw.Double, Unit: "N.m", Description: "summed moment of the events (unstable ruptures) so far"},
			{Title: "aseismic_moment_Nm", Datatype: csvw.Double, Unit: "N.m", Description: "moment of the stable (aseismic) slip so far; a lower bound where crossings pin slip (summary.json pinned_crossings)"},
		},
	}
	EventsTable = csvw.Table{
		Title:       "events",
		Description: "The synthetic microseismic catalogue (not observed data): one row per rupture, in time order.",
		Columns: []csvw.Column{
			{Title: "time_s", Datatype: csvw.Double, Unit: "s", Description: "time since the start of pumping"},
			{Title: "x_m", Datatype: csvw.Double, Unit: "m", Description: "local east of the scenario origin: centre of the element where the rupture nucleated"},
			{Title: "y_m", Datatype: csvw.Double, Unit: "m", Description: "local north of the scenario origin"},
			{Title: "depth_m", Datatype: csvw.Double, Unit: "m", Description: "true vertical depth, positive down: drawn uniformly over the nucleating element's conducting height about the layer mid-plane (seeded)"},
			{Title: "fracture_id", Datatype: csvw.Integer, Description: "index of the fracture in the realization's network (fracture_id of fractures.csv); -1 for a primary conduit"},
			{Title: "stage", Datatype: csvw.String, Description: "name of the stage (well:stage)"},
			{Title: "slip_mm", Datatype: csvw.Double, Unit: "mm", Description: "mean slip D of the rupture"},
			{Title: "rupture_area_m2", Datatype: csvw.Double, Unit: "m2", Description: "area A of the ruptured elements"},
			{Title: "moment_Nm", Datatype: csvw.Double, Unit: "N.m", Description: "seismic moment M0 = G·A·D (Aki 1966), summed over the ruptured elements"},
			{Title: "magnitude_Mw", Datatype: csvw.Double, Description: "moment magnitude (Hanks and Kanamori 1979, IASPEI 2013 form)"},
		},
	}
	// RateEventsTable has the columns of EventsTable, with slip_mm and
	// rupture_area_m2 empty (the model gives magnitudes only).
	RateEventsTable = csvw.Table{
		Title:       "rate_events",
		Description: "The synthetic catalogue of the seismicity-rate model (Dieterich 1994; not observed data): events on faults too small to mesh, sampled from every fracture element's Coulomb stress history, in time order; slip_mm and rupture_area_m2 are empty, moment_Nm follows from the magnitude.",
		Columns:     EventsTable.Columns,
	}
	CrossingsTable = csvw.Table{
		Title:       "crossings",
		Description: "Every meeting of a growing fracture's tip with a natural fracture, in time order, with what the tip did there (Renshaw and Pollard 1995; non-orthogonal form after Gu et al. 2012).",
		Columns: []csvw.Column{
			{Title: "time_s", Datatype: csvw.Double, Unit: "s", Description: "time since the start of pumping (end of the step in which the tip reached it)"},
			{Title: "stage", Datatype: csvw.String, Description: "name of the stage being pumped (well:stage)"},
			{Title: "fracture_stage", Datatype: csvw.String, Description: "name of the stage of the growing fracture (well:stage)"},
			{Title: "cluster", Datatype: csvw.Integer, Description: "index of the growing fracture's cluster in its stage, from 0"},
			{Title: "fracture_id", Datatype: csvw.Integer, Description: "the natural fracture met (fracture_id of fractures.csv)"},
			{Title: "x_m", Datatype: csvw.Double, Unit: "m", Description: "local east of the meeting point"},
			{Title: "y_m", Datatype: csvw.Double, Unit: "m", Description: "local north of the meeting point"},
			{Title: "angle_deg", Datatype: csvw.Double, Unit: "deg", Description: "angle between the two fractures in map view, 0 to 90"},
			{Title: "outcome", Datatype: csvw.String, Description: "cross (the tip goes on across it), arrest (it stops there), divert (the fluid opens the natural fracture and the tip stops) or reinitiate (a fracture stopped at this natural fracture starts again at its end x_m, y_m; angle between the new branch and the natural fracture)"},
		},
	}
	FracturesTable = csvw.Table{
		Title:       "fractures",
		Description: "Final state of every fracture crossing the layer mid-plane, summed over its elements.",
		Columns: []csvw.Column{
			{Title: "fracture_id", Datatype: csvw.Integer, Description: "index of the fracture in the realization's network"},
			{Title: "set", Datatype: csvw.Integer, Description: "index of the fracture's set in the scenario; -1 for mapped fractures"},
			{Title: "set_name", Datatype: csvw.String, Description: "name of the set"},
			{Title: "dip_deg", Datatype: csvw.Double, Unit: "deg", Description: "dip, 0 to 90"},
			{Title: "dip_direction_deg", Datatype: csvw.Double, Unit: "deg", Description: "dip direction, clockwise from north, 0 to 360"},
			{Title: "trace_length_m", Datatype: csvw.Double, Unit: "m", Description: "length of the trace on the layer mid-plane"},
			{Title: "conducting_height_m", Datatype: csvw.Double, Unit: "m", Description: "conducting height: down-dip length of the fracture inside the layer"},
			{Title: "elements", Datatype: csvw.Integer, Description: "elements on its trace"},
			{Title: "max_slip_mm", Datatype: csvw.Double, Unit: "mm", Description: "largest slip of any of its elements"},
			{Title: "mean_slip_mm", Datatype: csvw.Double, Unit: "mm", Description: "length-weighted mean slip"},
			{Title: "initial_aperture_mm", Datatype: csvw.Double, Unit: "mm", Description: "length-weighted mean hydraulic aperture before injection"},
			{Title: "mean_aperture_mm", Datatype: csvw.Double, Unit: "mm", Description: "length-weighted mean hydraulic aperture at the end"},
			{Title: "permeability_gain", Datatype: csvw.Double, Description: "(mean_aperture / initial_aperture)^2 (cubic law, k = e^2/12) at the end of the run, with the pressure still raised"},
			{Title: "max_permeability_gain", Datatype: csvw.Double, Description: "largest permeability gain of any of its elements"},
			{Title: "retained_aperture_mm", Datatype: csvw.Double, Unit: "mm", Description: "length-weighted mean hydraulic aperture back at the initial pore pressure and in-situ stress: the initial aperture grown by the shear dilation of its slip"},
			{Title: "retained_permeability_gain", Datatype: csvw.Double, Description: "(retained_aperture / initial_aperture)^2: the permeability gain that stays when the pressure falls back"},
			{Title: "first_slip_time_s", Datatype: csvw.Double, Unit: "s", Description: "time of its first slip since the start of pumping; empty if it never slipped"},
			{Title: "first_slip_stage", Datatype: csvw.String, Description: "name of the stage of its first slip; empty if it never slipped"},
			{Title: "stimulated_length_m", Datatype: csvw.Double, Unit: "m", Description: "length of its trace whose slip reached numerics.stimulated_slip"},
		},
	}
)

// Headers of the run tables, comma-joined.
var (
	TimelineHeader   = strings.Join(TimelineTable.Header(), ",")
	EventsHeader     = strings.Join(EventsTable.Header(), ",")
	RateEventsHeader = strings.Join(RateEventsTable.Header(), ",")
	FracturesHeader  = strings.Join(FracturesTable.Header(), ",")
)
