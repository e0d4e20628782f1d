package dfn

import (
	"crypto/sha256"
	"encoding/binary"
	"encoding/hex"
	"hash"
	"math"
)

// digestVersion starts the digested bytes; change it when the layout
// below changes.
const digestVersion = "slipfront/dfn/network/v1"

// Digest returns the hex SHA-256 of the network's canonical bytes: the
// version string, then seed and realization, then each list (fractures,
// traces, intersections, well crossings) as its length followed by every
// record's fields in declaration order, integers as int64 and floats as
// their IEEE-754 bits, all little endian; strings as their length and
// bytes. Two networks have the same digest exactly when they hold the same
// numbers, so it checks common random numbers across runs.
func (n *Network) Digest() string {
	d := digester{h: sha256.New()}
	d.str(digestVersion)
	d.u64(n.Seed)
	d.int(n.Realization)
	d.int(len(n.Fractures))
	for i := range n.Fractures {
		f := &n.Fractures[i]
		d.int(f.Set)
		d.str(f.Name)
		d.int(int(f.Shape))
		d.f64(f.Centre.X, f.Centre.Y, f.Centre.Z, f.Normal.X, f.Normal.Y, f.Normal.Z,
			f.Dip, f.DipDirection, f.Size, f.Height, f.Area)
	}
	d.int(len(n.Traces))
	for i := range n.Traces {
		t := &n.Traces[i]
		d.int(t.Fracture)
		d.int(t.Set)
		d.f64(t.P0.X, t.P0.Y, t.P1.X, t.P1.Y, t.Length, t.Height)
		d.int(t.Cluster)
	}
	d.int(len(n.Intersections))
	for _, x := range n.Intersections {
		d.int(x.I)
		d.int(x.J)
		d.f64(x.Point.X, x.Point.Y, x.SI, x.SJ)
	}
	d.int(len(n.WellCrossings))
	for _, c := range n.WellCrossings {
		d.int(c.Well)
		d.int(c.Trace)
		d.f64(c.Distance, c.Point.X, c.Point.Y)
	}
	return hex.EncodeToString(d.h.Sum(nil))
}

type digester struct {
	h   hash.Hash
	buf [8]byte
}

func (d *digester) u64(v uint64) {
	binary.LittleEndian.PutUint64(d.buf[:], v)
	d.h.Write(d.buf[:])
}

func (d *digester) int(v int) { d.u64(uint64(int64(v))) }

func (d *digester) f64(vs ...float64) {
	for _, v := range vs {
		d.u64(math.Float64bits(v))
	}
}

func (d *digester) str(s string) {
	d.int(len(s))
	d.h.Write([]byte(s))
}
