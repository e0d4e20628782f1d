package gis

import (
	"bytes"
	"encoding/xml"
	"errors"
	"math"
	"os"
	"os/exec"
	"path/filepath"
	"regexp"
	"strconv"
	"strings"
	"testing"
	"time"

	"slipfront/internal/numtest"
)

// quakePublicIDRE is the QuakeML 1.2 ResourceIdentifier pattern
// (QuakeML-BED-1.2 schema, gis/testdata/QuakeML-BED-1.2.xsd), anchored.
var quakePublicIDRE = regexp.MustCompile(`^(smi|quakeml):[\w\d][\w\d\-\.\*\(\)_~']{2,}/[\w\d\-\.\*\(\)_~'][\w\d\-\.\*\(\)\+\?_~'=,;#/&]*$`)

// quakeEventTypes is the EventType enumeration of the QuakeML 1.2 BED
// schema (QuakeML-BED-1.2.rng, define "EventType").
var quakeEventTypes = strings.Split("not existing|not reported|earthquake|anthropogenic event|collapse|cavity collapse|mine collapse|building collapse|explosion|accidental explosion|chemical explosion|controlled explosion|experimental explosion|industrial explosion|mining explosion|quarry blast|road cut|blasting levee|nuclear explosion|induced or triggered event|rock burst|reservoir loading|fluid injection|fluid extraction|crash|plane crash|train crash|boat crash|other event|atmospheric event|sonic boom|sonic blast|acoustic noise|thunder|avalanche|snow avalanche|debris avalanche|hydroacoustic event|ice quake|slide|landslide|rockslide|meteorite|volcanic eruption", "|")

// Namespace-aware decoding structures: every name carries its namespace,
// so a wrong namespace fails to match and leaves the field empty.
type qmlTestRoot struct {
	XMLName xml.Name
	EP      *struct {
		XMLName  xml.Name
		PublicID string `xml:"publicID,attr"`
		Comment  []struct {
			Text string `xml:"http://quakeml.org/xmlns/bed/1.2 text"`
		} `xml:"http://quakeml.org/xmlns/bed/1.2 comment"`
		Events []qmlTestEvent `xml:"http://quakeml.org/xmlns/bed/1.2 event"`
	} `xml:"http://quakeml.org/xmlns/bed/1.2 eventParameters"`
}

type qmlTestValue struct {
	Value *string `xml:"http://quakeml.org/xmlns/bed/1.2 value"`
}

type qmlTestEvent struct {
	PublicID             string `xml:"publicID,attr"`
	PreferredOriginID    string `xml:"http://quakeml.org/xmlns/bed/1.2 preferredOriginID"`
	PreferredMagnitudeID string `xml:"http://quakeml.org/xmlns/bed/1.2 preferredMagnitudeID"`
	Type                 string `xml:"http://quakeml.org/xmlns/bed/1.2 type"`
	Origins              []struct {
		PublicID       string        `xml:"publicID,attr"`
		Time           *qmlTestValue `xml:"http://quakeml.org/xmlns/bed/1.2 time"`
		Latitude       *qmlTestValue `xml:"http://quakeml.org/xmlns/bed/1.2 latitude"`
		Longitude      *qmlTestValue `xml:"http://quakeml.org/xmlns/bed/1.2 longitude"`
		Depth          *qmlTestValue `xml:"http://quakeml.org/xmlns/bed/1.2 depth"`
		EvaluationMode string        `xml:"http://quakeml.org/xmlns/bed/1.2 evaluationMode"`
	} `xml:"http://quakeml.org/xmlns/bed/1.2 origin"`
	Magnitudes []struct {
		PublicID       string        `xml:"publicID,attr"`
		Mag            *qmlTestValue `xml:"http://quakeml.org/xmlns/bed/1.2 mag"`
		Type           string        `xml:"http://quakeml.org/xmlns/bed/1.2 type"`
		OriginID       string        `xml:"http://quakeml.org/xmlns/bed/1.2 originID"`
		EvaluationMode string        `xml:"http://quakeml.org/xmlns/bed/1.2 evaluationMode"`
	} `xml:"http://quakeml.org/xmlns/bed/1.2 magnitude"`
}

var quakeStart = time.Date(2030, 1, 1, 0, 0, 0, 0, time.UTC)

func sampleCatalog() Catalog {
	return Catalog{
		ID: "run-0001", Start: quakeStart, Description: "test catalog",
		Events: []Event{
			{Time: 3.25, East: 10, North: -20, Depth: 2500, Magnitude: -1.2},
			{Time: 86400.0000004, East: -1500, North: 800, Depth: 2612.3456, Magnitude: 0.75},
			{Time: 0, Depth: 2400, Magnitude: -2.5},
		},
	}
}

func writeQuakeMLBytes(t *testing.T, pl Placement, c Catalog) []byte {
	t.Helper()
	var buf bytes.Buffer
	if err := WriteQuakeML(&buf, pl, c); err != nil {
		t.Fatal(err)
	}
	return buf.Bytes()
}

func TestQuakeMLStructure(t *testing.T) {
	c := sampleCatalog()
	b := writeQuakeMLBytes(t, samplePlacement, c)
	var doc qmlTestRoot
	if err := xml.Unmarshal(b, &doc); err != nil {
		t.Fatal(err)
	}
	if doc.XMLName.Space != QuakeMLNamespace || doc.XMLName.Local != "quakeml" {
		t.Fatalf("root %v, want {%s quakeml}", doc.XMLName, QuakeMLNamespace)
	}
	if doc.EP == nil {
		t.Fatalf("no eventParameters in the BED namespace:\n%s", b)
	}
	checkPublicID(t, "eventParameters", doc.EP.PublicID)
	if len(doc.EP.Comment) != 1 || !strings.Contains(doc.EP.Comment[0].Text, "SYNTHETIC") {
		t.Errorf("catalog comment %v", doc.EP.Comment)
	}
	if !bytes.Contains(b, []byte("<!-- SYNTHETIC")) {
		t.Errorf("no XML comment marking the events as synthetic")
	}
	if len(doc.EP.Events) != len(c.Events) {
		t.Fatalf("%d events, want %d", len(doc.EP.Events), len(c.Events))
	}
	geo, err := samplePlacement.Geographic()
	if err != nil {
		t.Fatal(err)
	}
	ids := map[string]bool{}
	for k, ev := range doc.EP.Events {
		checkQuakeEvent(t, k, ev, c.Events[k], geo, ids)
	}
}

func checkQuakeEvent(t *testing.T, k int, ev qmlTestEvent, want Event, geo *Geographic, ids map[string]bool) {
	t.Helper()
	if len(ev.Origins) != 1 || len(ev.Magnitudes) != 1 {
		t.Fatalf("event %d: %d origins, %d magnitudes", k, len(ev.Origins), len(ev.Magnitudes))
	}
	o, m := ev.Origins[0], ev.Magnitudes[0]
	for _, id := range []string{ev.PublicID, o.PublicID, m.PublicID} {
		checkPublicID(t, "event "+strconv.Itoa(k), id)
		if ids[id] {
			t.Errorf("publicID %s repeated", id)
		}
		ids[id] = true
	}
	for _, ref := range []string{ev.PreferredOriginID, ev.PreferredMagnitudeID, m.OriginID} {
		checkPublicID(t, "reference", ref)
	}
	if ev.PreferredOriginID != o.PublicID || ev.PreferredMagnitudeID != m.PublicID || m.OriginID != o.PublicID {
		t.Errorf("event %d: references do not match the origin and magnitude IDs", k)
	}
	known := false
	for _, et := range quakeEventTypes {
		known = known || et == ev.Type
	}
	if !known || ev.Type != "induced or triggered event" {
		t.Errorf("event %d: type %q", k, ev.Type)
	}
	if o.EvaluationMode != "automatic" || m.EvaluationMode != "automatic" || m.Type != "Mw" {
		t.Errorf("event %d: evaluation modes %q %q, magnitude type %q", k, o.EvaluationMode, m.EvaluationMode, m.Type)
	}
	// Required quantities: origin time, latitude, longitude; magnitude mag.
	for name, q := range map[string]*qmlTestValue{"time": o.Time, "latitude": o.Latitude, "longitude": o.Longitude, "depth": o.Depth, "mag": m.Mag} {
		if q == nil || q.Value == nil {
			t.Fatalf("event %d: %s/value missing", k, name)
		}
	}
	tm, err := time.Parse(time.RFC3339Nano, *o.Time.Value)
	if err != nil || !strings.HasSuffix(*o.Time.Value, "Z") {
		t.Fatalf("event %d: time %q: %v", k, *o.Time.Value, err)
	}
	// Times are rounded to the microsecond: 0.5 µs tolerance.
	numtest.Abs(t, "event time (s)", tm.Sub(quakeStart).Seconds(), want.Time, 0.5e-6)
	ll := geo.LonLat([2]float64{want.East, want.North})
	number := func(name, v string) float64 {
		t.Helper()
		x, err := strconv.ParseFloat(v, 64)
		if err != nil {
			t.Fatalf("event %d: %s: %v", k, name, err)
		}
		return x
	}
	lat := number("latitude", *o.Latitude.Value)
	lon := number("longitude", *o.Longitude.Value)
	depth := number("depth", *o.Depth.Value)
	mag := number("magnitude", *m.Mag.Value)
	numtest.Abs(t, "latitude", lat, ll[1], 0.5e-9)         // 9 decimals written
	numtest.Abs(t, "longitude", lon, ll[0], 0.5e-9)        // 9 decimals written
	numtest.Abs(t, "depth (m)", depth, want.Depth, 0.5e-3) // 3 decimals written
	numtest.Abs(t, "magnitude", mag, want.Magnitude, 0)
}

func checkPublicID(t *testing.T, what, id string) {
	t.Helper()
	if !quakePublicIDRE.MatchString(id) {
		t.Errorf("%s: publicID %q does not match the QuakeML ResourceIdentifier pattern", what, id)
	}
}

// TestQuakeMLWrongNamespaceDetected makes sure the structural check above
// can fail: a document in another BED namespace decodes without events.
func TestQuakeMLWrongNamespaceDetected(t *testing.T) {
	b := writeQuakeMLBytes(t, samplePlacement, sampleCatalog())
	bad := bytes.ReplaceAll(b, []byte(QuakeMLBEDNamespace), []byte("http://quakeml.org/xmlns/bed/1.2.1"))
	var doc qmlTestRoot
	if err := xml.Unmarshal(bad, &doc); err != nil {
		t.Fatal(err)
	}
	if doc.EP != nil {
		t.Errorf("eventParameters matched in the wrong namespace")
	}
}

func TestQuakeMLErrors(t *testing.T) {
	var buf bytes.Buffer
	c := sampleCatalog()
	if err := WriteQuakeML(&buf, Placement{CRS: CRS{EPSG: 2056}}, c); !errors.Is(err, ErrNoGeographic) || !strings.Contains(err.Error(), "EPSG:2056") {
		t.Errorf("unsupported CRS: %v", err)
	}
	if err := WriteQuakeML(&buf, Placement{CRS: CRS{EPSG: 32039}}, c); !errors.Is(err, ErrNoGeographic) || !strings.Contains(err.Error(), "NAD27 differs") {
		t.Errorf("NAD27: %v", err)
	}
	cases := map[string]func(*Catalog){
		"ID":         func(c *Catalog) { c.ID = "run 1" },
		"start":      func(c *Catalog) { c.Start = time.Time{} },
		"not finite": func(c *Catalog) { c.Events[1].Depth = math.NaN() },
		"beyond":     func(c *Catalog) { c.Events[0].Time = 1e12 },
	}
	for substr, edit := range cases {
		c := sampleCatalog()
		edit(&c)
		if err := WriteQuakeML(&buf, samplePlacement, c); err == nil || !strings.Contains(err.Error(), substr) {
			t.Errorf("%s: error %v", substr, err)
		}
	}
}

// TestQuakeMLXmllint: libxml2 parses the file and finds the events in the
// BED namespace (an XPath count over local-name and namespace-uri).
func TestQuakeMLXmllint(t *testing.T) {
	xmllint := needTool(t, "xmllint")
	path := writeQuakeMLFile(t)
	out := runTool(t, nil, xmllint, "--xpath", `count(/*[local-name()="quakeml" and namespace-uri()="`+QuakeMLNamespace+`"]/*[local-name()="eventParameters" and namespace-uri()="`+QuakeMLBEDNamespace+`"]/*[local-name()="event"])`, path)
	if strings.TrimSpace(out) != "3" {
		t.Errorf("xmllint counted %q events, want 3", out)
	}
}

// quakeMLSchema is the QuakeML 1.2 root schema; it imports the BED schema
// beside it (verbatim copies, see testdata/README.md).
var quakeMLSchema = filepath.Join("testdata", "QuakeML-1.2.xsd")

// TestQuakeMLSchema validates the written file against the QuakeML 1.2
// schemas with libxml2 whenever xmllint is installed (CI installs
// libxml2-utils), and checks that the same validation refuses a wrong
// event type, publicID and namespace, so that a schema that did not load
// or a validation that does nothing cannot pass. The XSD cannot require an
// element inside its unbounded choices (a missing latitude passes it);
// TestQuakeMLStructure checks those.
func TestQuakeMLSchema(t *testing.T) {
	xmllint := needTool(t, "xmllint")
	path := writeQuakeMLFile(t)
	runToolAllowStderr(t, xmllint, "--noout", "--schema", quakeMLSchema, path)

	good := string(writeQuakeMLBytes(t, samplePlacement, sampleCatalog()))
	for _, tc := range []struct{ name, old, new string }{
		{"event type outside the enumeration", quakeEventType, "microseismic"},
		{"publicID without an authority", `publicID="smi:local/`, `publicID="local/`},
		{"wrong BED namespace", QuakeMLBEDNamespace, QuakeMLBEDNamespace + ".1"},
	} {
		bad := strings.ReplaceAll(good, tc.old, tc.new)
		if bad == good {
			t.Fatalf("%s: %q not found in the written file", tc.name, tc.old)
		}
		p := filepath.Join(t.TempDir(), "bad.xml")
		if err := os.WriteFile(p, []byte(bad), 0o644); err != nil {
			t.Fatal(err)
		}
		out, err := exec.Command(xmllint, "--noout", "--schema", quakeMLSchema, p).CombinedOutput()
		var exit *exec.ExitError
		if !errors.As(err, &exit) || !strings.Contains(string(out), "fails to validate") {
			t.Errorf("%s: xmllint did not refuse the file (%v):\n%s", tc.name, err, out)
		}
	}
}

func writeQuakeMLFile(t *testing.T) string {
	t.Helper()
	path := filepath.Join(t.TempDir(), "events.xml")
	if err := os.WriteFile(path, writeQuakeMLBytes(t, samplePlacement, sampleCatalog()), 0o644); err != nil {
		t.Fatal(err)
	}
	return path
}

func BenchmarkWriteQuakeML1e4(b *testing.B) { benchmarkWriteQuakeML(b, 1e4) }

func benchmarkWriteQuakeML(b *testing.B, n int) {
	c := Catalog{ID: "bench", Start: quakeStart}
	for i := range n {
		c.Events = append(c.Events, Event{Time: float64(i), East: float64(i % 100), North: float64(i / 100), Depth: 2500, Magnitude: -1})
	}
	var buf bytes.Buffer
	for b.Loop() {
		buf.Reset()
		if err := WriteQuakeML(&buf, samplePlacement, c); err != nil {
			b.Fatal(err)
		}
	}
}
