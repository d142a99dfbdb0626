package logbook

import (
	"crypto/rand"
	"encoding/json"
	"fmt"
	"math"
	"strings"
	"time"
	"unicode/utf8"

	"alvea/physio"
)

// Kind is what an entry records.
type Kind uint8

const (
	KindOpen     Kind = 1 // a transport is opened: route, vehicle, crew, patient, Brief, cylinders
	KindEvent    Kind = 2 // a timed event (lift-off, landing, handover, …)
	KindGauge    Kind = 3 // a cylinder gauge reading
	KindObserve  Kind = 4 // patient observations (SpO2, FiO2/device/flow, RR, EtCO2)
	KindNote     Kind = 5 // free-text note
	KindCylinder Kind = 6 // a cylinder brought into use after opening
	KindBrief    Kind = 7 // a new Brief snapshot (the plan amended in flight)
	KindClose    Kind = 8 // the transport is closed
	KindAmend    Kind = 9 // a correction of an earlier entry (replace or withdraw)
)

var kindNames = [...]string{"", "open", "event", "gauge", "observe", "note", "cylinder", "brief", "close", "amend"}

func (k Kind) String() string {
	if int(k) < len(kindNames) && k > 0 {
		return kindNames[k]
	}
	return fmt.Sprintf("kind(%d)", uint8(k))
}

func (k Kind) MarshalText() ([]byte, error) {
	if k == 0 || int(k) >= len(kindNames) {
		return nil, &FieldError{Field: "kind", Value: k.String(), Allowed: strings.Join(kindNames[1:], ", ")}
	}
	return []byte(k.String()), nil
}

func (k *Kind) UnmarshalText(b []byte) error {
	for i, n := range kindNames {
		if i > 0 && n == string(b) {
			*k = Kind(i)
			return nil
		}
	}
	return &FieldError{Field: "kind", Value: fmt.Sprintf("%q", b), Allowed: strings.Join(kindNames[1:], ", ")}
}

// Entry is one appended record of the log. Exactly one payload field is set,
// matching Kind; an amendment (KindAmend) sets the payload of the kind it
// amends, or Void to withdraw the amended entry.
type Entry struct {
	Seq       uint64      `json:"-"`         // position in the vault, set by the vault
	Transport TransportID `json:"transport"` // the transport this entry belongs to
	Kind      Kind        `json:"kind"`
	At        time.Time   `json:"at"`      // when it happened, as the crew gives it
	Written   time.Time   `json:"written"` // when it was appended (set by Append)

	Amends uint64 `json:"amends,omitempty"` // KindAmend: the Seq of the entry corrected
	Reason string `json:"reason,omitempty"` // KindAmend: why (required)
	Void   bool   `json:"void,omitempty"`   // KindAmend: withdraw the amended entry

	Open     *Opening      `json:"open,omitempty"`
	Event    *Event        `json:"event,omitempty"`
	Gauge    *GaugeReading `json:"gauge,omitempty"`
	Observe  *Observation  `json:"observe,omitempty"`
	Note     *Note         `json:"note,omitempty"`
	Cylinder *CylinderSpec `json:"cylinder,omitempty"`
	Brief    *Brief        `json:"brief,omitempty"`
	Close    *Closing      `json:"close,omitempty"`
}

// Opening is the payload of KindOpen.
type Opening struct {
	Vehicle     string         `json:"vehicle"`         // vehicle or aircraft type, free text
	Crew        []string       `json:"crew"`            // initials, 1–4 letters each
	Origin      Place          `json:"origin"`          //
	Destination Place          `json:"destination"`     //
	Patient     Patient        `json:"patient"`         //
	Brief       *Brief         `json:"brief,omitempty"` // the Brief snapshot at opening
	Cylinders   []CylinderSpec `json:"cylinders,omitempty"`
}

// Place is an origin or destination. Elevation is geopotential metres above
// mean sea level (the unit Alvea computes in); the UI converts from feet.
type Place struct {
	Name           string          `json:"name"`
	Elevation      physio.Altitude `json:"elevation_m"`
	ElevationKnown bool            `json:"elevation_known"` // false when the elevation was not given
}

// AgeBand is a coarse age group: never a date of birth.
type AgeBand string

const (
	AgeUnknown    AgeBand = ""
	AgeNeonate    AgeBand = "neonate"     // under 28 days
	AgeInfant     AgeBand = "infant"      // 28 days to under 1 year
	AgeChild      AgeBand = "child"       // 1 to 11 years
	AgeAdolescent AgeBand = "adolescent"  // 12 to 17 years
	AgeAdult      AgeBand = "adult"       // 18 to 64 years
	AgeOlderAdult AgeBand = "older-adult" // 65 years and over
)

// Sex as recorded for clinical purposes.
type Sex string

const (
	SexUnknown Sex = ""
	SexFemale  Sex = "female"
	SexMale    Sex = "male"
	SexOther   Sex = "other"
)

// Patient is the minimal patient description. Identifying is optional free
// text (a name, a hospital number): it is stored only inside the encrypted
// vault, but it identifies the patient, so the UI must say so beside the
// field, and the index flags entries that carry it.
type Patient struct {
	AgeBand     AgeBand `json:"age_band,omitempty"`
	Sex         Sex     `json:"sex,omitempty"`
	WeightKg    float64 `json:"weight_kg,omitempty"` // 0 = not given
	Identifying string  `json:"identifying,omitempty"`
}

// Brief is a snapshot of the plan: the plan document and its result as JSON
// exactly as the engine produced them, and the engine version. The logbook
// stores them as opaque JSON so it does not depend on the plan types.
type Brief struct {
	Plan          json.RawMessage `json:"plan"`
	Result        json.RawMessage `json:"result,omitempty"`
	EngineVersion string          `json:"engine_version"`
}

// EventType names a timed event. The list covers a transport's usual
// milestones; EventOther takes free text in Event.Text.
type EventType string

const (
	EventDepart         EventType = "depart"          // vehicle leaves origin (ground)
	EventLiftOff        EventType = "lift-off"        //
	EventTopOfClimb     EventType = "top-of-climb"    //
	EventTopOfDescent   EventType = "top-of-descent"  //
	EventLanding        EventType = "landing"         //
	EventArrive         EventType = "arrive"          // vehicle reaches destination (ground)
	EventHandover       EventType = "handover"        // patient handed over to the receiving team
	EventCylinderChange EventType = "cylinder-change" // Event.Cylinder names the cylinder now in use
	EventDeviceChange   EventType = "device-change"   //
	EventOther          EventType = "other"           // Event.Text says what
)

var eventTypes = []EventType{EventDepart, EventLiftOff, EventTopOfClimb, EventTopOfDescent, EventLanding, EventArrive, EventHandover, EventCylinderChange, EventDeviceChange, EventOther}

// Event is the payload of KindEvent; its time is Entry.At.
type Event struct {
	Type          EventType        `json:"type"`
	Text          string           `json:"text,omitempty"`
	Cylinder      string           `json:"cylinder,omitempty"`         // label, for cylinder-change
	CabinAltitude *physio.Altitude `json:"cabin_altitude_m,omitempty"` // when read off the cabin gauge
}

// CylinderSpec defines a cylinder on board, by exactly one method, so the
// oxygen used can be computed from gauge readings with physio: a CGA letter
// size (cylinder factor), a water capacity, or a label's contents at its
// filling pressure.
type CylinderSpec struct {
	Label           string          `json:"label"` // how the crew names it, e.g. "A", "main 1"; unique per transport
	Size            string          `json:"cga_size,omitempty"`
	WaterCapacity   physio.Volume   `json:"water_capacity_l,omitempty"`
	NominalContents physio.Volume   `json:"nominal_contents_l,omitempty"`
	NominalPressure physio.Pressure `json:"nominal_pressure_pa,omitempty"`
}

// Physio returns the cylinder as physio counts it.
func (c CylinderSpec) Physio() (physio.Cylinder, error) {
	pc := physio.Cylinder{
		Size:            physio.CylinderSize(c.Size),
		WaterCapacity:   c.WaterCapacity,
		NominalContents: c.NominalContents,
		NominalPressure: c.NominalPressure,
	}
	return pc, pc.Validate()
}

// GaugeReading is the payload of KindGauge; its time is Entry.At. Pressure
// is gauge pressure in pascals (the UI converts from psi or bar).
type GaugeReading struct {
	Cylinder string          `json:"cylinder"` // CylinderSpec.Label
	Pressure physio.Pressure `json:"pressure_pa"`
}

// Observation is the payload of KindObserve; its time is Entry.At. Nil
// pointers were not observed.
type Observation struct {
	SpO2      *physio.Fraction `json:"spo2,omitempty"`      // 0–1
	FiO2      *physio.Fraction `json:"fio2,omitempty"`      // 0.21–1
	Device    string           `json:"device,omitempty"`    // delivery device, free text or a physio device name
	Flow      *physio.Flow     `json:"flow_lpm,omitempty"`  // oxygen flow, L/min
	RespRate  *float64         `json:"resp_rate,omitempty"` // breaths per minute
	EtCO2     *physio.Pressure `json:"etco2_pa,omitempty"`  // end-tidal CO2, Pa
	HeartRate *float64         `json:"heart_rate,omitempty"`
}

// Note is free text (KindNote).
type Note struct {
	Text string `json:"text"`
}

// Closing is the payload of KindClose; its time is Entry.At.
type Closing struct {
	Outcome string `json:"outcome,omitempty"` // free text, e.g. "handed over, stable"
}

// Limits for validation. Text limits keep one record small; ranges are
// physiological or physical plausibility bounds (an entry outside them is
// almost surely a typing or unit slip).
const (
	maxShortText   = 200
	maxLongText    = 20_000
	maxBriefJSON   = 512 * 1024
	maxCrew        = 8
	minElevationM  = -500.0   // below the lowest inhabited ground (Dead Sea shore ≈ −430 m)
	maxElevationM  = 6_000.0  // above the highest airfields and clinics
	maxCabinM      = 15_000.0 //
	maxWeightKg    = 400.0
	maxGaugePa     = 31e6 // 310 bar ≈ 4 500 psi
	maxFlowLPM     = 100.0
	maxRespRate    = 150.0
	maxHeartRate   = 350.0
	maxEtCO2Pa     = 20_000.0 // 150 mmHg
	minFiO2, maxFi = 0.21, 1.0
)

// Validate checks an entry's fields before it is sealed. Errors are
// *FieldError naming the field, the value and what is allowed.
func (e *Entry) Validate() error {
	if err := e.Transport.Validate(); err != nil {
		return err
	}
	if y := e.At.UTC().Year(); y < 2000 || y > 2199 {
		return &FieldError{Field: "at", Value: e.At.UTC().Format(time.RFC3339), Allowed: "a time in the years 2000 to 2199"}
	}
	set := 0
	for _, p := range []bool{e.Open != nil, e.Event != nil, e.Gauge != nil, e.Observe != nil, e.Note != nil, e.Cylinder != nil, e.Brief != nil, e.Close != nil} {
		if p {
			set++
		}
	}
	if e.Kind == KindAmend {
		if e.Amends == 0 {
			return &FieldError{Field: "amends", Value: "0", Allowed: "the record number of the entry corrected"}
		}
		if strings.TrimSpace(e.Reason) == "" {
			return &FieldError{Field: "reason", Value: `""`, Allowed: "a reason for the correction"}
		}
		if err := checkText("reason", e.Reason, maxShortText); err != nil {
			return err
		}
		if e.Void && set != 0 || !e.Void && set != 1 {
			return &FieldError{Field: "amend", Value: fmt.Sprintf("%d payloads, void=%v", set, e.Void), Allowed: "exactly one replacement payload, or void with none"}
		}
		return e.validatePayload()
	}
	if e.Amends != 0 || e.Reason != "" || e.Void {
		return &FieldError{Field: "amends", Value: RecordName(e.Amends), Allowed: "only on an amend entry"}
	}
	if set != 1 || e.payloadKind() != e.Kind {
		return &FieldError{Field: "kind", Value: e.Kind.String(), Allowed: "exactly one payload, matching the kind"}
	}
	return e.validatePayload()
}

// payloadKind returns the kind of the payload that is set (0 if none).
func (e *Entry) payloadKind() Kind {
	switch {
	case e.Open != nil:
		return KindOpen
	case e.Event != nil:
		return KindEvent
	case e.Gauge != nil:
		return KindGauge
	case e.Observe != nil:
		return KindObserve
	case e.Note != nil:
		return KindNote
	case e.Cylinder != nil:
		return KindCylinder
	case e.Brief != nil:
		return KindBrief
	case e.Close != nil:
		return KindClose
	}
	return 0
}

func (e *Entry) validatePayload() error {
	switch {
	case e.Open != nil:
		return e.Open.validate()
	case e.Event != nil:
		return e.Event.validate()
	case e.Gauge != nil:
		return e.Gauge.validate()
	case e.Observe != nil:
		return e.Observe.validate()
	case e.Note != nil:
		return checkText("note.text", e.Note.Text, maxLongText)
	case e.Cylinder != nil:
		return e.Cylinder.validate("cylinder")
	case e.Brief != nil:
		return e.Brief.validate("brief")
	case e.Close != nil:
		return checkText("close.outcome", e.Close.Outcome, maxLongText)
	}
	return nil
}

func (o *Opening) validate() error {
	if err := checkText("open.vehicle", o.Vehicle, maxShortText); err != nil {
		return err
	}
	if len(o.Crew) > maxCrew {
		return &FieldError{Field: "open.crew", Value: fmt.Sprint(len(o.Crew)), Allowed: fmt.Sprintf("0 to %d crew", maxCrew)}
	}
	for i, c := range o.Crew {
		if !validInitials(c) {
			return &FieldError{Field: fmt.Sprintf("open.crew[%d]", i), Value: fmt.Sprintf("%q", c), Allowed: "initials, 1 to 4 letters"}
		}
	}
	for _, p := range []struct {
		name string
		pl   Place
	}{{"open.origin", o.Origin}, {"open.destination", o.Destination}} {
		if err := checkText(p.name+".name", p.pl.Name, maxShortText); err != nil {
			return err
		}
		if p.pl.ElevationKnown {
			if err := checkFloat(p.name+".elevation_m", p.pl.Elevation.Metres(), minElevationM, maxElevationM, "m"); err != nil {
				return err
			}
		} else if p.pl.Elevation != 0 {
			return &FieldError{Field: p.name + ".elevation_known", Value: "false", Allowed: "true when an elevation is given"}
		}
	}
	if err := o.Patient.validate(); err != nil {
		return err
	}
	if o.Brief != nil {
		if err := o.Brief.validate("open.brief"); err != nil {
			return err
		}
	}
	seen := map[string]bool{}
	for i, c := range o.Cylinders {
		if err := c.validate(fmt.Sprintf("open.cylinders[%d]", i)); err != nil {
			return err
		}
		if seen[c.Label] {
			return &FieldError{Field: fmt.Sprintf("open.cylinders[%d].label", i), Value: fmt.Sprintf("%q", c.Label), Allowed: "a label not used by another cylinder"}
		}
		seen[c.Label] = true
	}
	return nil
}

func (p *Patient) validate() error {
	switch p.AgeBand {
	case AgeUnknown, AgeNeonate, AgeInfant, AgeChild, AgeAdolescent, AgeAdult, AgeOlderAdult:
	default:
		return &FieldError{Field: "open.patient.age_band", Value: fmt.Sprintf("%q", p.AgeBand), Allowed: "neonate, infant, child, adolescent, adult, older-adult or empty"}
	}
	switch p.Sex {
	case SexUnknown, SexFemale, SexMale, SexOther:
	default:
		return &FieldError{Field: "open.patient.sex", Value: fmt.Sprintf("%q", p.Sex), Allowed: "female, male, other or empty"}
	}
	if p.WeightKg != 0 {
		if err := checkFloat("open.patient.weight_kg", p.WeightKg, 0.2, maxWeightKg, "kg"); err != nil {
			return err
		}
	}
	return checkText("open.patient.identifying", p.Identifying, maxShortText)
}

func (b *Brief) validate(field string) error {
	if len(b.Plan) == 0 || !json.Valid(b.Plan) {
		return &FieldError{Field: field + ".plan", Value: fmt.Sprintf("%d bytes", len(b.Plan)), Allowed: "a JSON plan document"}
	}
	if len(b.Result) > 0 && !json.Valid(b.Result) {
		return &FieldError{Field: field + ".result", Value: fmt.Sprintf("%d bytes", len(b.Result)), Allowed: "JSON or empty"}
	}
	if len(b.Plan)+len(b.Result) > maxBriefJSON {
		return &FieldError{Field: field, Value: fmt.Sprintf("%d bytes", len(b.Plan)+len(b.Result)), Allowed: fmt.Sprintf("at most %d bytes of JSON", maxBriefJSON)}
	}
	return checkText(field+".engine_version", b.EngineVersion, maxShortText)
}

func (c *CylinderSpec) validate(field string) error {
	if strings.TrimSpace(c.Label) == "" {
		return &FieldError{Field: field + ".label", Value: `""`, Allowed: "a label, e.g. A"}
	}
	if err := checkText(field+".label", c.Label, 40); err != nil {
		return err
	}
	if _, err := c.Physio(); err != nil {
		return &FieldError{Field: field, Value: "(definition)", Allowed: "exactly one of CGA size, water capacity, or label contents and pressure (" + err.Error() + ")"}
	}
	return nil
}

func (g *GaugeReading) validate() error {
	if strings.TrimSpace(g.Cylinder) == "" {
		return &FieldError{Field: "gauge.cylinder", Value: `""`, Allowed: "the label of a cylinder of this transport"}
	}
	return checkFloat("gauge.pressure_pa", g.Pressure.Pascals(), 0, maxGaugePa, "Pa")
}

func (o *Observation) validate() error {
	if o.SpO2 == nil && o.FiO2 == nil && o.Device == "" && o.Flow == nil && o.RespRate == nil && o.EtCO2 == nil && o.HeartRate == nil {
		return &FieldError{Field: "observe", Value: "(empty)", Allowed: "at least one observation"}
	}
	checks := []struct {
		name     string
		v        *float64
		min, max float64
		unit     string
	}{}
	add := func(name string, v *float64, min, max float64, unit string) {
		checks = append(checks, struct {
			name     string
			v        *float64
			min, max float64
			unit     string
		}{name, v, min, max, unit})
	}
	if o.SpO2 != nil {
		v := o.SpO2.Value()
		add("observe.spo2", &v, 0.3, 1, "fraction")
	}
	if o.FiO2 != nil {
		v := o.FiO2.Value()
		add("observe.fio2", &v, minFiO2, maxFi, "fraction")
	}
	if o.Flow != nil {
		v := o.Flow.LitresPerMinute()
		add("observe.flow_lpm", &v, 0, maxFlowLPM, "L/min")
	}
	add("observe.resp_rate", o.RespRate, 0, maxRespRate, "/min")
	add("observe.heart_rate", o.HeartRate, 0, maxHeartRate, "/min")
	if o.EtCO2 != nil {
		v := o.EtCO2.Pascals()
		add("observe.etco2_pa", &v, 0, maxEtCO2Pa, "Pa")
	}
	for _, c := range checks {
		if c.v == nil {
			continue
		}
		if err := checkFloat(c.name, *c.v, c.min, c.max, c.unit); err != nil {
			return err
		}
	}
	return checkText("observe.device", o.Device, maxShortText)
}

func (e *Event) validate() error {
	ok := false
	for _, t := range eventTypes {
		ok = ok || t == e.Type
	}
	if !ok {
		return &FieldError{Field: "event.type", Value: fmt.Sprintf("%q", e.Type), Allowed: "one of the event types"}
	}
	if e.Type == EventOther && strings.TrimSpace(e.Text) == "" {
		return &FieldError{Field: "event.text", Value: `""`, Allowed: "a description for an other event"}
	}
	if e.Type == EventCylinderChange && strings.TrimSpace(e.Cylinder) == "" {
		return &FieldError{Field: "event.cylinder", Value: `""`, Allowed: "the label of the cylinder now in use"}
	}
	if e.CabinAltitude != nil {
		if err := checkFloat("event.cabin_altitude_m", e.CabinAltitude.Metres(), minElevationM, maxCabinM, "m"); err != nil {
			return err
		}
	}
	if err := checkText("event.cylinder", e.Cylinder, 40); err != nil {
		return err
	}
	return checkText("event.text", e.Text, maxShortText)
}

func checkText(field, s string, max int) error {
	if !utf8.ValidString(s) {
		return &FieldError{Field: field, Value: "(invalid UTF-8)", Allowed: "UTF-8 text"}
	}
	if len(s) > max {
		return &FieldError{Field: field, Value: fmt.Sprintf("%d bytes", len(s)), Allowed: fmt.Sprintf("at most %d bytes", max)}
	}
	return nil
}

// numericRanges are the ranges Validate checks numeric fields against,
// by field name, for a form that must say what is allowed before it has
// anything to validate (a value it could not read as a number).
var numericRanges = map[string]struct {
	min, max float64
	unit     string
}{
	"open.origin.elevation_m":      {minElevationM, maxElevationM, "m"},
	"open.destination.elevation_m": {minElevationM, maxElevationM, "m"},
	"open.patient.weight_kg":       {0.2, maxWeightKg, "kg"},
	"gauge.pressure_pa":            {0, maxGaugePa, "Pa"},
	"observe.spo2":                 {0.3, 1, "fraction"},
	"observe.fio2":                 {minFiO2, maxFi, "fraction"},
	"observe.flow_lpm":             {0, maxFlowLPM, "L/min"},
	"observe.resp_rate":            {0, maxRespRate, "/min"},
	"observe.heart_rate":           {0, maxHeartRate, "/min"},
	"observe.etco2_pa":             {0, maxEtCO2Pa, "Pa"},
}

// NumericRange returns the range Validate checks a numeric field against,
// in the vault's unit (Pa, m, kg, L/min, /min, or "fraction"); ok is false
// for a field without one.
func NumericRange(field string) (min, max float64, unit string, ok bool) {
	r, ok := numericRanges[field]
	return r.min, r.max, r.unit, ok
}

// AllowedRange returns what Validate allows for a numeric field, worded as
// its FieldError's Allowed ("0 to 3.1e+07 Pa"), or "" for a field with no
// numeric range.
func AllowedRange(field string) string {
	r, ok := numericRanges[field]
	if !ok {
		return ""
	}
	return fmt.Sprintf("%g to %g %s", r.min, r.max, r.unit)
}

func checkFloat(field string, v, min, max float64, unit string) error {
	if math.IsNaN(v) || math.IsInf(v, 0) || v < min || v > max {
		return &FieldError{Field: field, Value: fmt.Sprintf("%g %s", v, unit), Allowed: fmt.Sprintf("%g to %g %s", min, max, unit)}
	}
	return nil
}

func validInitials(s string) bool {
	n := utf8.RuneCountInString(s)
	if n < 1 || n > 4 {
		return false
	}
	for _, r := range s {
		if !(r >= 'A' && r <= 'Z' || r >= 'a' && r <= 'z' || r > 127 && r != utf8.RuneError) {
			return false
		}
	}
	return true
}

// TransportID identifies a transport across vaults and exports, in a format
// of our own: "T", the UTC opening date as YYYYMMDD, a dash, six random
// characters of Crockford's base-32 alphabet and one check character
// (Crockford's mod-37 check symbol over the six), e.g. T20250614-7KQ3M9X.
// The date makes it readable to a crew; the random part (30 bits) keeps two
// transports opened the same day apart; the check character catches a
// mistyped id when an auditor enters one by hand.
type TransportID string

const crockford = "0123456789ABCDEFGHJKMNPQRSTVWXYZ*~$=U"

// NewTransportID returns a fresh id for a transport opened at t.
func NewTransportID(t time.Time) TransportID {
	var rnd [6]byte
	rand.Read(rnd[:])
	var b strings.Builder
	b.WriteString("T")
	b.WriteString(t.UTC().Format("20060102"))
	b.WriteByte('-')
	var sum int
	for _, x := range rnd {
		v := int(x) & 31
		sum = sum*32 + v
		sum %= 37
		b.WriteByte(crockford[v])
	}
	b.WriteByte(crockford[sum])
	return TransportID(b.String())
}

// Validate checks the id's shape, date and check character.
func (id TransportID) Validate() error {
	s := string(id)
	bad := &FieldError{Field: "transport", Value: fmt.Sprintf("%q", s), Allowed: "an id like T20250614-7KQ3M9X"}
	if len(s) != 17 || s[0] != 'T' || s[9] != '-' {
		return bad
	}
	if _, err := time.Parse("20060102", s[1:9]); err != nil {
		return bad
	}
	sum := 0
	for i := 10; i < 16; i++ {
		v := strings.IndexByte(crockford[:32], s[i])
		if v < 0 {
			return bad
		}
		sum = (sum*32 + v) % 37
	}
	if s[16] != crockford[sum] {
		return bad
	}
	return nil
}

// Opened returns the date part of the id (UTC midnight).
func (id TransportID) Opened() time.Time {
	if len(id) < 9 {
		return time.Time{}
	}
	t, _ := time.Parse("20060102", string(id[1:9]))
	return t
}
