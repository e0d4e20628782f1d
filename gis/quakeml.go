package gis

import (
	"encoding/xml"
	"fmt"
	"io"
	"math"
	"regexp"
	"strconv"
	"strings"
	"time"
)

// QuakeML 1.2 namespaces (the targetNamespace of each QuakeML 1.2 schema,
// gis/testdata/QuakeML-*.xsd): the root element is in the QuakeML namespace, everything
// from eventParameters down in the BED namespace.
const (
	QuakeMLNamespace    = "http://quakeml.org/xmlns/quakeml/1.2"
	QuakeMLBEDNamespace = "http://quakeml.org/xmlns/bed/1.2"
)

// QuakeML values this writer uses (QuakeML 1.2 BED: EventType and
// EvaluationMode enumerations; magnitude type is free text ≤ 32 chars).
const (
	quakeEventType      = "induced or triggered event"
	quakeEvaluationMode = "automatic"
	quakeMagnitudeType  = "Mw"
	quakeTimeFormat     = "2006-01-02T15:04:05.000000Z" // xs:dateTime, UTC, µs
)

// quakeSyntheticNote is written as an XML comment and as a BED comment of
// the catalog so that no reader takes the events for observations.
const quakeSyntheticNote = "SYNTHETIC events computed by a simulation; they are not observations."

// catalogIDRE restricts catalog IDs to characters that keep every
// publicID within the QuakeML ResourceIdentifier pattern (QuakeML-BED-1.2.xsd).
var catalogIDRE = regexp.MustCompile(`^[A-Za-z0-9][A-Za-z0-9._-]{0,62}$`)

// Event is one synthetic seismic event in the local frame.
type Event struct {
	// Time after the catalog start, s.
	Time float64
	// East and North are the local epicentre coordinates, m.
	East, North float64
	// Depth of the hypocentre, m, positive down (QuakeML 1.2 counts it
	// from sea level; the caller passes depth in that sense).
	Depth float64
	// Magnitude is the moment magnitude Mw.
	Magnitude float64
}

// Catalog is a synthetic event catalog.
type Catalog struct {
	// ID names the catalog in every publicID, smi:local/<ID>/event/<n>:
	// a letter or digit, then letters, digits, '.', '_' or '-', at most
	// 63 characters.
	ID string
	// Start is the UTC time of Event.Time = 0.
	Start time.Time
	// Created, if not zero, is written as the catalog's creationTime.
	Created time.Time
	// Description is free text for the catalog, optional.
	Description string
	Events      []Event
}

// WriteQuakeML writes c as a QuakeML 1.2 document: one eventParameters
// with an event per catalog event, each with an origin (time, WGS 84
// latitude and longitude through pl, depth in m) and a magnitude (Mw),
// event type "induced or triggered event", evaluation mode automatic.
// publicIDs follow smi:local/<ID>/{catalog,event,origin,magnitude}/<n>,
// n counting from 1. Times are rounded to the microsecond.
//
// It returns an error wrapping ErrNoGeographic when pl's CRS cannot be
// converted to longitude and latitude.
func WriteQuakeML(w io.Writer, pl Placement, c Catalog) error {
	if !catalogIDRE.MatchString(c.ID) {
		return fmt.Errorf("gis: QuakeML catalog ID %q: want a letter or digit followed by letters, digits, '.', '_' or '-', at most 63 characters", c.ID)
	}
	if c.Start.IsZero() {
		return fmt.Errorf("gis: QuakeML catalog %q: the start time is not set", c.ID)
	}
	geo, err := pl.Geographic()
	if err != nil {
		return fmt.Errorf("gis: QuakeML catalog %q: %w", c.ID, err)
	}
	doc := qmlRoot{XmlnsQ: QuakeMLNamespace, Xmlns: QuakeMLBEDNamespace}
	ep := &doc.EventParameters
	ep.PublicID = "smi:local/" + c.ID + "/catalog"
	ep.Comment = []qmlComment{{Text: quakeSyntheticNote}}
	ep.Description = c.Description
	if !c.Created.IsZero() {
		ep.CreationInfo = &qmlCreationInfo{CreationTime: c.Created.UTC().Format(quakeTimeFormat)}
	}
	ep.Events = make([]qmlEvent, len(c.Events))
	for k, e := range c.Events {
		ev, err := quakeEvent(geo, c, k, e)
		if err != nil {
			return err
		}
		ep.Events[k] = ev
	}
	if _, err := io.WriteString(w, xml.Header); err != nil {
		return err
	}
	if _, err := io.WriteString(w, "<!-- "+quakeSyntheticNote+" -->\n"); err != nil {
		return err
	}
	enc := xml.NewEncoder(w)
	enc.Indent("", "  ")
	if err := enc.Encode(doc); err != nil {
		return err
	}
	if err := enc.Close(); err != nil {
		return err
	}
	_, err = io.WriteString(w, "\n")
	return err
}

// quakeEvent converts event k of catalog c.
func quakeEvent(geo *Geographic, c Catalog, k int, e Event) (qmlEvent, error) {
	for _, v := range [...]struct {
		name string
		x    float64
	}{{"time", e.Time}, {"east", e.East}, {"north", e.North}, {"depth", e.Depth}, {"magnitude", e.Magnitude}} {
		if math.IsNaN(v.x) || math.IsInf(v.x, 0) {
			return qmlEvent{}, fmt.Errorf("gis: QuakeML catalog %q: event %d: %s = %v is not finite", c.ID, k, v.name, v.x)
		}
	}
	const maxSeconds = 1e11 // about 3000 years, far below time.Duration's range
	if math.Abs(e.Time) > maxSeconds {
		return qmlEvent{}, fmt.Errorf("gis: QuakeML catalog %q: event %d: time %g s is beyond ±%g s", c.ID, k, e.Time, maxSeconds)
	}
	n := strconv.Itoa(k + 1)
	base := "smi:local/" + c.ID
	originID, magID := base+"/origin/"+n, base+"/magnitude/"+n
	t := c.Start.UTC().Add(time.Duration(math.Round(e.Time*1e6)) * time.Microsecond)
	ll := geo.LonLat([2]float64{e.East, e.North})
	return qmlEvent{
		PublicID:             base + "/event/" + n,
		PreferredOriginID:    originID,
		PreferredMagnitudeID: magID,
		Type:                 quakeEventType,
		Origin: qmlOrigin{
			PublicID:       originID,
			Time:           qmlValue{t.Format(quakeTimeFormat)},
			Latitude:       qmlValue{formatFixed(ll[1], 9)}, // 1e-9° ≈ 0.1 mm
			Longitude:      qmlValue{formatFixed(ll[0], 9)},
			Depth:          qmlValue{formatFixed(e.Depth, 3)}, // mm
			EvaluationMode: quakeEvaluationMode,
		},
		Magnitude: qmlMagnitude{
			PublicID:       magID,
			Mag:            qmlValue{strconv.FormatFloat(e.Magnitude, 'f', -1, 64)},
			Type:           quakeMagnitudeType,
			OriginID:       originID,
			EvaluationMode: quakeEvaluationMode,
		},
	}, nil
}

// formatFixed formats v with at most dec decimals and no trailing zeros.
func formatFixed(v float64, dec int) string {
	s := strconv.FormatFloat(v, 'f', dec, 64)
	if strings.Contains(s, ".") {
		s = strings.TrimSuffix(strings.TrimRight(s, "0"), ".")
	}
	if s == "-0" {
		return "0"
	}
	return s
}

// The XML structure; names follow the QuakeML 1.2 BED schema (it accepts
// any order inside event, origin and magnitude).
type qmlRoot struct {
	XMLName         xml.Name           `xml:"q:quakeml"`
	XmlnsQ          string             `xml:"xmlns:q,attr"`
	Xmlns           string             `xml:"xmlns,attr"`
	EventParameters qmlEventParameters `xml:"eventParameters"`
}

type qmlEventParameters struct {
	PublicID     string           `xml:"publicID,attr"`
	Comment      []qmlComment     `xml:"comment"`
	Description  string           `xml:"description,omitempty"`
	CreationInfo *qmlCreationInfo `xml:"creationInfo"`
	Events       []qmlEvent       `xml:"event"`
}

type qmlComment struct {
	Text string `xml:"text"`
}

type qmlCreationInfo struct {
	CreationTime string `xml:"creationTime"`
}

type qmlEvent struct {
	PublicID             string       `xml:"publicID,attr"`
	PreferredOriginID    string       `xml:"preferredOriginID"`
	PreferredMagnitudeID string       `xml:"preferredMagnitudeID"`
	Type                 string       `xml:"type"`
	Origin               qmlOrigin    `xml:"origin"`
	Magnitude            qmlMagnitude `xml:"magnitude"`
}

type qmlOrigin struct {
	PublicID       string   `xml:"publicID,attr"`
	Time           qmlValue `xml:"time"`
	Latitude       qmlValue `xml:"latitude"`
	Longitude      qmlValue `xml:"longitude"`
	Depth          qmlValue `xml:"depth"`
	EvaluationMode string   `xml:"evaluationMode"`
}

type qmlMagnitude struct {
	PublicID       string   `xml:"publicID,attr"`
	Mag            qmlValue `xml:"mag"`
	Type           string   `xml:"type"`
	OriginID       string   `xml:"originID"`
	EvaluationMode string   `xml:"evaluationMode"`
}

// qmlValue is a QuakeML quantity: <x><value>…</value></x>.
type qmlValue struct {
	Value string `xml:"value"`
}
