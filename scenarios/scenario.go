package scenarios

// Scenario is one validated scenario with every quantity in SI units
// (m, s, Pa, Pa·s, 1/Pa, m³, m³/s) and every angle in radians.
//
// The struct tags drive decoding, defaults, validation and the annotated
// template:
//
//	toml:    the key in the file
//	unit:    the kind of quantity the value must carry (see units.go); empty
//	         for plain numbers, strings and lists
//	default: the value used when the key is absent; a field with no default
//	         tag is required (unless it is optional, marked by opt:"")
//	range:   the allowed interval in SI units (angles in degrees), written
//	         as in mathematics: "(0,inf)", "[0,0.5)"; or a list of allowed
//	         words: "disc|rectangle"
//	doc:     one line for the template
//	when:    the value is read only when a sibling key has one of some
//	         values ("distribution=lognormal|exponential") or is positive
//	         ("conduit_half_length>0"); see UsedDigest
type Scenario struct {
	Name string `toml:"name" doc:"scenario name, shown in reports" example:"Demo scenario"`
	Seed uint64 `toml:"seed" default:"1" range:"[0,inf)" doc:"seed of every random draw (with realization index and purpose)"`

	Domain         Domain           `toml:"domain"`
	Layer          Layer            `toml:"layer"`
	Stress         Stress           `toml:"stress"`
	Rock           Rock             `toml:"rock"`
	Sets           []FractureSet    `toml:"sets" doc:"natural fracture sets, known statistically"`
	KnownFractures KnownFractures   `toml:"known_fractures"`
	Wells          []Well           `toml:"wells" doc:"horizontal wells with stages and perforation clusters"`
	Fluids         map[string]Fluid `toml:"fluids" doc:"fluids by name, referenced by the schedule"`
	Schedule       Schedule         `toml:"schedule"`
	Numerics       Numerics         `toml:"numerics"`
	Coulomb        Coulomb          `toml:"coulomb"`
	// Matrix is optional: absent, fluid leaks off (if at all) by the
	// fluids' Carter coefficients, and nothing can drain before the
	// stimulation.
	Matrix Matrix `toml:"matrix" opt:"" json:",omitzero" doc:"optional: the layer's rock matrix, into which the fractures leak off by pressure diffusion (instead of Carter coefficients) and through which parent wells deplete the layer ([depletion])"`
	// SeismicityRate is optional: absent, the catalogue holds the ruptures
	// alone.
	SeismicityRate SeismicityRate `toml:"seismicity_rate" opt:"" json:",omitzero" doc:"optional: sub-resolution events from the Coulomb stress history of every element (Dieterich 1994), a catalogue of its own beside the ruptures"`
	// Depletion is optional: absent, nothing produced before the
	// stimulation and the scenario's digest is what it was before the
	// table existed.
	Depletion Depletion `toml:"depletion" opt:"" json:",omitzero" doc:"optional: production from parent wells before the stimulation (refrac and child-well studies)"`

	// Source is the file the scenario was read from (for messages); not a key.
	Source string `toml:"-"`
	// Digest is the SHA-256 of the canonical SI content, hex; not a key.
	Digest string `toml:"-"`
	// Warnings name what the scenario holds but no run uses (a fluid no
	// stage pumps), each with its file, line and key; not a key.
	Warnings []string `toml:"-" json:"-"`
}

// Domain is the map area of interest in local East-North coordinates and
// its place on a projected map.
type Domain struct {
	XMin float64 `toml:"x_min" unit:"length" range:"[-1e7,1e7]" doc:"west edge of the map area (local east coordinate)" example:"-1000 m"`
	XMax float64 `toml:"x_max" unit:"length" range:"[-1e7,1e7]" doc:"east edge of the map area" example:"1000 m"`
	YMin float64 `toml:"y_min" unit:"length" range:"[-1e7,1e7]" doc:"south edge of the map area (local north coordinate)" example:"-1000 m"`
	YMax float64 `toml:"y_max" unit:"length" range:"[-1e7,1e7]" doc:"north edge of the map area" example:"1000 m"`
	// CRS is "EPSG:<code>" of a projected CRS the gis package knows
	// (gis.ParseCRS), or "" for an undefined Cartesian frame or when
	// CRSWKT names the CRS.
	CRS string `toml:"crs" default:"" doc:"projected CRS of the origin as \"EPSG:<code>\": UTM (\"EPSG:32614\"), US State Plane (\"EPSG:2277\", in US survey feet) and other transverse Mercator or Lambert conic CRSs on WGS 84, NAD83 or NAD27; empty for an undefined local frame"`
	// CRSWKT is a file holding the projected CRS as WKT (WKT1 or WKT2),
	// relative to the scenario file; "" for none. Exclusive with CRS.
	CRSWKT string `toml:"crs_wkt" default:"" json:",omitempty" doc:"file with the projected CRS as WKT (WKT1 or WKT2, e.g. a .prj), relative to this file; instead of crs, for any projected CRS"`
	// CRSDefinition is the text of CRSWKT on one line, read with the
	// scenario; not a key.
	CRSDefinition string `toml:"-" json:",omitempty"`
	// OriginEasting and OriginNorthing place local (0, 0) in the CRS, m.
	// They are lengths with a unit; the CRS's own unit is used on output,
	// so "2300000 ftUS" in a US survey foot CRS lands on 2300000 exactly
	// ("ft" is the international foot, 2 ppm shorter).
	OriginEasting  float64 `toml:"origin_easting" unit:"length" range:"[-1e8,1e8]" default:"0 m" doc:"easting of local (0,0) in the CRS, with a unit: write \"ftUS\" for US survey feet (\"ft\" is the international foot)"`
	OriginNorthing float64 `toml:"origin_northing" unit:"length" range:"[-1e8,1e8]" default:"0 m" doc:"northing of local (0,0) in the CRS, with a unit"`
}

// CRSSpec returns the CRS as gis.ParseCRS reads it: domain.crs, the WKT
// text of domain.crs_wkt, or "" for an undefined local frame.
func (d Domain) CRSSpec() string {
	if d.CRSDefinition != "" {
		return d.CRSDefinition
	}
	return d.CRS
}

// Layer is the simulated reservoir interval.
type Layer struct {
	// Depth is the true vertical depth of the layer mid-plane, m.
	Depth float64 `toml:"depth" unit:"length" range:"[10,15000]" doc:"true vertical depth of the layer mid-plane" example:"2600 m"`
	// Thickness of the layer, m.
	Thickness float64 `toml:"thickness" unit:"length" range:"[0.1,2000]" doc:"layer thickness" example:"40 m"`
}

// Stress is the in-situ stress state, as gradients from the surface.
// Stress is compression-positive.
type Stress struct {
	SvGradient           float64 `toml:"sv_gradient" unit:"gradient" range:"[1000,100000]" doc:"vertical stress gradient" example:"25 kPa/m"`
	SHmaxGradient        float64 `toml:"shmax_gradient" unit:"gradient" range:"[1000,100000]" doc:"maximum horizontal stress gradient" example:"27 kPa/m"`
	ShminGradient        float64 `toml:"shmin_gradient" unit:"gradient" range:"[1000,100000]" doc:"minimum horizontal stress gradient" example:"19 kPa/m"`
	PorePressureGradient float64 `toml:"pore_pressure_gradient" unit:"gradient" range:"[0,100000]" doc:"initial pore-pressure gradient" example:"11 kPa/m"`
	// SHmaxAzimuth, radians clockwise from north.
	SHmaxAzimuth float64 `toml:"shmax_azimuth" unit:"azimuth" range:"[0,360]" doc:"azimuth of SHmax, e.g. \"N75E\" or \"75 deg\"" example:"N75E"`
}

// Rock holds the elastic, frictional and aperture properties shared by all
// natural fractures.
type Rock struct {
	ShearModulus     float64 `toml:"shear_modulus" unit:"pressure" range:"[1e8,2e11]" default:"15 GPa" doc:"shear modulus G"`
	PoissonRatio     float64 `toml:"poisson_ratio" range:"(0,0.5)" default:"0.25" doc:"Poisson's ratio"`
	FrictionStatic   float64 `toml:"friction_static" range:"(0,2]" default:"0.6" doc:"static friction coefficient (slip onset)"`
	FrictionResidual float64 `toml:"friction_residual" range:"(0,2]" default:"0.5" doc:"residual friction coefficient (after slip); at most friction_static"`
	Cohesion         float64 `toml:"cohesion" unit:"pressure" range:"[0,1e8]" default:"0 MPa" doc:"cohesion of the fracture surfaces"`
	// ZeroStressAperture is e0 of Willis-Richards et al. (1996), m.
	ZeroStressAperture float64 `toml:"zero_stress_aperture" unit:"length" range:"[1e-7,0.01]" default:"0.5 mm" doc:"aperture at zero effective normal stress and no slip (e0)"`
	// ClosureStress is σn,ref: the effective normal stress that closes a
	// fracture to 1/10 of e0, Pa.
	ClosureStress float64 `toml:"closure_stress" unit:"pressure" range:"[1e4,1e20]" default:"20 MPa" doc:"effective normal stress that closes a fracture to 1/10 of e0"`
	// DilationAngle φ_dil, radians.
	DilationAngle float64 `toml:"dilation_angle" unit:"angle" range:"[0,90)" default:"2.5 deg" doc:"shear dilation angle"`
	// DilationSlipLimit D_max: slip beyond it adds no dilation, m.
	DilationSlipLimit float64 `toml:"dilation_slip_limit" unit:"length" range:"[0,1]" default:"5 mm" doc:"slip beyond which shear dilation stops growing"`
	// FractureToughness K_Ic of the rock, Pa·√m: a growing fracture's tip
	// advances where the stress intensity reaches it.
	FractureToughness float64 `toml:"fracture_toughness" unit:"toughness" range:"[0,1e8]" default:"1 MPa.m^0.5" doc:"mode-I fracture toughness K_Ic of the rock (growing fractures)"`
	// TensileStrength T0 of the rock, Pa: it decides whether a growing
	// fracture crosses a natural one.
	TensileStrength float64 `toml:"tensile_strength" unit:"pressure" range:"[0,1e9]" default:"5 MPa" doc:"tensile strength of the rock (whether a growing fracture crosses a natural one)"`
	// SlipWeakeningDistance Dc: slip over which friction falls from
	// friction_static to friction_residual, m.
	SlipWeakeningDistance float64 `toml:"slip_weakening_distance" unit:"length" range:"[1e-6,1]" default:"1 mm" doc:"slip over which friction falls from static to residual (slip-weakening distance Dc)"`
}

// FractureSet is the statistical description of one natural fracture set.
type FractureSet struct {
	Name string `toml:"name" doc:"set name" example:"NE set"`
	// Shape is "disc" (size = radius) or "rectangle" (size = length along
	// strike; height down dip = length × aspect ratio).
	Shape       string  `toml:"shape" default:"disc" range:"disc|rectangle" doc:"fracture shape: disc (size is the radius) or rectangle (size is the strike length)"`
	AspectRatio float64 `toml:"aspect_ratio" when:"shape=rectangle" default:"1" range:"[0.01,100]" doc:"rectangles: down-dip height / strike length"`

	Orientation Orientation `toml:"orientation"`
	Size        Size        `toml:"size"`
	Intensity   Intensity   `toml:"intensity"`
}

// Orientation is the pole distribution of a set.
type Orientation struct {
	// Distribution is "fisher", "uniform" or "fixed".
	Distribution string `toml:"distribution" default:"fisher" range:"fisher|uniform|fixed" doc:"pole distribution: fisher about the mean pole, uniform on the sphere, or fixed"`
	// Dip and DipDirection of the mean plane, radians.
	Dip          float64 `toml:"dip" when:"distribution=fisher|fixed" unit:"angle" range:"[0,90]" default:"90 deg" doc:"dip of the mean plane"`
	DipDirection float64 `toml:"dip_direction" when:"distribution=fisher|fixed" unit:"azimuth" range:"[0,360]" default:"0 deg" doc:"dip direction of the mean plane, clockwise from north"`
	// Kappa is the Fisher concentration (fisher only).
	Kappa float64 `toml:"kappa" when:"distribution=fisher" range:"(0,1e6]" default:"20" doc:"Fisher concentration κ (fisher only)"`
}

// Size is the fracture size distribution of a set, m.
type Size struct {
	// Distribution is "constant", "power_law", "lognormal" or "exponential".
	Distribution string `toml:"distribution" default:"power_law" range:"constant|power_law|lognormal|exponential" doc:"size law"`
	// Value is the size of a constant law, m.
	Value float64 `toml:"value" when:"distribution=constant" unit:"length" range:"[0.01,1e5]" default:"50 m" doc:"constant: the size"`
	// Min and Max bound the truncated power law, m.
	Min float64 `toml:"min" when:"distribution=power_law" unit:"length" range:"[0.01,1e5]" default:"20 m" doc:"power_law: smallest size"`
	Max float64 `toml:"max" when:"distribution=power_law" unit:"length" range:"[0.01,1e5]" default:"200 m" doc:"power_law: largest size"`
	// Exponent D of the power law's complementary CDF, P(R > r) ∝ r^-D.
	Exponent float64 `toml:"exponent" when:"distribution=power_law" range:"[0.1,10]" default:"2.5" doc:"power_law: exponent D of P(size > r) ∝ r^-D (density exponent D+1)"`
	// Mean and StdDev of the size for lognormal and exponential laws, m.
	Mean   float64 `toml:"mean" when:"distribution=lognormal|exponential" unit:"length" range:"[0.01,1e5]" default:"50 m" doc:"lognormal, exponential: mean size"`
	StdDev float64 `toml:"std_dev" when:"distribution=lognormal" unit:"length" range:"[0.001,1e5]" default:"20 m" doc:"lognormal: standard deviation of the size"`
}

// Intensity is how many fractures a set has.
type Intensity struct {
	// Measure is "p32", "p10" or "count".
	Measure string `toml:"measure" default:"p32" range:"p32|p10|count" doc:"intensity given as p32 (area per volume), p10 (count per length along a line) or count"`
	// P32 target, fracture area per rock volume, 1/m.
	P32 float64 `toml:"p32" when:"measure=p32" unit:"intensity" range:"(0,100]" default:"0.01 1/m" doc:"p32: fracture area per unit volume"`
	// P10 measured along a line of the given trend and plunge, 1/m.
	P10 float64 `toml:"p10" when:"measure=p10" unit:"intensity" range:"(0,100]" default:"0.01 1/m" doc:"p10: fractures per unit length of the measuring line"`
	// LineTrend and LinePlunge orient the P10 line, radians.
	LineTrend  float64 `toml:"line_trend" when:"measure=p10" unit:"azimuth" range:"[0,360]" default:"90 deg" doc:"p10: trend of the measuring line (a well lateral or scanline)"`
	LinePlunge float64 `toml:"line_plunge" when:"measure=p10" unit:"angle" range:"[-90,90]" default:"0 deg" doc:"p10: plunge of the measuring line, positive down"`
	// Count of the set's fractures that can reach the map × layer volume.
	Count int `toml:"count" when:"measure=count" range:"[1,1e8]" default:"100" doc:"count: number of the set's fractures that can reach the map area and layer"`
}

// KnownFractures points to mapped faults or fractures added as they are.
type KnownFractures struct {
	// File is a CSV path relative to the scenario file; "" for none.
	File string `toml:"file" default:"" doc:"CSV of mapped fractures, relative to this file (see README for columns)"`
	// Fractures are the rows of File.
	Fractures []KnownFracture `toml:"-"`
}

// KnownFracture is one mapped rectangular fracture or fault.
type KnownFracture struct {
	Name string
	// Centre in local coordinates: X east, Y north, m; Depth TVD, m.
	X, Y, Depth float64
	// Dip and DipDirection, radians.
	Dip, DipDirection float64
	// Length along strike and Height down dip, m.
	Length, Height float64
	// Line is the CSV line the fracture came from.
	Line int
}

// Point is a point of a well path: X east and Y north in local metres,
// Depth true vertical depth in metres.
type Point struct {
	X, Y, Depth float64
}

// Well is a well path in map view with its stages.
type Well struct {
	Name string `toml:"name" doc:"well name" example:"A"`
	// Path is the well path from the landing point (heel) to the toe.
	Path []Point `toml:"path" unit:"length" doc:"path points [x, y, depth] from heel to toe" example:"[[\"-600 m\", \"-150 m\", \"2600 m\"], [\"600 m\", \"-150 m\", \"2600 m\"]]"`
	// PerforationReach: a cluster connects to fractures the well path
	// crosses within this distance of it along the path, m.
	PerforationReach float64 `toml:"perforation_reach" unit:"length" range:"(0,1000]" default:"5 m" doc:"a cluster feeds fractures the well crosses within this distance along the path"`
	// ConduitHalfLength of the optional primary conduit from each cluster,
	// striking along SHmax; 0 for none, m.
	ConduitHalfLength float64 `toml:"conduit_half_length" unit:"length" range:"[0,5000]" default:"0 m" doc:"half-length of a primary conduit from each cluster along SHmax; 0 for none"`
	// ConduitAperture of the primary conduit, m.
	ConduitAperture float64 `toml:"conduit_aperture" when:"conduit_half_length>0" unit:"length" range:"[1e-7,0.1]" default:"1 mm" doc:"hydraulic aperture of the primary conduits"`
	// ConduitHeight is the conducting height of the conduits, m (0 = the
	// layer thickness).
	ConduitHeight float64 `toml:"conduit_height" when:"conduit_half_length>0" unit:"length" range:"[0,2000]" default:"0 m" doc:"conducting height of the primary conduits; 0 for the layer thickness"`
	// Growth is "off" (the conduits exist whole from the start) or "on"
	// (each grows from InitialHalfLength by linear elastic fracture
	// mechanics, up to ConduitHalfLength).
	Growth string `toml:"growth" when:"conduit_half_length>0" default:"off" range:"off|on" doc:"off: the primary conduits exist whole from the start; on: each grows from initial_half_length where its tips reach rock.fracture_toughness, up to conduit_half_length"`
	// InitialHalfLength of a growing conduit, m: the part open (with the
	// propped conduit_aperture) before pumping.
	InitialHalfLength float64 `toml:"initial_half_length" when:"conduit_half_length>0" unit:"length" range:"(0,5000]" default:"5 m" doc:"growth on: half-length of each conduit before pumping (the breakdown zone, with conduit_aperture)"`
	// Reinitiation is "on" (a fracture stopped at a natural fracture may
	// start again at that fracture's ends) or "off" (it stays stopped).
	Reinitiation string  `toml:"reinitiation" when:"growth=on" default:"on" range:"off|on" doc:"growth on: on lets a fracture stopped at a natural fracture (arrested or diverted) start again at that fracture's ends once the fluid opens it there (branches are meshed before the run wherever that could happen, which adds elements and run time); off keeps it stopped"`
	Stages       []Stage `toml:"stages" doc:"stages in pumping order along the well (toe first)"`
}

// Stage is a group of perforation clusters pumped together. Optional fields
// left nil take the schedule's value.
type Stage struct {
	Name string `toml:"name" doc:"stage name, unique within the well" example:"1"`
	// Clusters are positions along the well path measured from its first
	// point, m.
	Clusters    []float64 `toml:"clusters" unit:"length" doc:"cluster positions along the path from its first point" example:"[\"1100 m\", \"1120 m\", \"1140 m\"]"`
	Fluid       *string   `toml:"fluid" opt:"" doc:"overrides schedule.fluid"`
	Rate        *float64  `toml:"rate" unit:"rate" range:"(0,10]" opt:"" doc:"overrides schedule.rate"`
	Volume      *float64  `toml:"volume" unit:"volume" range:"[0,1e6]" opt:"" doc:"overrides schedule.volume"`
	Duration    *float64  `toml:"duration" unit:"time" range:"[0,1e8]" opt:"" doc:"overrides schedule.duration"`
	PressureCap *float64  `toml:"pressure_cap" unit:"pressure" range:"(0,1e9]" opt:"" doc:"overrides schedule.pressure_cap"`
	// Limited entry of the stage's clusters; nil: the schedule's.
	Perforations         *int     `toml:"perforations" range:"[0,1000]" opt:"" doc:"overrides schedule.perforations (per cluster)"`
	PerforationDiameter  *float64 `toml:"perforation_diameter" unit:"length" range:"[0.001,0.1]" opt:"" doc:"overrides schedule.perforation_diameter"`
	DischargeCoefficient *float64 `toml:"discharge_coefficient" range:"(0,1]" opt:"" doc:"overrides schedule.discharge_coefficient"`
}

// Fluid is an injected fluid (Newtonian, slightly compressible).
type Fluid struct {
	Viscosity       float64 `toml:"viscosity" unit:"viscosity" range:"[1e-5,1e3]" doc:"dynamic viscosity" example:"1 cP"`
	Compressibility float64 `toml:"compressibility" unit:"compressibility" range:"[1e-12,1e-6]" default:"4.5e-10 1/Pa" doc:"isothermal compressibility"`
	// Density ρ at the reference pressure, kg/m³: it sets the orifice
	// pressure drop of limited entry.
	Density float64 `toml:"density" unit:"density" range:"[100,3000]" default:"1000 kg/m3" doc:"density (the perforations' pressure drop of limited entry grows with it)"`
	// LeakoffCoefficient is Carter's C_L, m/√s; 0 for none.
	LeakoffCoefficient float64 `toml:"leakoff_coefficient" unit:"leakoff" range:"[0,0.01]" default:"0 m/s^0.5" doc:"Carter leak-off coefficient into the matrix; 0 for none"`
}

// Schedule is the pumping schedule: the order of stages and their defaults.
type Schedule struct {
	// Start is the UTC start time, RFC 3339.
	Start string `toml:"start" default:"2030-01-01T00:00:00Z" doc:"start of pumping, UTC (RFC 3339), for event times"`
	// Order is "sequential", "zipper" or "list".
	Order string `toml:"order" default:"sequential" range:"sequential|zipper|list" doc:"sequential (each well toe to heel in turn), zipper (alternate wells), or list"`
	// Sequence names the stages as "WELL:STAGE" when Order is "list".
	Sequence []string `toml:"sequence" default:"[]" doc:"stage order as \"WELL:STAGE\" names when order = \"list\""`
	// Control is "rate" (with a pressure cap) or "pressure".
	Control string `toml:"control" default:"rate" range:"rate|pressure" doc:"rate control (capped by pressure_cap) or pressure control"`
	Fluid   string `toml:"fluid" doc:"default fluid of every stage" example:"slickwater"`
	// Rate is the total stage rate, m³/s.
	Rate float64 `toml:"rate" unit:"rate" range:"(0,10]" default:"10 bbl/min" doc:"default total stage rate"`
	// Volume per stage, m³; 0 means the duration governs.
	Volume float64 `toml:"volume" unit:"volume" range:"[0,1e6]" default:"0 m3" doc:"default stage volume; 0 means the duration ends the stage" example:"2000 bbl"`
	// Duration per stage, s; 0 means the volume governs.
	Duration float64 `toml:"duration" unit:"time" range:"[0,1e8]" default:"0 s" doc:"default stage duration; 0 means the volume ends the stage"`
	// PressureCap on bottom-hole pressure, Pa.
	PressureCap float64 `toml:"pressure_cap" unit:"pressure" range:"(0,1e9]" default:"100 MPa" doc:"bottom-hole pressure cap; injection switches to pressure control at it"`
	// InjectionPressure for pressure control, Pa.
	InjectionPressure float64 `toml:"injection_pressure" when:"control=pressure" unit:"pressure" range:"(0,1e9]" default:"50 MPa" doc:"bottom-hole pressure under pressure control"`
	// ShutIn after each stage, s.
	ShutIn float64 `toml:"shut_in" unit:"time" range:"[0,1e8]" default:"30 min" doc:"shut-in after each stage"`
	// Perforations per cluster: the open holes through which each
	// cluster's fluid passes (limited entry); 0 for open clusters.
	Perforations int `toml:"perforations" range:"[0,1000]" default:"0" doc:"default open perforations per cluster (limited entry: the clusters share the rate through the holes' pressure drop); 0 for clusters open to the fractures"`
	// PerforationDiameter of each entry hole, m.
	PerforationDiameter float64 `toml:"perforation_diameter" unit:"length" range:"[0.001,0.1]" default:"0.4 in" doc:"default entry-hole diameter of a perforation"`
	// DischargeCoefficient C_d of the perforations.
	DischargeCoefficient float64 `toml:"discharge_coefficient" range:"(0,1]" default:"0.8" doc:"default orifice discharge coefficient of the perforations (about 0.6 for sharp new holes, towards 0.9 once eroded)"`
}

// Numerics are discretisation and solver settings.
type Numerics struct {
	ElementLength   float64 `toml:"element_length" unit:"length" range:"[0.01,1e4]" default:"10 m" doc:"longest flow element along a trace"`
	TimeStepInitial float64 `toml:"time_step_initial" unit:"time" range:"[1e-6,1e6]" default:"1 s" doc:"first time step of each stage"`
	TimeStepMin     float64 `toml:"time_step_min" unit:"time" range:"[1e-6,1e6]" default:"0.001 s" doc:"smallest time step before the run fails"`
	TimeStepMax     float64 `toml:"time_step_max" unit:"time" range:"[1e-6,1e6]" default:"300 s" doc:"largest time step"`
	// PressureChangeMax per step, Pa.
	PressureChangeMax float64 `toml:"pressure_change_max" unit:"pressure" range:"[1e3,1e9]" default:"2 MPa" doc:"largest pressure change of any element in one step"`
	// SlipMax per step, m.
	SlipMax float64 `toml:"slip_max" unit:"length" range:"[1e-7,1]" default:"2 mm" doc:"largest new slip of any element in one step"`
	// CouplingTolerance τ ends the flow–mechanics iterations of a step:
	// relative aperture change ≤ τ, pressure change ≤ τ·10 kPa and
	// mass-balance error ≤ 1e-6·τ of the fluid moved.
	CouplingTolerance     float64 `toml:"coupling_tolerance" range:"(0,1)" default:"1e-4" doc:"tolerance of the flow-mechanics iterations: relative aperture change, pressure change (times 10 kPa) and mass-balance error (times 1e-6) that end them"`
	CouplingMaxIterations int     `toml:"coupling_max_iterations" range:"[2,1000]" default:"30" doc:"flow-mechanics iterations before the step is cut"`
	LinearTolerance       float64 `toml:"linear_tolerance" range:"(0,1)" default:"1e-10" doc:"relative residual of the iterative linear solver"`
	// Solver is "auto", "cholesky", "pcg-jacobi" or "pcg-ic0".
	Solver string `toml:"solver" default:"auto" range:"auto|cholesky|pcg-jacobi|pcg-ic0" doc:"linear solver: auto picks sparse Cholesky unless the system is too large to factor"`
	// OutputInterval between snapshot frames and timeline rows, s.
	OutputInterval float64 `toml:"output_interval" unit:"time" range:"[0.001,1e8]" default:"5 min" doc:"time between snapshot frames and timeline rows (each at the end of the first time step at or after its output time; output times never shorten steps)"`
	// CellSize of the map grid of pictures, rasters and probability maps,
	// m. No headline number depends on it.
	CellSize float64 `toml:"cell_size" unit:"length" range:"[0.01,1e4]" default:"10 m" doc:"map cell size of the pictures, rasters and probability maps"`
	// StimulatedSlip is the cumulative slip above which an element counts
	// as stimulated, m.
	StimulatedSlip float64 `toml:"stimulated_slip" unit:"length" range:"[1e-9,1]" default:"0.1 mm" doc:"cumulative slip above which an element counts as stimulated"`
	// StimulatedReach is the map distance around stimulated fracture
	// elements that counts as stimulated area, m.
	StimulatedReach float64 `toml:"stimulated_reach" unit:"length" range:"[0.1,1e4]" default:"5 m" doc:"map distance around stimulated fracture elements counted as stimulated area (the area is exact; cell_size does not enter it)"`
	// MaxFractures caps the generated fractures per realization.
	// MaxSteps bounds the accepted time steps of a run.
	MaxSteps     int `toml:"max_steps" range:"[1,1e9]" default:"1000000" doc:"refuse schedules that need more time steps than this, and stop a run that takes more"`
	MaxFractures int `toml:"max_fractures" range:"[1,1e8]" default:"2000000" doc:"refuse scenarios that would generate more fractures than this"`
	// Interaction is "on" (every element loads every other through the
	// boundary-element operator) or "off" (each element feels only its own
	// slip: isolated elements, for comparison).
	Interaction string `toml:"interaction" default:"on" range:"on|off" doc:"elastic interaction between fracture elements: on (stress shadows), or off (each element alone, for comparison)"`
	// HeightCorrection is "on" (Olson's finite-height factor on every
	// interaction, so fractures of the layer's height behave as 3-D ones)
	// or "off" (plane strain: infinitely tall fractures).
	HeightCorrection string `toml:"height_correction" when:"interaction=on" default:"on" range:"on|off" doc:"finite-height correction of the elastic interaction (Olson 2004): on, or off for plane strain"`
	// InteractionTolerance is the relative accuracy of the compressed
	// far-field blocks of the interaction operator.
	InteractionTolerance float64 `toml:"interaction_tolerance" when:"interaction=on" range:"[1e-7,0.1]" default:"1e-6" doc:"relative accuracy of the compressed far-field blocks of the interaction operator"`
	// Crossings is "coupled" (pairs of touching elements where fractures
	// cross kept where the contact problem stays well posed with them,
	// the rest detached; mechanics.ContactSettings.CoupleCrossings), or
	// "detached" (every such pair loads its two elements' own stiffness
	// instead of each other: always well posed, but it pins the slip
	// there).
	Crossings string `toml:"crossings" when:"interaction=on" default:"coupled" range:"detached|coupled" doc:"the touching elements where fractures cross: coupled (kept where the contact problem stays well posed with them, the rest detached) or detached (their coupling added to their own stiffness; always well posed, but pins the slip there, so the moment is a lower bound)"`
	// PathPasses is the number of runs that set the paths of growing
	// fractures: the first meshes them straight along the local SHmax at
	// their clusters, each next one through the directions of SHmax, with
	// the other fractures' stress shadows, that the tips of the one before
	// met; only the last writes outputs.
	PathPasses int `toml:"path_passes" when:"interaction=on" range:"[1,10]" default:"1" doc:"runs that set the paths of growing fractures: 1 keeps them straight along the local SHmax at their clusters; each further run meshes them along the SHmax, with the other fractures' stress shadows, that the tips met in the run before (so the paths turn), and multiplies the run time"`
}

// Coulomb sets the receiver planes of the Coulomb stress change that a run
// reports: the map stress_change.tif and each element's coulomb_change in
// the snapshot, ΔCFS = Δτ − μ′·Δσn.
type Coulomb struct {
	// Receiver is "optimal" (the vertical plane best oriented for
	// right-lateral slip under SHmax at the effective friction) or
	// "strike" (ReceiverStrike and ReceiverSense).
	Receiver string `toml:"receiver" default:"optimal" range:"optimal|strike" doc:"receiver planes of stress_change.tif: optimal (the vertical plane best oriented for right-lateral slip under SHmax at effective_friction) or strike (receiver_strike and receiver_sense)"`
	// ReceiverStrike, radians clockwise from north.
	ReceiverStrike float64 `toml:"receiver_strike" when:"receiver=strike" unit:"azimuth" range:"[0,360]" default:"0 deg" doc:"strike of the vertical receiver planes, e.g. \"N30W\" or \"330 deg\""`
	ReceiverSense  string  `toml:"receiver_sense" when:"receiver=strike" default:"right-lateral" range:"right-lateral|left-lateral" doc:"sense of slip of the receiver planes"`
	// EffectiveFriction μ′ absorbs the pore-pressure change (King, Stein
	// & Lin 1994).
	EffectiveFriction float64 `toml:"effective_friction" range:"[0,1.5]" default:"0.4" doc:"effective friction of the Coulomb stress change (0.4 is a usual choice)"`
}

// Matrix is the rock matrix of the layer between the fractures.
type Matrix struct {
	// Permeability k, m².
	Permeability float64 `toml:"permeability" unit:"permeability" range:"[1e-24,1e-10]" doc:"matrix permeability (with any natural fractures too small to be in the network, upscaled)" example:"100 nD"`
	// Porosity φ.
	Porosity float64 `toml:"porosity" range:"(0,1)" default:"0.06" doc:"matrix porosity"`
	// TotalCompressibility c_t of pore fluid and pore volume, 1/Pa.
	TotalCompressibility float64 `toml:"total_compressibility" unit:"compressibility" range:"[1e-12,1e-6]" default:"2 1/GPa" doc:"total compressibility of the matrix's pore fluid and pore volume"`
	// Viscosity of the fluid in the matrix pores, Pa·s.
	Viscosity float64 `toml:"viscosity" unit:"viscosity" range:"[1e-5,1e3]" default:"0.3 cP" doc:"viscosity of the fluid in the matrix pores (and of the fluid parent wells produce)"`
	// HalfWidth is the distance from a fracture face to the no-flow plane
	// between parallel fractures, m; 0 for a matrix without end.
	HalfWidth float64 `toml:"half_width" unit:"length" range:"[0,1e4]" default:"0 m" doc:"leak-off: distance from a fracture face to the no-flow plane between parallel fractures (half their spacing); 0 for a matrix without end"`
}

// Present reports whether the scenario has a [matrix] table.
func (m Matrix) Present() bool { return m.Permeability > 0 }

// Depletion is production from parent wells before the stimulation. Each
// cluster of a parent well's stages produced through a propped fracture
// along SHmax, held at the flowing bottom-hole pressure for the production
// time; the pore pressure of the layer around them falls by diffusion
// through the [matrix], and the stresses change with it
// (poroelastically). The stimulation then starts from that depleted
// state.
type Depletion struct {
	// Wells names the parent wells among [[wells]].
	Wells []string `toml:"wells" doc:"names of the wells in [[wells]] that produced before the stimulation; each cluster of their stages produced through a fracture along SHmax" example:"[\"A\"]"`
	// FractureHalfLength of the producing fracture of each parent cluster,
	// m.
	FractureHalfLength float64 `toml:"fracture_half_length" unit:"length" range:"(0,5000]" default:"100 m" doc:"half-length of the producing fracture of each parent cluster, along SHmax"`
	// BottomholePressure is the flowing bottom-hole pressure of the
	// parents during production, Pa.
	BottomholePressure float64 `toml:"bottomhole_pressure" unit:"pressure" range:"[0,1e9]" doc:"flowing bottom-hole pressure of the parent wells during production (at most the initial pore pressure)" example:"15 MPa"`
	// Duration of the production before the stimulation, s.
	Duration float64 `toml:"duration" unit:"time" range:"[0,1e10]" doc:"production time before the stimulation; 0 for none" example:"2 yr"`
	// Biot is Biot's effective-stress coefficient α.
	Biot float64 `toml:"biot" range:"(0,1]" default:"1" doc:"Biot's effective-stress coefficient α of the stress path α(1-2ν)/(1-ν)"`
	// CellSize of the depletion and stress-change grid, m: a numerical
	// setting (results converge as it shrinks; see the README).
	CellSize float64 `toml:"cell_size" unit:"length" range:"[0.1,1e4]" default:"10 m" doc:"cell size of the depletion and stress-change grid over the map area (numerics: results converge as it shrinks)"`
	// Periods follow the first period (BottomholePressure for
	// Duration), each at its own bottom-hole pressure.
	Periods []ProductionPeriod `toml:"periods" doc:"optional: later production periods, in order, each at its own bottom-hole pressure (a history)"`
	// TimeSteps of the production period.
	TimeSteps int `toml:"time_steps" range:"[1,100000]" default:"60" doc:"implicit time steps of the production, shared out by the periods' durations, equal within each (numerics)"`
}

// ProductionPeriod is a later period of a parent well's production
// history.
type ProductionPeriod struct {
	Duration           float64 `toml:"duration" unit:"time" range:"[0,1e10]" doc:"length of the period" example:"180 d"`
	BottomholePressure float64 `toml:"bottomhole_pressure" unit:"pressure" range:"[0,1e9]" doc:"flowing bottom-hole pressure during the period (at most the initial pore pressure)" example:"10 MPa"`
}

// ProductionTime is the whole production time, s: the first period and
// every later one.
func (d Depletion) ProductionTime() float64 {
	t := d.Duration
	for _, p := range d.Periods {
		t += p.Duration
	}
	return t
}

// Active reports whether the scenario produces from parent wells before
// the stimulation: a [depletion] table with a positive production time.
func (d Depletion) Active() bool { return len(d.Wells) > 0 && d.ProductionTime() > 0 }

// SeismicityRate is the seismicity-rate model of Dieterich (1994) run on
// every fracture element: a population of small faults, too small to
// mesh, whose rate of events follows the element's Coulomb stress
// history (mechanics.SeismicityRate), with Gutenberg–Richter magnitudes.
type SeismicityRate struct {
	// BackgroundRate is the rate of events at or above MinMagnitude per
	// km² of fracture surface per year under the background stressing.
	BackgroundRate float64 `toml:"background_rate_per_km2_yr" range:"(0,1e6]" doc:"background rate of events at or above min_magnitude, per km² of fracture surface and per year" example:"50"`
	// BackgroundStressingRate τ̇_r, Pa/s.
	BackgroundStressingRate float64 `toml:"background_stressing_rate" unit:"stressing rate" range:"(0,1]" default:"1 kPa/yr" doc:"background (tectonic) Coulomb stressing rate under which the background rate holds"`
	// ASigma is Aσ, Pa.
	ASigma float64 `toml:"a_sigma" unit:"pressure" range:"(0,1e8]" default:"0.05 MPa" doc:"rate-and-state A times the effective normal stress (Aσ): how strongly the rate answers a stress change"`
	BValue float64 `toml:"b_value" range:"(0,3]" default:"1" doc:"Gutenberg-Richter b-value of the sampled magnitudes"`
	// MinMagnitude and MaxMagnitude bound the sampled magnitudes.
	MinMagnitude float64 `toml:"min_magnitude" range:"[-10,10]" default:"-2" doc:"smallest sampled magnitude Mw (the background rate counts events at or above it)"`
	MaxMagnitude float64 `toml:"max_magnitude" range:"[-10,10]" default:"0" doc:"largest sampled magnitude Mw: the sub-resolution events stay below the ruptures the mesh resolves"`
}

// Active reports whether the scenario has a [seismicity_rate] table.
func (r SeismicityRate) Active() bool { return r.BackgroundRate > 0 }
