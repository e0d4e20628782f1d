package scenarios

import (
	"bytes"
	"strings"
	"testing"
)

func TestResolvedRoundTrip(t *testing.T) {
	s, err := LoadExample("demo")
	if err != nil {
		t.Fatal(err)
	}
	var b bytes.Buffer
	if err := WriteResolved(&b, s); err != nil {
		t.Fatal(err)
	}
	got, err := ReadResolved(bytes.NewReader(b.Bytes()), "scenario.json")
	if err != nil {
		t.Fatal(err)
	}
	if got.Digest != s.Digest || len(got.KnownFractures.Fractures) != 1 || got.Wells[1].Stages[2].Clusters[0] != s.Wells[1].Stages[2].Clusters[0] {
		t.Errorf("round trip changed the scenario")
	}
	// A changed value is refused.
	bad := strings.Replace(b.String(), `"Seed": 20261201`, `"Seed": 20261202`, 1)
	if bad == b.String() {
		t.Fatal("test bug: seed not found")
	}
	if _, err := ReadResolved(strings.NewReader(bad), "scenario.json"); err == nil || !strings.Contains(err.Error(), "digest") {
		t.Errorf("changed file: %v", err)
	}
}

func FuzzReadResolved(f *testing.F) {
	s, _ := LoadExample("single-fracture")
	var b bytes.Buffer
	WriteResolved(&b, s)
	f.Add(b.Bytes())
	f.Fuzz(func(t *testing.T, data []byte) {
		got, err := ReadResolved(bytes.NewReader(data), "fuzz.json")
		if err != nil {
			return
		}
		if got.Digest != digest(got) {
			t.Fatal("accepted a scenario whose digest does not match")
		}
	})
}
