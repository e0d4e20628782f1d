package sim

import (
	"encoding/json"
	"fmt"
	"io"
	"math"
	"slices"
	"strconv"
	"strings"

	"slipfront/dfn"
	"slipfront/internal/caution"
	"slipfront/internal/csvw"
	"slipfront/internal/plural"
	"slipfront/internal/version"
	"slipfront/mechanics"
	"slipfront/scenarios"
)

// Caution is written into every summary of a run.
const Caution = caution.Text

// num formats v with prec decimals; NaN and ±Inf as an empty field.
func num(v float64, prec int) string {
	if math.IsNaN(v) || math.IsInf(v, 0) {
		return ""
	}
	s := strconv.FormatFloat(v, 'f', prec, 64)
	if strings.Trim(s, "-0.") == "" {
		return strconv.FormatFloat(0, 'f', prec, 64) // no "-0.000"
	}
	return s
}

// sci formats v in exponent notation with prec digits; NaN as empty.
func sci(v float64, prec int) string {
	if math.IsNaN(v) || math.IsInf(v, 0) {
		return ""
	}
	return strconv.FormatFloat(v, 'e', prec, 64)
}

// WriteTimeline writes timeline.csv (TimelineTable): one row per output
// time and stage boundary.
func WriteTimeline(w io.Writer, s *scenarios.Scenario, res *Result) error {
	cw := csvw.NewWriter(w, &TimelineTable)
	order := s.PumpingOrder()
	for _, x := range res.Timeline {
		cw.Write([]string{
			num(x.Time, 3), scenarios.StageNameAt(order, x.Stage), sci(x.Rate, 6), num(x.Injected, 6), num(x.BHP/1e6, 6),
			num(x.StimulatedArea, 1), num(x.FractureArea, 1), num(x.StimulatedArea*s.Layer.Thickness, 1),
			strconv.Itoa(x.SlippedElements), strconv.Itoa(x.Events), num(x.MaxPressure/1e6, 6),
			sci(x.SeismicMoment, 6), sci(x.AseismicMoment, 6),
		})
	}
	return cw.Flush()
}

// WriteEvents writes events.csv (EventsTable): the synthetic microseismic
// catalogue, slip in mm.
func WriteEvents(w io.Writer, s *scenarios.Scenario, res *Result) error {
	return writeCatalogue(w, &EventsTable, s, res.Events)
}

// WriteRateEvents writes rate_events.csv: the catalogue of the
// seismicity-rate model (RateEventsTable; slip and area empty).
func WriteRateEvents(w io.Writer, s *scenarios.Scenario, res *Result) error {
	return writeCatalogue(w, &RateEventsTable, s, res.RateEvents)
}

// writeCatalogue writes events in the columns of EventsTable.
func writeCatalogue(w io.Writer, t *csvw.Table, s *scenarios.Scenario, events []Event) error {
	cw := csvw.NewWriter(w, t)
	order := s.PumpingOrder()
	for _, e := range events {
		cw.Write([]string{
			num(e.Time, 3), num(e.X, 3), num(e.Y, 3), num(e.Depth, 3), strconv.Itoa(e.Fracture),
			scenarios.StageNameAt(order, e.Stage), sci(e.Slip*1e3, 6), num(e.Area, 3), sci(e.Moment, 6), num(e.Magnitude, 4),
		})
	}
	return cw.Flush()
}

// WriteCrossings writes crossings.csv: the meetings of growing fractures
// with natural ones (CrossingsTable).
func WriteCrossings(w io.Writer, s *scenarios.Scenario, res *Result) error {
	cw := csvw.NewWriter(w, &CrossingsTable)
	order := s.PumpingOrder()
	for _, c := range res.Crossings {
		cd := res.Conduits[c.Conduit]
		cw.Write([]string{
			num(c.Time, 3), scenarios.StageNameAt(order, c.Stage), scenarios.StageNameAt(order, cd.Stage), strconv.Itoa(cd.Cluster),
			strconv.Itoa(c.Fracture), num(c.X, 3), num(c.Y, 3), num(c.Angle*180/math.Pi, 3), c.Outcome,
		})
	}
	return cw.Flush()
}

// Grows reports whether a scenario grows fractures (some well with
// conduits has growth = "on"), so that a run writes crossings.csv.
func Grows(s *scenarios.Scenario) bool { return slices.ContainsFunc(s.Wells, scenarios.Well.Grows) }

// FractureResult is the final state of one fracture that crosses the
// layer, summed over its elements.
type FractureResult struct {
	Fracture int
	// Set index and name.
	Set     int
	SetName string
	// Dip and DipDirection, radians.
	Dip, DipDirection float64
	// TraceLength and Height, m; Elements on its trace.
	TraceLength, Height float64
	Elements            int
	// MaxSlip and MeanSlip (length-weighted), m.
	MaxSlip, MeanSlip float64
	// MeanAperture and InitialAperture (length-weighted), m.
	MeanAperture, InitialAperture float64
	// PermeabilityGain (MeanAperture/InitialAperture)² (cubic law: k = e²/12)
	// and the largest gain of any of its elements, at the end of the run.
	PermeabilityGain, MaxPermeabilityGain float64
	// RetainedAperture (length-weighted), m, and RetainedPermeabilityGain
	// (RetainedAperture/InitialAperture)²: what stays when the pressure
	// falls back to the initial pore pressure and the stresses to their
	// in-situ values, the shear dilation of the accumulated slip alone
	// (mechanics.ApertureModel.DilationFactor).
	RetainedAperture, RetainedPermeabilityGain float64
	// FirstSlip time, s (NaN if never), and its stage index (−1).
	FirstSlip      float64
	FirstSlipStage int
	// StimulatedLength of its trace, m.
	StimulatedLength float64
}

// Fractures sums the result per fracture, in fracture order.
func Fractures(s *scenarios.Scenario, net *dfn.Network, res *Result) ([]FractureResult, error) {
	ap, err := mechanics.ApertureFromScenario(s.Rock)
	if err != nil {
		return nil, err
	}
	byFracture := map[int]*FractureResult{}
	var order []int
	for i, el := range res.Elements {
		if el.Fracture < 0 {
			continue
		}
		f, ok := byFracture[el.Fracture]
		if !ok {
			fr := net.Fractures[el.Fracture]
			f = &FractureResult{Fracture: el.Fracture, Set: fr.Set, SetName: net.SetName(fr.Set),
				Dip: fr.Dip, DipDirection: fr.DipDirection, Height: el.Height,
				FirstSlip: math.NaN(), FirstSlipStage: -1}
			byFracture[el.Fracture] = f
			order = append(order, el.Fracture)
		}
		f.Elements++
		f.TraceLength += el.Length
		f.MaxSlip = math.Max(f.MaxSlip, res.Slip[i])
		f.MeanSlip += res.Slip[i] * el.Length
		f.MeanAperture += res.Aperture[i] * el.Length
		f.InitialAperture += res.InitialAperture[i] * el.Length
		f.RetainedAperture += res.InitialAperture[i] * ap.DilationFactor(res.Slip[i]) * el.Length
		f.MaxPermeabilityGain = math.Max(f.MaxPermeabilityGain, mechanics.PermeabilityGain(res.Aperture[i], res.InitialAperture[i]))
		if t := res.FirstSlip[i]; !math.IsNaN(t) && (math.IsNaN(f.FirstSlip) || t < f.FirstSlip) {
			f.FirstSlip, f.FirstSlipStage = t, res.FirstSlipStage[i]
		}
		if res.Stimulated[i] {
			f.StimulatedLength += el.Length
		}
	}
	out := make([]FractureResult, 0, len(order))
	for _, id := range order {
		f := byFracture[id]
		f.MeanSlip /= f.TraceLength
		f.MeanAperture /= f.TraceLength
		f.InitialAperture /= f.TraceLength
		f.RetainedAperture /= f.TraceLength
		f.PermeabilityGain = mechanics.PermeabilityGain(f.MeanAperture, f.InitialAperture)
		f.RetainedPermeabilityGain = mechanics.PermeabilityGain(f.RetainedAperture, f.InitialAperture)
		out = append(out, *f)
	}
	return out, nil
}

// WriteFractures writes fractures.csv (FracturesTable): one row per
// fracture crossing the layer.
func WriteFractures(w io.Writer, s *scenarios.Scenario, net *dfn.Network, res *Result) error {
	cw := csvw.NewWriter(w, &FracturesTable)
	order := s.PumpingOrder()
	fractures, err := Fractures(s, net, res)
	if err != nil {
		return err
	}
	for _, f := range fractures {
		cw.Write([]string{
			strconv.Itoa(f.Fracture), strconv.Itoa(f.Set), f.SetName,
			num(f.Dip*180/math.Pi, 3), num(f.DipDirection*180/math.Pi, 3), num(f.TraceLength, 3), num(f.Height, 3),
			strconv.Itoa(f.Elements), num(f.MaxSlip*1e3, 6), num(f.MeanSlip*1e3, 6),
			num(f.InitialAperture*1e3, 6), num(f.MeanAperture*1e3, 6), num(f.PermeabilityGain, 4), num(f.MaxPermeabilityGain, 4),
			num(f.RetainedAperture*1e3, 6), num(f.RetainedPermeabilityGain, 4),
			num(f.FirstSlip, 3), scenarios.StageNameAt(order, f.FirstSlipStage), num(f.StimulatedLength, 3),
		})
	}
	return cw.Flush()
}

// summaryJSON is the layout of summary.json.
type summaryJSON struct {
	Program     string         `json:"program"`
	Caution     string         `json:"caution"`
	Scenario    string         `json:"scenario"`
	Digest      string         `json:"scenario_digest"`
	Seed        uint64         `json:"seed"`
	Realization int            `json:"realization"`
	NetworkHash string         `json:"network_digest"`
	Start       string         `json:"schedule_start_utc"`
	Totals      totalsJSON     `json:"totals"`
	Stages      []stageJSON    `json:"stages"`
	Warnings    []warningJSON  `json:"warnings"`
	Numerics    numericsJSON   `json:"numerics"`
	Depletion   *depletionJSON `json:"depletion,omitempty"`
	Growth      *GrowthSummary `json:"growth,omitempty"`
	Rate        *rateJSON      `json:"seismicity_rate,omitempty"`
	Failure     *string        `json:"failure,omitempty"`
}

// depletionJSON is the production before the stimulation, its inputs and
// what it left, in summary.json.
type depletionJSON struct {
	Wells                []string  `json:"parent_wells"`
	DurationS            float64   `json:"production_time_s"`
	PeriodsS             []float64 `json:"period_durations_s"`
	BottomholeMPa        []float64 `json:"period_bottomhole_pressures_MPa"`
	FractureHalfLengthM  float64   `json:"fracture_half_length_m"`
	CellSizeM            float64   `json:"cell_size_m"`
	ProducedM3           float64   `json:"produced_volume_m3"`
	MaxDepletionMPa      float64   `json:"largest_pore_pressure_drop_MPa"`
	MaxHorizontalDropMPa float64   `json:"largest_mean_horizontal_stress_drop_MPa"`
	MaxRotationDeg       float64   `json:"largest_shmax_rotation_deg"`
	CriticalChangeMinMPa float64   `json:"least_critical_pressure_change_min_MPa"`
	CriticalChangeMaxMPa float64   `json:"least_critical_pressure_change_max_MPa"`
}

// rateJSON is the catalogue of the seismicity-rate model, in
// summary.json.
type rateJSON struct {
	rateCountJSON
	MaxMagnitude *float64 `json:"max_magnitude_Mw"`
	MinMagnitude float64  `json:"min_magnitude_Mw"`
}

// rateCountJSON counts the sub-resolution events of a run or of a stage.
type rateCountJSON struct {
	Events   int     `json:"events"`
	Expected float64 `json:"expected_events"`
}

// newRateJSON summarises the rate catalogue (nil without the model).
func newRateJSON(s *scenarios.Scenario, res *Result) *rateJSON {
	if !s.SeismicityRate.Active() {
		return nil
	}
	return &rateJSON{rateCountJSON: rateCountJSON{Events: len(res.RateEvents), Expected: res.RateExpected},
		MaxMagnitude: optional(MaxMagnitude(res.RateEvents)), MinMagnitude: s.SeismicityRate.MinMagnitude}
}

// GrowthSummary is what the growing fractures of a run did, as
// summary.json holds it ("growth").
type GrowthSummary struct {
	// Fractures counts the growing conduits.
	Fractures int `json:"growing_fractures"`
	// MeanHalfLength and LargestHalfLength of their opened parts, m.
	MeanHalfLength    float64 `json:"mean_half_length_m"`
	LargestHalfLength float64 `json:"largest_half_length_m"`
	// Crossings counts the meetings with natural fractures by outcome
	// ("cross", "arrest", "divert"), and the re-initiations at their ends
	// (Reinitiated).
	Crossings map[string]int `json:"crossings"`
	// BranchLength is the opened length of the re-initiated branches, m.
	BranchLength float64 `json:"reinitiated_length_m"`
	// PathPasses are the turns of every run that set the paths
	// (Result.PathPasses), the last one's last; absent for straight paths.
	PathPasses []PathPassJSON `json:"path_passes,omitempty"`
}

// PathPassJSON is a PathPass in summary.json: degrees and metres.
type PathPassJSON struct {
	Advances  int     `json:"advances"`
	MaxTurn   float64 `json:"max_turn_deg"`
	RMSTurn   float64 `json:"rms_turn_deg"`
	MaxOffset float64 `json:"max_offset_m"`
}

// Paths says how far the paths turned and how well the last pass agrees
// with the directions its tips met, for people; "" for straight paths.
func (g *GrowthSummary) Paths() string {
	if len(g.PathPasses) == 0 {
		return ""
	}
	last := g.PathPasses[len(g.PathPasses)-1]
	return fmt.Sprintf("turned up to %.1f m off the local SHmax through their clusters; in the last of %d passes the tips met directions %.2g° rms and %.2g° at most from the paths",
		last.MaxOffset, len(g.PathPasses), last.RMSTurn, last.MaxTurn)
}

// HalfLengths says how long the growing fractures became, for people.
func (g *GrowthSummary) HalfLengths() string {
	return fmt.Sprintf("half-length mean %.0f m, largest %.0f m", g.MeanHalfLength, g.LargestHalfLength)
}

// Meetings counts the meetings with natural fractures by outcome, for
// people.
func (g *GrowthSummary) Meetings() string {
	s := fmt.Sprintf("%d crossed, %d arrested, %d diverted", g.Crossings["cross"], g.Crossings["arrest"], g.Crossings["divert"])
	if n := g.Crossings[Reinitiated]; n > 0 {
		s += fmt.Sprintf("; re-initiated %d× at their ends, %.0f m grown", n, g.BranchLength)
	}
	return s
}

// summarizeGrowth summarises the growth of a run (nil when nothing grows,
// and for a replayed result): the opened half-length of the growing
// conduits and the meetings by outcome.
func summarizeGrowth(s *scenarios.Scenario, res *Result) *GrowthSummary {
	if !Grows(s) || res.ConduitHalfLengths == nil {
		return nil
	}
	order := s.PumpingOrder()
	out := &GrowthSummary{Crossings: map[string]int{"cross": 0, "arrest": 0, "divert": 0, Reinitiated: 0}}
	half := res.ConduitHalfLengths
	var sum float64
	for c, cd := range res.Conduits {
		if !s.Wells[order[cd.Stage].Well].Grows() {
			continue
		}
		if cd.IsBranch() {
			out.BranchLength += 2 * half[c]
			continue
		}
		out.Fractures++
		sum += half[c]
		out.LargestHalfLength = math.Max(out.LargestHalfLength, half[c])
	}
	if out.Fractures > 0 {
		out.MeanHalfLength = sum / float64(out.Fractures)
	}
	for _, p := range res.PathPasses {
		out.PathPasses = append(out.PathPasses, PathPassJSON{Advances: p.Advances,
			MaxTurn: p.MaxTurn * 180 / math.Pi, RMSTurn: p.RMSTurn * 180 / math.Pi, MaxOffset: p.MaxOffset})
	}
	for _, c := range res.Crossings {
		out.Crossings[c.Outcome]++
	}
	return out
}

// newDepletionJSON summarises d (nil for none).
func newDepletionJSON(s *scenarios.Scenario, d *Depletion) *depletionJSON {
	if d == nil {
		return nil
	}
	dp := s.Depletion
	out := &depletionJSON{Wells: dp.Wells, DurationS: dp.ProductionTime(),
		PeriodsS: []float64{dp.Duration}, BottomholeMPa: []float64{dp.BottomholePressure / 1e6},
		FractureHalfLengthM: dp.FractureHalfLength, CellSizeM: dp.CellSize, ProducedM3: d.Produced,
		CriticalChangeMinMPa: math.Inf(1), CriticalChangeMaxMPa: math.Inf(-1)}
	for _, p := range dp.Periods {
		out.PeriodsS = append(out.PeriodsS, p.Duration)
		out.BottomholeMPa = append(out.BottomholeMPa, p.BottomholePressure/1e6)
	}
	for k, c := range d.Change {
		out.MaxDepletionMPa = math.Max(out.MaxDepletionMPa, -c.Pore/1e6)
		out.MaxHorizontalDropMPa = math.Max(out.MaxHorizontalDropMPa, -(c.XX+c.YY)/2e6)
		out.MaxRotationDeg = math.Max(out.MaxRotationDeg, math.Abs(d.Rotation[k])*180/math.Pi)
		out.CriticalChangeMinMPa = math.Min(out.CriticalChangeMinMPa, d.CriticalChange[k]/1e6)
		out.CriticalChangeMaxMPa = math.Max(out.CriticalChangeMaxMPa, d.CriticalChange[k]/1e6)
	}
	return out
}

type totalsJSON struct {
	DurationS          float64  `json:"duration_s"`
	InjectedM3         float64  `json:"injected_volume_m3"`
	LeakedM3           float64  `json:"leaked_volume_m3"`
	StimulatedAreaM2   float64  `json:"stimulated_area_m2"`
	StimulatedReachM   float64  `json:"stimulated_reach_m"`
	FractureAreaM2     float64  `json:"stimulated_fracture_area_m2"`
	StimulatedVolumeM3 float64  `json:"stimulated_volume_m3"`
	Events             int      `json:"events"`
	MaxMagnitude       *float64 `json:"max_magnitude_Mw"`
	SeismicMomentNm    float64  `json:"seismic_moment_Nm"`
	AseismicMomentNm   float64  `json:"aseismic_moment_Nm"`
	PinnedCrossings    int      `json:"pinned_crossings"`
	McGarrBoundNm      float64  `json:"mcgarr_bound_Nm"`
	GainStimulated     *float64 `json:"permeability_gain_stimulated"`
	RetainedStimulated *float64 `json:"retained_permeability_gain_stimulated"`
	Completeness       *float64 `json:"magnitude_of_completeness_Mw"`
	BValue             *float64 `json:"b_value"`
	BValueError        *float64 `json:"b_value_error"`
	BValueEvents       int      `json:"b_value_events"`
	PeakBHPMPa         float64  `json:"peak_bhp_MPa"`
	MassBalanceError   float64  `json:"mass_balance_relative_error"`
}

type stageJSON struct {
	Name         string   `json:"name"`
	StartS       float64  `json:"start_s"`
	PumpEndS     float64  `json:"pump_end_s"`
	EndS         float64  `json:"end_s"`
	InjectedM3   float64  `json:"injected_volume_m3"`
	PeakBHPMPa   float64  `json:"peak_bhp_MPa"`
	NewAreaM2    float64  `json:"new_stimulated_area_m2"`
	Events       int      `json:"events"`
	MaxMagnitude *float64 `json:"max_magnitude_Mw"`
	Capped       bool     `json:"pressure_cap_reached"`
	Steps        int      `json:"time_steps"`
	// ClusterVolumes: the volume each perforation cluster took, m³.
	ClusterVolumes []float64 `json:"cluster_injected_volumes_m3,omitempty"`
	// Held*: fluid held at the end of pumping above the start of the run.
	HeldNaturalM3  float64 `json:"held_in_natural_fractures_m3"`
	HeldConduitsM3 float64 `json:"held_in_conduits_m3"`
	// SeismicityRate: the stage's sub-resolution events, with the model.
	SeismicityRate *rateCountJSON `json:"seismicity_rate,omitempty"`
}

// warningJSON is one Warning in summary.json.
type warningJSON struct {
	Kind    string `json:"kind"`
	Stage   string `json:"stage"`
	Message string `json:"message"`
}

type numericsJSON struct {
	Elements      int    `json:"elements"`
	Conduits      int    `json:"conduits"`
	Solver        string `json:"linear_solver"`
	FactorEntries int    `json:"cholesky_factor_entries"`
	Steps         int    `json:"time_steps"`
	CutSteps      int    `json:"repeated_steps"`
}

func optional(v float64) *float64 {
	if math.IsNaN(v) {
		return nil
	}
	return &v
}

// StimulatedGains returns the permeability gains of the stimulated
// fracture elements (conduits left out) taken together, at the end of the
// run and retained at the initial pore pressure and stress:
// (Σ L·e / Σ L·e_init)² with e the final or the retained aperture
// (FractureResult). Both are NaN when no element was stimulated.
func StimulatedGains(s *scenarios.Scenario, res *Result) (end, retained float64, err error) {
	ap, err := mechanics.ApertureFromScenario(s.Rock)
	if err != nil {
		return 0, 0, err
	}
	var sumInit, sumEnd, sumRetained float64
	for i, el := range res.Elements {
		if el.Fracture < 0 || !res.Stimulated[i] {
			continue
		}
		sumInit += el.Length * res.InitialAperture[i]
		sumEnd += el.Length * res.Aperture[i]
		sumRetained += el.Length * res.InitialAperture[i] * ap.DilationFactor(res.Slip[i])
	}
	if sumInit == 0 {
		return math.NaN(), math.NaN(), nil
	}
	return mechanics.PermeabilityGain(sumEnd, sumInit), mechanics.PermeabilityGain(sumRetained, sumInit), nil
}

// WriteSummary writes summary.json; failure, when not nil, is recorded as
// the reason the run stopped early.
func WriteSummary(w io.Writer, s *scenarios.Scenario, net *dfn.Network, res *Result, failure error) error {
	maxMw := MaxMagnitude(res.Events)
	sj := summaryJSON{
		Program: "slipfront " + version.Version, Caution: Caution, Scenario: s.Name, Digest: s.Digest,
		Seed: s.Seed, Realization: net.Realization, NetworkHash: net.Digest(), Start: s.Schedule.Start,
		Totals: totalsJSON{
			DurationS: res.Duration, InjectedM3: res.Injected, LeakedM3: res.Leaked,
			StimulatedAreaM2: res.StimulatedArea, StimulatedReachM: s.Numerics.StimulatedReach, FractureAreaM2: res.FractureArea, StimulatedVolumeM3: res.StimulatedVolume,
			Events: len(res.Events), MaxMagnitude: optional(maxMw), PeakBHPMPa: res.PeakBHP / 1e6,
			SeismicMomentNm: res.SeismicMoment, AseismicMomentNm: res.AseismicMoment, PinnedCrossings: res.PinnedCrossings,
			McGarrBoundNm:    mechanics.MaxInducedMoment(s.Rock.ShearModulus, res.Injected),
			MassBalanceError: res.MassBalanceError,
		},
		Warnings:  []warningJSON{},
		Depletion: newDepletionJSON(s, res.Depletion),
		Growth:    summarizeGrowth(s, res),
		Rate:      newRateJSON(s, res),
		Numerics: numericsJSON{Elements: len(res.Elements), Conduits: len(res.Conduits), Solver: res.Solver,
			FactorEntries: res.FactorEntries, Steps: res.Steps, CutSteps: res.CutSteps},
	}
	if end, retained, err := StimulatedGains(s, res); err != nil {
		return err
	} else if !math.IsNaN(end) {
		sj.Totals.GainStimulated, sj.Totals.RetainedStimulated = &end, &retained
	}
	mags := make([]float64, len(res.Events))
	for i, e := range res.Events {
		mags[i] = e.Magnitude
	}
	if mc, b, err := mechanics.FitCatalogue(mags); err == nil {
		sj.Totals.Completeness, sj.Totals.BValue, sj.Totals.BValueError = &mc, &b.B, &b.ShiBoltError
		sj.Totals.BValueEvents = b.Events
	}
	for _, w := range res.Warnings {
		sj.Warnings = append(sj.Warnings, warningJSON{Kind: w.Kind, Stage: w.Stage, Message: w.Message})
	}
	for _, st := range res.Stages {
		sj.Stages = append(sj.Stages, stageJSON{
			Name: st.Name, StartS: st.Start, PumpEndS: st.PumpEnd, EndS: st.End, InjectedM3: st.Injected,
			PeakBHPMPa: st.PeakBHP / 1e6, NewAreaM2: st.NewArea, Events: st.Events,
			MaxMagnitude: optional(st.MaxMagnitude), Capped: st.Capped, Steps: st.Steps,
			ClusterVolumes: st.ClusterVolumes, HeldNaturalM3: st.HeldNatural, HeldConduitsM3: st.HeldConduits,
		})
		if s.SeismicityRate.Active() {
			sj.Stages[len(sj.Stages)-1].SeismicityRate = &rateCountJSON{Events: st.RateEvents, Expected: st.RateExpected}
		}
	}
	if failure != nil {
		msg := failure.Error()
		sj.Failure = &msg
	}
	enc := json.NewEncoder(w)
	enc.SetIndent("", "  ")
	return enc.Encode(sj)
}

// WriteStageTable prints the per-stage summary of a run of s for people
// (warnings are the caller's to print).
func WriteStageTable(w io.Writer, s *scenarios.Scenario, res *Result) error {
	var b strings.Builder
	fmt.Fprintf(&b, "%-10s %12s %14s %16s %8s %9s\n", "stage", "injected m3", "peak BHP MPa", "new area m2", "events", "max Mw")
	for _, st := range res.Stages {
		mw := "-"
		if !math.IsNaN(st.MaxMagnitude) {
			mw = fmt.Sprintf("%.2f", st.MaxMagnitude)
		}
		fmt.Fprintf(&b, "%-10s %12.4g %14.2f %16.0f %8d %9s\n", st.Name, st.Injected, st.PeakBHP/1e6, st.NewArea, st.Events, mw)
	}
	fmt.Fprintf(&b, "total: %.4g m3 injected, stimulated area %.0f m2 (fracture surface %.0f m2), %s, peak BHP %.2f MPa\n",
		res.Injected, res.StimulatedArea, res.FractureArea, plural.S(len(res.Events), "event"), res.PeakBHP/1e6)
	fmt.Fprintf(&b, "slip moment: %.3g N·m seismic (the events), %.3g N·m aseismic", res.SeismicMoment, res.AseismicMoment)
	if res.PinnedCrossings > 0 {
		fmt.Fprintf(&b, " (held down where %s pinned: see README, Convergence)", plural.Count(res.PinnedCrossings, "crossing is", "crossings are"))
	}
	b.WriteString("\n")
	if g := summarizeGrowth(s, res); g != nil && len(res.Stages) > 0 {
		last := res.Stages[len(res.Stages)-1]
		fmt.Fprintf(&b, "growth: %s, %s; meetings with natural fractures: %s\n", plural.S(g.Fractures, "fracture"), g.HalfLengths(), g.Meetings())
		if paths := g.Paths(); paths != "" {
			fmt.Fprintf(&b, "growth: paths %s\n", paths)
		}
		fmt.Fprintf(&b, "fluid at the end of pumping: %.4g m3 in the conduits, %.3g m3 in the natural fractures; %.4g m3 leaked off in the whole run\n",
			last.HeldConduits, last.HeldNatural, res.Leaked)
	}
	if res.RateExpected > 0 { // a [seismicity_rate] table
		largest := math.Inf(-1)
		for _, e := range res.RateEvents {
			largest = max(largest, e.Magnitude)
		}
		fmt.Fprintf(&b, "sub-resolution events (seismicity-rate model): %d drawn, %.4g expected", len(res.RateEvents), res.RateExpected)
		if len(res.RateEvents) > 0 {
			fmt.Fprintf(&b, ", largest Mw %.2f", largest)
		}
		if len(res.Stages) > 1 {
			byStage := make([]string, len(res.Stages))
			for k, st := range res.Stages {
				byStage[k] = fmt.Sprintf("%s %d", st.Name, st.RateEvents)
			}
			fmt.Fprintf(&b, "; drawn by stage: %s", strings.Join(byStage, ", "))
		}
		b.WriteString("\n")
	}
	_, err := io.WriteString(w, b.String())
	return err
}
