package snapshot_test

import (
	"bytes"
	"fmt"
	"log"
	"os"

	"slipfront/snapshot"
)

// A run writes its header once, a frame at each output time, and closes
// the writer; inspection reads any frame back by time.
func Example() {
	h := snapshot.Header{
		Digest:         "4b1f0c3a",
		Seed:           7,
		CRS:            "EPSG:32614",
		OriginEasting:  500000,
		OriginNorthing: 3600000,
		LayerDepth:     2600,
		Metadata:       map[string]string{"program": "slipfront (example)"},
		Elements: []snapshot.Element{
			{Fracture: 0, X0: 0, Y0: 0, X1: 2, Y1: 0, Height: 30, Length: 2},
			{Fracture: 0, X0: 2, Y0: 0, X1: 4, Y1: 0, Height: 30, Length: 2},
		},
		Fields: []snapshot.Field{
			{Name: snapshot.FieldPressure, Unit: "Pa"},
			{Name: snapshot.FieldAperture, Unit: "m"},
			{Name: snapshot.FieldSlip, Unit: "m"},
		},
	}
	var file bytes.Buffer // an *os.File in a real run
	w, err := snapshot.NewWriter(&file, h)
	if err != nil {
		log.Fatal(err)
	}
	for i, t := range []float64{0, 600, 1200} {
		dp := float32(i) * 2e6 // pressure increase, Pa
		f := snapshot.Frame{
			Time:  t,
			Stage: 0,
			Fields: [][]float32{
				{26e6 + dp, 26e6 + dp/2}, // pressure, Pa
				{1e-4, 1e-4},             // aperture, m
				{float32(i) * 5e-4, 0},   // slip, m
			},
			Flags: []byte{0, 0},
		}
		if i > 0 {
			f.Flags[0] = snapshot.FlagSlipping | snapshot.FlagSlipped
		}
		if err := w.WriteFrame(f); err != nil {
			log.Fatal(err)
		}
	}
	if err := w.Close(); err != nil {
		log.Fatal(err)
	}

	r, err := snapshot.NewReader(bytes.NewReader(file.Bytes()), int64(file.Len()))
	if err != nil {
		log.Fatal(err)
	}
	defer r.Close()
	fmt.Println("frames:", len(r.Frames()), "recovered:", r.Recovered())
	if err := snapshot.WriteFrameCSV(os.Stdout, r, 900); err != nil { // the frame at 600 s
		log.Fatal(err)
	}
	// Output:
	// frames: 3 recovered: false
	// element_id,fracture_id,x0_m,y0_m,x1_m,y1_m,pressure_MPa,aperture_mm,slip_mm,coulomb_change_MPa,state
	// 0,0,0,0,2,0,28,0.1,0.5,,3
	// 1,0,2,0,4,0,27,0.1,0,,0
}
