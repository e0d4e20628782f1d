package dfn

import (
	"encoding/json"
	"fmt"
	"io"
	"math"
	"strconv"
	"text/tabwriter"

	"slipfront/internal/csvw"
	"slipfront/internal/plural"
)

// The tables of a generate folder, described for csv-metadata.json
// (package csvw); their URLs are left to the folder's owner.
var (
	FracturesTable = csvw.Table{
		Title:       "fractures",
		Description: "Every fracture of the realization's network, generated and mapped, in 3-D.",
		Columns: []csvw.Column{
			{Title: "fracture_id", Datatype: csvw.Integer, Description: "index of the fracture in the network (fracture_id of every other table)"},
			{Title: "set", Datatype: csvw.Integer, Description: "index of the fracture's set in the scenario; -1 for mapped fractures"},
			{Title: "set_name", Datatype: csvw.String, Description: "name of the set (" + KnownSetName + " for mapped fractures)"},
			{Title: "name", Datatype: csvw.String, Description: "name of a mapped fracture; empty for generated ones"},
			{Title: "shape", Datatype: csvw.String, Description: "disc or rectangle"},
			{Title: "center_x_m", Datatype: csvw.Double, Unit: "m", Description: "centre, local east of the scenario origin"},
			{Title: "center_y_m", Datatype: csvw.Double, Unit: "m", Description: "centre, local north of the scenario origin"},
			{Title: "center_depth_m", Datatype: csvw.Double, Unit: "m", Description: "centre, true vertical depth, positive down"},
			{Title: "dip_deg", Datatype: csvw.Double, Unit: "deg", Description: "dip, 0 to 90"},
			{Title: "dip_direction_deg", Datatype: csvw.Double, Unit: "deg", Description: "dip direction, clockwise from north, 0 to 360"},
			{Title: "size_m", Datatype: csvw.Double, Unit: "m", Description: "disc radius, or the rectangle's length along strike"},
			{Title: "height_m", Datatype: csvw.Double, Unit: "m", Description: "down-dip extent of the fracture (disc: its diameter)"},
			{Title: "area_m2", Datatype: csvw.Double, Unit: "m2", Description: "area of one face of the fracture"},
		},
	}
	TracesTable = csvw.Table{
		Title:       "traces",
		Description: "The traces of the fractures on the layer mid-plane: the map-view segments that carry flow.",
		Columns: []csvw.Column{
			{Title: "trace_id", Datatype: csvw.Integer, Description: "index of the trace in the network"},
			{Title: "fracture_id", Datatype: csvw.Integer, Description: "index of its fracture (fracture_id of fractures.csv)"},
			{Title: "set", Datatype: csvw.Integer, Description: "index of the fracture's set in the scenario; -1 for mapped fractures"},
			{Title: "x0_m", Datatype: csvw.Double, Unit: "m", Description: "first end, local east of the scenario origin"},
			{Title: "y0_m", Datatype: csvw.Double, Unit: "m", Description: "first end, local north"},
			{Title: "x1_m", Datatype: csvw.Double, Unit: "m", Description: "second end, local east"},
			{Title: "y1_m", Datatype: csvw.Double, Unit: "m", Description: "second end, local north"},
			{Title: "trace_length_m", Datatype: csvw.Double, Unit: "m", Description: "length of the trace"},
			{Title: "conducting_height_m", Datatype: csvw.Double, Unit: "m", Description: "conducting height: down-dip length of the fracture inside the layer"},
			{Title: "network_cluster", Datatype: csvw.Integer, Description: "index of the trace's connected cluster (a connected component of the trace-intersection graph)"},
		},
	}
)

// fixed formats v with prec decimals ("NaN", "+Inf" for non-finite values).
func fixed(v float64, prec int) string { return strconv.FormatFloat(v, 'f', prec, 64) }

// WriteFractures writes fractures.csv: one row per fracture, with the
// columns of FracturesTable. fracture_id is the index in
// Network.Fractures; set is the set index (−1 for mapped fractures);
// lengths in m to 1 mm, angles in degrees to 10⁻⁴, area in m² to 10⁻³ m².
// The centre's depth is −z.
func WriteFractures(w io.Writer, n *Network) error {
	cw := csvw.NewWriter(w, &FracturesTable)
	row := make([]string, len(FracturesTable.Columns))
	for i := range n.Fractures {
		f := &n.Fractures[i]
		row[0] = strconv.Itoa(i)
		row[1] = strconv.Itoa(f.Set)
		row[2] = n.SetName(f.Set)
		row[3] = f.Name
		row[4] = f.Shape.String()
		row[5] = fixed(f.Centre.X, 3)
		row[6] = fixed(f.Centre.Y, 3)
		row[7] = fixed(-f.Centre.Z, 3)
		row[8] = fixed(deg(f.Dip), 4)
		row[9] = fixed(deg(f.DipDirection), 4)
		row[10] = fixed(f.Size, 3)
		row[11] = fixed(f.Height, 3)
		row[12] = fixed(f.Area, 3)
		cw.Write(row)
	}
	return cw.Flush()
}

// WriteTraces writes traces.csv: one row per trace, with the columns of
// TracesTable. trace_id is the index in Network.Traces, fracture_id the
// index in Network.Fractures, set the set index (−1 for mapped
// fractures), network_cluster the index in Network.Clusters; coordinates
// are local metres to 1 mm.
func WriteTraces(w io.Writer, n *Network) error {
	cw := csvw.NewWriter(w, &TracesTable)
	row := make([]string, len(TracesTable.Columns))
	for i := range n.Traces {
		t := &n.Traces[i]
		row[0] = strconv.Itoa(i)
		row[1] = strconv.Itoa(t.Fracture)
		row[2] = strconv.Itoa(t.Set)
		row[3] = fixed(t.P0.X, 3)
		row[4] = fixed(t.P0.Y, 3)
		row[5] = fixed(t.P1.X, 3)
		row[6] = fixed(t.P1.Y, 3)
		row[7] = fixed(t.Length, 3)
		row[8] = fixed(t.Height, 3)
		row[9] = strconv.Itoa(t.Cluster)
		cw.Write(row)
	}
	return cw.Flush()
}

// NetworkJSON is the content of network.json. Non-finite numbers are
// written as null.
type NetworkJSON struct {
	Seed                      uint64     `json:"seed"`
	Realization               int        `json:"realization"`
	Digest                    string     `json:"digest"`
	CountingVolume            float64    `json:"counting_volume_m3"`
	MapArea                   float64    `json:"map_area_m2"`
	Fractures                 int        `json:"fractures"`
	Traces                    int        `json:"traces"`
	Intersections             int        `json:"intersections"`
	P32                       *float64   `json:"p32_per_m"`
	P21                       *float64   `json:"p21_per_m"`
	MeanIntersectionsPerTrace *float64   `json:"mean_intersections_per_trace"`
	Clusters                  int        `json:"clusters"`
	LargestClusterFraction    *float64   `json:"largest_cluster_fraction"`
	Sets                      []SetJSON  `json:"sets"`
	Wells                     []WellJSON `json:"wells"`
}

// SetJSON is one set in network.json.
type SetJSON struct {
	Name          string   `json:"name"`
	Index         int      `json:"index"`
	Count         int      `json:"count"`
	Traces        int      `json:"traces"`
	P32Target     *float64 `json:"p32_target_per_m"`
	P32           *float64 `json:"p32_per_m"`
	P21           *float64 `json:"p21_per_m"`
	KappaEstimate *float64 `json:"kappa_estimate"`
}

// WellJSON is one well in network.json.
type WellJSON struct {
	Name              string   `json:"name"`
	PathLength        *float64 `json:"path_length_m"`
	Crossings         int      `json:"crossings"`
	P10               *float64 `json:"p10_per_m"`
	CrossedTraces     int      `json:"crossed_traces"`
	ConnectedClusters int      `json:"connected_clusters"`
	ConnectedTraces   int      `json:"connected_traces"`
	ConnectedLength   *float64 `json:"connected_trace_length_m"`
}

// num returns &v, or nil (JSON null) when v is NaN or infinite.
func num(v float64) *float64 {
	if math.IsNaN(v) || math.IsInf(v, 0) {
		return nil
	}
	return &v
}

// NewNetworkJSON collects network.json's content.
func NewNetworkJSON(n *Network, st NetworkStats) NetworkJSON {
	out := NetworkJSON{
		Seed: n.Seed, Realization: n.Realization, Digest: n.Digest(),
		CountingVolume: n.Region.Volume(), MapArea: n.Region.MapArea(),
		Fractures: st.Fractures, Traces: st.Traces, Intersections: st.Intersections,
		P32: num(st.P32), P21: num(st.P21),
		MeanIntersectionsPerTrace: num(st.MeanIntersectionsPerTrace),
		Clusters:                  st.Clusters, LargestClusterFraction: num(st.LargestClusterFraction),
		Sets: []SetJSON{}, Wells: []WellJSON{},
	}
	for _, s := range st.Sets {
		out.Sets = append(out.Sets, SetJSON{
			Name: s.Name, Index: s.Set, Count: s.Count, Traces: s.Traces,
			P32Target: num(s.P32Target), P32: num(s.P32), P21: num(s.P21),
			KappaEstimate: num(s.KappaEstimate),
		})
	}
	for _, w := range st.Wells {
		out.Wells = append(out.Wells, WellJSON{
			Name: w.Name, PathLength: num(w.PathLength), Crossings: w.Crossings, P10: num(w.P10),
			CrossedTraces: w.CrossedTraces, ConnectedClusters: w.ConnectedClusters,
			ConnectedTraces: w.ConnectedTraces, ConnectedLength: num(w.ConnectedLength),
		})
	}
	return out
}

// WriteNetworkJSON writes network.json (indented, fields in the order of
// NetworkJSON, numbers in Go's shortest round-trip form).
func WriteNetworkJSON(w io.Writer, n *Network, st NetworkStats) error {
	b, err := json.MarshalIndent(NewNetworkJSON(n, st), "", "  ")
	if err != nil {
		return err
	}
	b = append(b, '\n')
	_, err = w.Write(b)
	return err
}

// stickyWriter remembers the first write error.
type stickyWriter struct {
	w   io.Writer
	err error
}

func (s *stickyWriter) Write(p []byte) (int, error) {
	if s.err != nil {
		return 0, s.err
	}
	n, err := s.w.Write(p)
	s.err = err
	return n, err
}

// WriteSummary writes a short human-readable table of the statistics.
func WriteSummary(out io.Writer, n *Network, st NetworkStats) error {
	w := &stickyWriter{w: out}
	tw := tabwriter.NewWriter(w, 0, 0, 2, ' ', tabwriter.AlignRight)
	fmt.Fprintf(tw, "set\tfractures\ttraces\tP32 target 1/m\tP32 1/m\tP21 1/m\tkappa est.\t\n")
	for _, s := range st.Sets {
		fmt.Fprintf(tw, "%s\t%d\t%d\t%s\t%.4g\t%.4g\t%s\t\n", s.Name, s.Count, s.Traces,
			optional(s.P32Target, "%.4g"), s.P32, s.P21, optional(s.KappaEstimate, "%.3g"))
	}
	fmt.Fprintf(tw, "all\t%d\t%d\t-\t%.4g\t%.4g\t-\t\n", st.Fractures, st.Traces, st.P32, st.P21)
	if err := tw.Flush(); err != nil {
		return err
	}
	fmt.Fprintf(w, "%s (%.3g per trace), %s, largest cluster holds %.1f%% of the trace length\n",
		plural.S(st.Intersections, "intersection"), st.MeanIntersectionsPerTrace, plural.S(st.Clusters, "cluster"), 100*st.LargestClusterFraction)
	for _, ws := range st.Wells {
		fmt.Fprintf(w, "well %s: %s over %.0f m (P10 %.4g 1/m), %s with %s\n", ws.Name, plural.S(ws.Crossings, "crossing"),
			ws.PathLength, ws.P10, plural.S(ws.ConnectedClusters, "connected cluster"), plural.S(ws.ConnectedTraces, "trace"))
	}
	return w.err
}

func optional(v float64, format string) string {
	if math.IsNaN(v) || math.IsInf(v, 0) {
		return "-"
	}
	return fmt.Sprintf(format, v)
}

func nan() float64 { return math.NaN() }
