package scenarios

import (
	"errors"
	"fmt"
	"maps"
	"math"
	"regexp"
	"slices"
	"strconv"
	"strings"
	"time"

	"gonum.org/v1/gonum/spatial/r3"

	"slipfront/gis"
	"slipfront/internal/orient"
)

var crsPattern = regexp.MustCompile(`^EPSG:(\d{4,6})$`)

// validate checks the rules that involve more than one key. Ranges of
// single keys were checked while decoding.
func (d *decoder) validate(s *Scenario) {
	d.validateDomain(s)
	d.validateStress(s)
	if s.Rock.FrictionResidual > s.Rock.FrictionStatic {
		d.failKey("rock.friction_residual", "must not exceed rock.friction_static = %g", s.Rock.FrictionStatic)
	}
	d.validateSets(s)
	d.validateWells(s)
	d.validateSchedule(s)
	d.validateNumerics(s)
	if r := s.SeismicityRate; r.Active() && !(r.MaxMagnitude > r.MinMagnitude) {
		d.failKey("seismicity_rate.max_magnitude", "must exceed seismicity_rate.min_magnitude = %g", r.MinMagnitude)
	}
	d.validateMatrix(s)
	d.validateDepletion(s)
}

// validateMatrix checks that matrix leak-off and Carter coefficients are
// not both asked for.
func (d *decoder) validateMatrix(s *Scenario) {
	if !s.Matrix.Present() {
		return
	}
	for _, name := range s.PumpedFluids() {
		if c := s.Fluids[name].LeakoffCoefficient; c > 0 {
			d.failKey("fluids."+name+".leakoff_coefficient", "must be 0 with a [matrix] table: fluid leaks off into the matrix by pressure diffusion instead; remove one of the two")
		}
	}
}

func (d *decoder) validateDomain(s *Scenario) {
	dm := s.Domain
	if dm.XMax <= dm.XMin {
		d.failKey("domain.x_max", "must exceed domain.x_min = %s", formatQuantity(dm.XMin, kindLength))
	}
	if dm.YMax <= dm.YMin {
		d.failKey("domain.y_max", "must exceed domain.y_min = %s", formatQuantity(dm.YMin, kindLength))
	}
	if dm.CRS == "" {
		return
	}
	if !crsPattern.MatchString(dm.CRS) {
		d.failKey("domain.crs", `must be "EPSG:<code>" of a projected CRS, e.g. "EPSG:32614", or "" for none (or give a WKT file as domain.crs_wkt)`)
	} else if _, err := gis.ParseCRS(dm.CRS); errors.Is(err, gis.ErrUnsupportedCRS) {
		d.failKey("domain.crs", "not a projected CRS this program can place; supported are %s (domain.crs_wkt)", gis.SupportedCRSs())
	} else if err != nil {
		d.failKey("domain.crs", "%s", strings.TrimPrefix(err.Error(), "gis: "))
	}
}

func (d *decoder) validateStress(s *Scenario) {
	st := s.Stress
	if st.SHmaxGradient < st.ShminGradient {
		d.failKey("stress.shmax_gradient", "must be at least stress.shmin_gradient = %s (SHmax ≥ Shmin by definition)", formatQuantity(st.ShminGradient, kindGradient))
	}
	for _, c := range []struct {
		key string
		g   float64
	}{{"stress.shmin_gradient", st.ShminGradient}, {"stress.sv_gradient", st.SvGradient}} {
		if st.PorePressureGradient >= c.g {
			d.failKey("stress.pore_pressure_gradient", "must be below %s = %s: the effective stress would not be compressive", c.key, formatQuantity(c.g, kindGradient))
		}
	}
}

func (d *decoder) validateSets(s *Scenario) {
	if len(s.Sets) == 0 && len(s.KnownFractures.Fractures) == 0 {
		d.failKey("sets", "the scenario needs at least one fracture set ([[sets]]) or a known_fractures.file")
	}
	names := make([]string, len(s.Sets))
	for i, set := range s.Sets {
		names[i] = set.Name
	}
	d.checkNames("sets", names)
	for i, set := range s.Sets {
		p := fmt.Sprintf("sets[%d]", i)
		if set.Size.Distribution == "power_law" && set.Size.Min >= set.Size.Max {
			d.failKey(p+".size.max", "must exceed %s.size.min = %s", p, formatQuantity(set.Size.Min, kindLength))
		}
		if set.Intensity.Measure == "p10" && set.Orientation.Distribution == "fixed" {
			n := orient.Normal(set.Orientation.Dip, set.Orientation.DipDirection)
			l := orient.Line(set.Intensity.LineTrend, set.Intensity.LinePlunge)
			if math.Abs(r3.Dot(n, l)) < 1e-3 {
				d.failKey(p+".intensity.line_trend", "the measuring line lies in the plane of this fixed-orientation set, so p10 cannot be converted to p32")
			}
		}
	}
}

func (d *decoder) validateWells(s *Scenario) {
	if len(s.Wells) == 0 {
		d.failKey("wells", "the scenario needs at least one well ([[wells]]) with at least one stage")
	}
	names := make([]string, len(s.Wells))
	for i, w := range s.Wells {
		names[i] = w.Name
	}
	d.checkNames("wells", names)
	for i, w := range s.Wells {
		p := fmt.Sprintf("wells[%d]", i)
		if len(w.Path) < 2 {
			d.failKey(p+".path", "needs at least two points [x, y, depth]")
			continue
		}
		for j := 1; j < len(w.Path); j++ {
			if math.Hypot(w.Path[j].X-w.Path[j-1].X, w.Path[j].Y-w.Path[j-1].Y) < 1e-3 {
				d.failKey(fmt.Sprintf("%s.path[%d]", p, j), "lies on the previous point in map view; the model needs a well path with map-view legs of at least 1 mm")
			}
		}
		d.validateWellPlace(s, p, w)
		if w.Grows() && w.InitialHalfLength > w.ConduitHalfLength {
			d.failKey(p+".initial_half_length", "must not exceed %s.conduit_half_length = %s, the farthest a fracture may grow",
				p, formatQuantity(w.ConduitHalfLength, kindLength))
		}
		if len(w.Stages) == 0 {
			d.failKey(p+".stages", "the well needs at least one stage ([[wells.stages]]) with at least one cluster")
		}
		length := w.PathLength()
		stageNames := make([]string, len(w.Stages))
		for j, st := range w.Stages {
			stageNames[j] = st.Name
		}
		d.checkNames(p+".stages", stageNames)
		for j, st := range w.Stages {
			sp := fmt.Sprintf("%s.stages[%d]", p, j)
			if len(st.Clusters) == 0 {
				d.failKey(sp+".clusters", "needs at least one cluster position")
			}
			for k, c := range st.Clusters {
				if c < 0 || c > length {
					d.failKey(fmt.Sprintf("%s.clusters[%d]", sp, k), "must lie on the well path, within [0, %.1f] m of its first point", length)
				}
			}
			if st.Fluid != nil {
				if _, ok := s.Fluids[*st.Fluid]; !ok {
					d.failKey(sp+".fluid", "no such fluid; fluids: %s", fluidNames(s))
				}
			}
		}
	}
}

// validateWellPlace checks that every point of the well path lies in the
// map area and in the simulated layer: the model is one layer in map view,
// and a well outside it would be fed as if it were inside.
func (d *decoder) validateWellPlace(s *Scenario, p string, w Well) {
	dm, top, bottom := s.Domain, s.Layer.Depth-s.Layer.Thickness/2, s.Layer.Depth+s.Layer.Thickness/2
	for j, pt := range w.Path {
		key := fmt.Sprintf("%s.path[%d]", p, j)
		if pt.X < dm.XMin || pt.X > dm.XMax || pt.Y < dm.YMin || pt.Y > dm.YMax {
			d.failKey(key, "lies outside the map area x %s … %s, y %s … %s", formatQuantity(dm.XMin, kindLength),
				formatQuantity(dm.XMax, kindLength), formatQuantity(dm.YMin, kindLength), formatQuantity(dm.YMax, kindLength))
		}
		if pt.Depth < top || pt.Depth > bottom {
			d.failKey(key, "depth %s lies outside the layer (%s to %s true vertical depth): the model simulates one layer, and the well must be landed in it",
				formatQuantity(pt.Depth, kindLength), formatQuantity(top, kindLength), formatQuantity(bottom, kindLength))
		}
	}
}

// checkNames reports empty and repeated names of the list at path.
func (d *decoder) checkNames(path string, names []string) {
	seen := map[string]int{}
	for i, name := range names {
		key := fmt.Sprintf("%s[%d].name", path, i)
		if name == "" {
			d.failKey(key, "must not be empty")
		}
		if j, dup := seen[name]; dup {
			d.failKey(key, "repeats the name of %s[%d]", path, j)
		}
		seen[name] = i
	}
}

// Grows reports whether the well's primary conduits grow from their
// clusters (growth = "on" on conduits that exist).
func (w Well) Grows() bool { return w.ConduitHalfLength > 0 && w.Growth == "on" }

// PathLength is the map-view length of the well path, m.
func (w Well) PathLength() float64 {
	var l float64
	for i := 1; i < len(w.Path); i++ {
		l += math.Hypot(w.Path[i].X-w.Path[i-1].X, w.Path[i].Y-w.Path[i-1].Y)
	}
	return l
}

func fluidNames(s *Scenario) string {
	if len(s.Fluids) == 0 {
		return "(none defined)"
	}
	return strings.Join(slices.Sorted(maps.Keys(s.Fluids)), ", ")
}

func (d *decoder) validateSchedule(s *Scenario) {
	sc := s.Schedule
	if _, err := time.Parse(time.RFC3339, sc.Start); err != nil {
		d.failKey("schedule.start", "must be an RFC 3339 UTC time such as 2030-01-01T08:00:00Z")
	}
	if _, ok := s.Fluids[sc.Fluid]; !ok {
		d.failKey("schedule.fluid", "no such fluid; fluids: %s%s", fluidNames(s), suggest(sc.Fluid, slices.Sorted(maps.Keys(s.Fluids))))
	}
	switch {
	case sc.Order == "list" && len(sc.Sequence) == 0:
		d.failKey("schedule.sequence", `must list the stages as "WELL:STAGE" when schedule.order = "list"`)
	case sc.Order != "list" && len(sc.Sequence) > 0:
		d.failKey("schedule.sequence", `is used only when schedule.order = "list" (order is %q)`, sc.Order)
	}
	seen := map[string]bool{}
	for i, name := range sc.Sequence {
		p := fmt.Sprintf("schedule.sequence[%d]", i)
		if _, _, err := s.findStage(name); err != nil {
			d.failKey(p, "%v", err)
		}
		if seen[name] {
			d.failKey(p, "the stage is listed twice")
		}
		seen[name] = true
	}
	if len(d.errs) > 0 {
		return
	}
	p0 := s.InitialPorePressure()
	above := fmt.Sprintf("must exceed the initial pore pressure, %s (pore_pressure_gradient × layer.depth): below it the well would produce", formatQuantity(p0, kindPressure))
	if sc.Control == "pressure" && sc.InjectionPressure <= p0 {
		d.failKey("schedule.injection_pressure", "%s", above)
	}
	if sc.PressureCap <= p0 {
		d.failKey("schedule.pressure_cap", "%s", above)
	}
	for _, ps := range s.PumpingOrder() {
		if ps.Volume == 0 && ps.Duration == 0 {
			d.failKey(d.stageKey(ps)+".volume", "stage %s has no volume and no duration (set schedule.volume or schedule.duration, or the stage's own)", ps.Name)
		}
		if st := s.Wells[ps.Well].Stages[ps.Stage]; st.PressureCap != nil && *st.PressureCap <= p0 {
			d.failKey(d.stageKey(ps)+".pressure_cap", "%s", above)
		}
	}
}

func (d *decoder) stageKey(ps PlannedStage) string {
	return fmt.Sprintf("wells[%d].stages[%d]", ps.Well, ps.Stage)
}

func (d *decoder) validateNumerics(s *Scenario) {
	n := s.Numerics
	if n.TimeStepMin > n.TimeStepInitial {
		d.failKey("numerics.time_step_min", "must not exceed numerics.time_step_initial = %s", formatQuantity(n.TimeStepInitial, kindTime))
	}
	if n.TimeStepInitial > n.TimeStepMax {
		d.failKey("numerics.time_step_initial", "must not exceed numerics.time_step_max = %s", formatQuantity(n.TimeStepMax, kindTime))
	}
	if len(d.errs) > 0 {
		return
	}
	if steps := s.ScheduleLength() / n.TimeStepMax; !(steps <= float64(n.MaxSteps)) {
		d.failKey("numerics.time_step_max", "needs at least %.4g steps over the %s schedule; numerics.max_steps = %d allows fewer: use a longer time step or raise max_steps",
			steps, formatQuantity(s.ScheduleLength(), kindTime), n.MaxSteps)
	}
	if cols, rows := gridCells(s.Domain, n.CellSize); !(cols*rows <= MaxGridCells) {
		d.failKey("numerics.cell_size", "gives %.4g × %.4g map cells over the domain; at most %d allowed, use a larger cell", cols, rows, MaxGridCells)
	}
	total := s.ScheduleLength()
	if points := total/n.OutputInterval + 1; !(points <= MaxOutputPoints) {
		d.failKey("numerics.output_interval", "gives %.4g output times over the %s schedule; at most %d allowed, use a longer interval",
			points, formatQuantity(total, kindTime), MaxOutputPoints)
	}
	if total > 0 && n.OutputInterval > total {
		d.failKey("numerics.output_interval", "is longer than the whole schedule (%s at nominal rates)", formatQuantity(total, kindTime))
	}
}

// validateDepletion checks the [depletion] table, when there is one.
func (d *decoder) validateDepletion(s *Scenario) {
	dp := s.Depletion
	if dp.Wells == nil {
		return // no table
	}
	if !s.Matrix.Present() {
		d.failKey("depletion.wells", "production needs a [matrix] table: the layer drains through its matrix (permeability, porosity, total_compressibility, viscosity)")
	}
	if len(dp.Wells) == 0 {
		d.failKey("depletion.wells", "must name at least one well of [[wells]] (%s); remove the [depletion] table for no production", wellNames(s))
	}
	for i, name := range dp.Wells {
		key := fmt.Sprintf("depletion.wells[%d]", i)
		switch {
		case slices.Index(dp.Wells, name) < i:
			d.failKey(key, "names well %q twice", name)
		case !slices.ContainsFunc(s.Wells, func(w Well) bool { return w.Name == name }):
			d.failKey(key, "no well is named %q; wells: %s", name, wellNames(s))
		}
	}
	p0 := s.InitialPorePressure()
	if dp.BottomholePressure > p0 {
		d.failKey("depletion.bottomhole_pressure", "must not exceed the initial pore pressure %s at the layer depth (production draws the pressure down)",
			formatQuantity(p0, kindPressure))
	}
	for i, p := range dp.Periods {
		if p.BottomholePressure > p0 {
			d.failKey(fmt.Sprintf("depletion.periods[%d].bottomhole_pressure", i), "must not exceed the initial pore pressure %s at the layer depth (production draws the pressure down)",
				formatQuantity(p0, kindPressure))
		}
	}
	if len(dp.Periods)+1 > dp.TimeSteps {
		d.failKey("depletion.time_steps", "must be at least the number of production periods, %d", len(dp.Periods)+1)
	}
	if cols, rows := gridCells(s.Domain, dp.CellSize); !(cols*rows <= MaxDepletionCells) {
		d.failKey("depletion.cell_size", "gives %.4g × %.4g depletion cells over the domain; at most %d allowed, use a larger cell", cols, rows, MaxDepletionCells)
	}
}

// wellNames lists the scenario's well names, quoted, for messages.
func wellNames(s *Scenario) string {
	names := make([]string, len(s.Wells))
	for i, w := range s.Wells {
		names[i] = strconv.Quote(w.Name)
	}
	if len(names) == 0 {
		return "none"
	}
	return strings.Join(names, ", ")
}
