package dfn

import (
	"fmt"
	"math"

	"slipfront/scenarios"
)

// Region is the counting volume: the map rectangle × the layer.
type Region struct {
	// XMin, XMax, YMin, YMax bound the map rectangle, local metres.
	XMin, XMax, YMin, YMax float64
	// MidZ is the z of the layer mid-plane (−depth), m.
	MidZ float64
	// Thickness of the layer, m.
	Thickness float64
}

// NewRegion returns the counting volume of a scenario's domain and layer.
func NewRegion(d scenarios.Domain, l scenarios.Layer) (Region, error) {
	finite := func(v ...float64) bool {
		for _, x := range v {
			if math.IsNaN(x) || math.IsInf(x, 0) {
				return false
			}
		}
		return true
	}
	if !finite(d.XMin, d.XMax, d.YMin, d.YMax, l.Depth, l.Thickness) {
		return Region{}, fmt.Errorf("dfn: domain and layer values must be finite")
	}
	if !(d.XMax > d.XMin) {
		return Region{}, fmt.Errorf("dfn: domain.x_max = %g m: must exceed domain.x_min = %g m", d.XMax, d.XMin)
	}
	if !(d.YMax > d.YMin) {
		return Region{}, fmt.Errorf("dfn: domain.y_max = %g m: must exceed domain.y_min = %g m", d.YMax, d.YMin)
	}
	if !(l.Thickness > 0) {
		return Region{}, fmt.Errorf("dfn: layer.thickness = %g m: must be > 0", l.Thickness)
	}
	return Region{XMin: d.XMin, XMax: d.XMax, YMin: d.YMin, YMax: d.YMax, MidZ: -l.Depth, Thickness: l.Thickness}, nil
}

// ZMin and ZMax bound the layer, m.
func (r Region) ZMin() float64 { return r.MidZ - r.Thickness/2 }

// ZMax is the top of the layer, m.
func (r Region) ZMax() float64 { return r.MidZ + r.Thickness/2 }

// MapArea returns the area of the map rectangle, m².
func (r Region) MapArea() float64 { return (r.XMax - r.XMin) * (r.YMax - r.YMin) }

// Volume returns the counting volume, m³.
func (r Region) Volume() float64 { return r.MapArea() * r.Thickness }

// sides returns the edge lengths of the counting volume, m.
func (r Region) sides() [3]float64 {
	return [3]float64{r.XMax - r.XMin, r.YMax - r.YMin, r.Thickness}
}
