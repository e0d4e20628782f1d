package scenarios

import (
	"bytes"
	"encoding/json"
	"fmt"
	"strings"
	"testing"
)

func TestResolvedRoundTrip(t *testing.T) {
	s, err := LoadExample("zipper-pad")
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

// The same scenario gives the same resolved bytes whatever path it was
// read from (the shards of a batch, run from other folders, keep the same
// file), and reading names the file read.
func TestResolvedWithoutSource(t *testing.T) {
	s, err := LoadExample("single-fracture")
	if err != nil {
		t.Fatal(err)
	}
	var a, b bytes.Buffer
	for _, w := range []struct {
		source string
		to     *bytes.Buffer
	}{{"single-fracture.toml", &a}, {"/elsewhere/single-fracture.toml", &b}} {
		c := *s
		c.Source = w.source
		if err := WriteResolved(w.to, &c); err != nil {
			t.Fatal(err)
		}
	}
	if !bytes.Equal(a.Bytes(), b.Bytes()) || strings.Contains(a.String(), "single-fracture.toml") {
		t.Errorf("the resolved scenario depends on where it was read from:\n%.300s", a.String())
	}
	got, err := ReadResolved(bytes.NewReader(a.Bytes()), "run/scenario.json")
	if err != nil {
		t.Fatal(err)
	}
	if got.Source != "run/scenario.json" {
		t.Errorf("read back from %q", got.Source)
	}
}

// resolvedSeed returns a small scenario.json: the scenario written as the
// JSON body (only the keys it sets; the others read as zero) under the
// digest of what it decodes to. A large seed (the full zipper pad writes 2.5 kB)
// makes the fuzzer spend its few seconds in CI minimising inputs.
func resolvedSeed(t testing.TB, body string) []byte {
	t.Helper()
	var s Scenario
	if err := json.Unmarshal([]byte(body), &s); err != nil {
		t.Fatal(err)
	}
	seed := fmt.Appendf(nil, `{"digest":%q,"scenario":%s}`, digest(&s), body)
	// The seed must take the accepted path, or the fuzzer starts from a
	// rejected input and the round trip below is never reached.
	if _, err := ReadResolved(bytes.NewReader(seed), "seed.json"); err != nil {
		t.Fatalf("seed refused: %v", err)
	}
	return seed
}

func FuzzReadResolved(f *testing.F) {
	f.Add(resolvedSeed(f, `{"Name":"x","Seed":1}`))
	f.Add(resolvedSeed(f, `{"Name":"w","Wells":[{"Name":"V","Stages":[{"Name":"1","Clusters":[100],"Rate":0.02}]}],"Fluids":{"water":{"Viscosity":0.001}}}`))
	f.Fuzz(func(t *testing.T, data []byte) {
		got, err := ReadResolved(bytes.NewReader(data), "fuzz.json")
		if err != nil {
			return
		}
		if got.Digest != digest(got) {
			t.Fatal("accepted a scenario whose digest does not match")
		}
		// What reads also round-trips: written again, it reads back, and
		// ReadResolved's digest check (SHA-256 of the content read against
		// the digest written) makes that a comparison of the whole content.
		var b bytes.Buffer
		if err := WriteResolved(&b, got); err != nil {
			t.Fatal(err)
		}
		if _, err := ReadResolved(bytes.NewReader(b.Bytes()), "again.json"); err != nil {
			t.Fatalf("written scenario does not read back to the same content: %v", err)
		}
	})
}
