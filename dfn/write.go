package dfn

import (
	"encoding/csv"
	"encoding/json"
	"fmt"
	"io"
	"math"
	"strconv"
	"text/tabwriter"
)

// Column headers of the written files.
var (
	FractureColumns = []string{"id", "set", "set_name", "name", "shape",
		"center_x_m", "center_y_m", "center_z_m", "dip_deg", "dip_direction_deg",
		"size_m", "height_m", "area_m2"}
	TraceColumns = []string{"id", "fracture_id", "set", "x0_m", "y0_m", "x1_m", "y1_m",
		"length_m", "height_m", "cluster"}
)

// fixed formats v with prec decimals ("NaN", "+Inf" for non-finite values).
func fixed(v float64, prec int) string { return strconv.FormatFloat(v, 'f', prec, 64) }

// WriteFractures writes fractures.csv: one row per fracture, with the
// columns FractureColumns. id is the index in Network.Fractures; set is
// the set index (−1 for mapped fractures); lengths in m to 1 mm, angles in
// degrees to 10⁻⁴, area in m² to 10⁻³ m². size_m is the disc radius or the
// rectangle's strike length; height_m the down-dip extent.
func WriteFractures(w io.Writer, n *Network) error {
	cw := csv.NewWriter(w)
	if err := cw.Write(FractureColumns); err != nil {
		return err
	}
	row := make([]string, len(FractureColumns))
	for i := range n.Fractures {
		f := &n.Fractures[i]
		row[0] = strconv.Itoa(i)
		row[1] = strconv.Itoa(f.Set)
		row[2] = n.SetName(f.Set)
		row[3] = f.Name
		row[4] = f.Shape.String()
		row[5] = fixed(f.Centre.X, 3)
		row[6] = fixed(f.Centre.Y, 3)
		row[7] = fixed(f.Centre.Z, 3)
		row[8] = fixed(deg(f.Dip), 4)
		row[9] = fixed(deg(f.DipDirection), 4)
		row[10] = fixed(f.Size, 3)
		row[11] = fixed(f.Height, 3)
		row[12] = fixed(f.Area, 3)
		if err := cw.Write(row); err != nil {
			return err
		}
	}
	cw.Flush()
	return cw.Error()
}

// WriteTraces writes traces.csv: one row per trace, with the columns
// TraceColumns. id is the index in Network.Traces, fracture_id the index
// in Network.Fractures, set the set index (−1 for mapped fractures),
// cluster the index in Network.Clusters; coordinates are local metres to
// 1 mm, height_m is the conducting height.
func WriteTraces(w io.Writer, n *Network) error {
	cw := csv.NewWriter(w)
	if err := cw.Write(TraceColumns); err != nil {
		return err
	}
	row := make([]string, len(TraceColumns))
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
		if err := cw.Write(row); err != nil {
			return err
		}
	}
	cw.Flush()
	return cw.Error()
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
	fmt.Fprintf(w, "%d intersections (%.3g per trace), %d clusters, largest cluster holds %.1f%% of the trace length\n",
		st.Intersections, st.MeanIntersectionsPerTrace, st.Clusters, 100*st.LargestClusterFraction)
	for _, ws := range st.Wells {
		fmt.Fprintf(w, "well %s: %d crossings over %.0f m (P10 %.4g 1/m), %d connected clusters with %d traces\n",
			ws.Name, ws.Crossings, ws.PathLength, ws.P10, ws.ConnectedClusters, ws.ConnectedTraces)
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
