package logbook

import (
	"bytes"
	"encoding/json"
	"flag"
	"os"
	"path/filepath"
	"strings"
	"testing"
	"time"

	"alvea/physio"
)

var update = flag.Bool("update", false, "rewrite testdata/vault/demo.alvea-bundle")

// DemoPassphrase opens testdata/vault/demo.alvea-bundle. Demo only: it is
// published, so it protects nothing.
const DemoPassphrase = "demo only: kestrel over the salt flats"

var demoPath = filepath.Join("..", "..", "testdata", "vault", "demo"+BundleExt)

// The demo bundle is the one bundle the audit CLI's golden tests
// (app/cli) and the Review screen's browser tests (app/e2e) read. Its
// scenario is invented, ours, demo data only:
//
//  1. T20310503-4K7QM2D, a rotor transfer from Fell Station (3 900 ft) to
//     Estuary Hospital: two E cylinders (cylinder factor), a Brief
//     computed by the engine, an SpO2 dip below target, the plan amended in
//     flight, a late cylinder change, the reserve breached at handover, and
//     a gauge reading corrected after closing.
//  2. T20310509-9XH3TB4, a road transfer from Ridge Post to Valley Base with
//     one 10 L cylinder (water capacity), on plan.
//  3. T20310520-0B8ZR5Q, a road transfer still open, without a Brief, with
//     one reading of a D cylinder (so its figures are not computable).
//
// The transport ids have fixed random parts so that the golden files do
// not change when the bundle is written again; the keys and nonces are
// fresh each time (the bundle's bytes change, its content does not).

// demoTransportID makes a valid id with the given six random characters
// (the check character computed as NewTransportID does).
func demoTransportID(date, six string) TransportID {
	sum := 0
	for _, c := range six {
		sum = (sum*32 + strings.IndexRune(crockford[:32], c)) % 37
	}
	return TransportID("T" + date + "-" + six + string(crockford[sum]))
}

// demoBrief computes a plan document with the engine and snapshots it as
// the Brief screen does: the document, the result and the engine version.
func demoBrief(t *testing.T, doc string) *Brief {
	t.Helper()
	d, err := physio.ParsePlan([]byte(doc))
	if err != nil {
		t.Fatal(err)
	}
	res, err := physio.ComputePlan(d)
	if err != nil {
		t.Fatal(err)
	}
	out, err := json.Marshal(res)
	if err != nil {
		t.Fatal(err)
	}
	return &Brief{Plan: json.RawMessage(doc), Result: out, EngineVersion: res.EngineVersion}
}

// Plan documents of the demo (invented routes and patients).
const (
	demoRotorPlan = `{"version": 1, "title": "Fell Station to Estuary Hospital (demo)",
 "route": {"origin_elevation_ft": 3900, "destination_elevation_ft": 30, "cruise_altitude_ft": 7500},
 "legs": [
  {"label": "loading", "where": "origin", "minutes": 15, "oxygen": {"device": "nasal_cannula", "flow_lpm": 3}},
  {"label": "flight", "where": "cabin", "minutes": 50, "oxygen": {"device": "nasal_cannula", "flow_lpm": 4}},
  {"label": "to the ward", "where": "destination", "minutes": 10, "oxygen": {"device": "nasal_cannula", "flow_lpm": 2}}],
 "patient": {"fio2": 0.21, "spo2_percent": 92, "paco2_mmhg": 40},
 "supply": [{"name": "E", "size": "E", "pressure_psi": 1000, "count": 2}],
 "policy": {"residual_psi": 200, "reserve_factor": 1.5}}`

	demoRoadPlan = `{"version": 1, "title": "Ridge Post to Valley Base (demo)",
 "route": {"origin_elevation_ft": 2000, "destination_elevation_ft": 600},
 "legs": [{"label": "road", "where": "origin", "minutes": 90, "oxygen": {"device": "simple_mask", "flow_lpm": 6}}],
 "patient": {"fio2": 0.21, "spo2_percent": 95, "paco2_mmhg": 40},
 "supply": [{"name": "10 L", "water_capacity_l": 10, "pressure_bar": 200, "count": 1}],
 "policy": {"residual_bar": 14, "reserve_factor": 2}}`
)

// Demo ids (see the scenario above).
var (
	demoRotorID = demoTransportID("20310503", "4K7QM2")
	demoRoadID  = demoTransportID("20310509", "9XH3TB")
	demoOpenID  = demoTransportID("20310520", "0B8ZR5")
)

// TestDemoBundle checks the committed demo bundle opens clean with the demo
// passphrase and holds the scenario above; with -update it writes a new one
// first.
func TestDemoBundle(t *testing.T) {
	if *update {
		writeDemo(t)
	}
	data, err := os.ReadFile(demoPath)
	if err != nil {
		t.Fatalf("demo bundle missing (run go test ./app/logbook -run TestDemoBundle -update): %v", err)
	}
	v, err := OpenBundle(ctx, data, DemoPassphrase)
	if err != nil {
		t.Fatal(err)
	}
	defer v.Lock()
	if got := v.KDF(); got != DefaultKDF {
		t.Errorf("demo key derivation %+v, want the default %+v (what a crew's vault gets)", got, DefaultKDF)
	}
	l, err := v.List(ctx)
	if err != nil || len(l.Transports) != 3 || len(l.Problems) != 0 {
		t.Fatalf("demo listing: %+v %v", l, err)
	}
	rotor, err := v.Transport(ctx, demoRotorID)
	if err != nil {
		t.Fatal(err)
	}
	// The Brief is a real engine snapshot: its result decodes and carries
	// the engine version.
	if len(rotor.Briefs) != 2 || rotor.Briefs[0].Value.EngineVersion != physio.EngineVersion {
		t.Fatalf("rotor Briefs: %+v", rotor.Briefs)
	}
	var res physio.PlanResult
	if err := json.Unmarshal(rotor.Briefs[0].Value.Result, &res); err != nil || len(res.Legs) != 3 {
		t.Fatalf("rotor Brief result: %v %+v", err, res)
	}
	use := rotor.CylinderUse()
	// Cylinder factor E 0.28 L/psi (common practice, REFERENCES §7):
	// 1 000 − 150 psi → 238 L; 1 000 − 620 psi (the corrected reading)
	// → 106.4 L.
	if len(use) != 2 || !near(use[0].Used.Litres(), 238) || !near(use[1].Used.Litres(), 106.4) {
		t.Errorf("rotor oxygen used: %+v", use)
	}
	road, err := v.Transport(ctx, demoRoadID)
	if err != nil {
		t.Fatal(err)
	}
	// Water capacity 10 L (contents = V × P, common practice): 200 − 150
	// bar → 500 L.
	if u := road.CylinderUse(); len(u) != 1 || !near(u[0].Used.Litres(), 500) {
		t.Errorf("road oxygen used: %+v", u)
	}
	r, err := AuditVault(ctx, v, AuditOptions{}, AuditFilter{})
	if err != nil || len(r.Transports) != 3 || !r.Chain.Verified {
		t.Fatalf("demo audit: %v %+v", err, r)
	}
	for _, want := range []struct {
		id   TransportID
		code string
	}{{demoRotorID, DevReserveBreached}, {demoRotorID, DevAmendedAfterClose}, {demoRotorID, DevPlanAmendedInFlight},
		{demoRotorID, DevCylinderChangedLate}, {demoRotorID, DevSpO2BelowTarget}, {demoOpenID, DevNoBrief}, {demoOpenID, DevNotClosed}} {
		found := false
		for i := range r.Transports {
			if r.Transports[i].ID == want.id && r.Transports[i].DeviationCount(want.code) > 0 {
				found = true
			}
		}
		if !found {
			t.Errorf("demo: %s lacks %s", want.id, want.code)
		}
	}
	if n := len(r.Transports[1].Deviations); r.Transports[1].ID != demoRoadID || n != 0 {
		t.Errorf("demo road transfer should be on plan: %+v", r.Transports[1].Deviations)
	}
}

func near(a, b float64) bool { return a-b < 1e-9 && b-a < 1e-9 }

func writeDemo(t *testing.T) {
	s := NewMemStore()
	v, err := Create(ctx, s, DemoPassphrase, DefaultKDF)
	if err != nil {
		t.Fatal(err)
	}
	defer v.Lock()
	v.SetAutoLock(0, nil)
	add := func(id TransportID, start time.Time, minute float64, e *Entry) uint64 {
		t.Helper()
		e.Transport, e.At = id, start.Add(physio.Minutes(minute))
		if e.Kind == 0 {
			e.Kind = e.payloadKind()
		}
		ie, err := v.Append(ctx, e)
		if err != nil {
			t.Fatal(err)
		}
		return ie.Seq
	}
	spo2 := func(p float64) *physio.Fraction { return ptr(physio.Percent(p)) }
	fio2 := func(x float64) *physio.Fraction { return ptr(physio.FractionOf(x)) }
	flow := func(x float64) *physio.Flow { return ptr(physio.LitresPerMinute(x)) }

	// 1. Rotor transfer.
	s1 := time.Date(2031, 5, 3, 6, 40, 0, 0, time.UTC)
	r := demoRotorID
	add(r, s1, 0, &Entry{Open: &Opening{
		Vehicle: "rotor, unpressurised", Crew: []string{"JW", "MT"},
		Origin:      Place{Name: "Fell Station", Elevation: physio.Feet(3900), ElevationKnown: true},
		Destination: Place{Name: "Estuary Hospital", Elevation: physio.Feet(30), ElevationKnown: true},
		Patient:     Patient{AgeBand: AgeOlderAdult, Sex: SexMale, WeightKg: 82, Identifying: "DEMO-IDENTIFYING-MARKER"},
		Brief:       demoBrief(t, demoRotorPlan),
		Cylinders:   []CylinderSpec{{Label: "E1", Size: "E"}, {Label: "E2", Size: "E"}},
	}})
	add(r, s1, 1, &Entry{Gauge: &GaugeReading{Cylinder: "E1", Pressure: physio.Psi(1000)}})
	add(r, s1, 1, &Entry{Gauge: &GaugeReading{Cylinder: "E2", Pressure: physio.Psi(1000)}})
	add(r, s1, 2, &Entry{Observe: &Observation{SpO2: spo2(95), FiO2: fio2(0.32), Device: "nasal cannula", Flow: flow(3)}})
	add(r, s1, 15, &Entry{Event: &Event{Type: EventLiftOff}})
	add(r, s1, 25, &Entry{Event: &Event{Type: EventTopOfClimb, CabinAltitude: ptr(physio.Feet(7500))}})
	add(r, s1, 30, &Entry{Observe: &Observation{SpO2: spo2(91)}})
	add(r, s1, 38, &Entry{Observe: &Observation{SpO2: spo2(90), FiO2: fio2(0.36), Flow: flow(4)}})
	add(r, s1, 40, &Entry{Brief: demoBrief(t, strings.Replace(demoRotorPlan, `"flow_lpm": 4`, `"flow_lpm": 5`, 1))})
	add(r, s1, 45, &Entry{Observe: &Observation{SpO2: spo2(94)}})
	add(r, s1, 65, &Entry{Event: &Event{Type: EventLanding}})
	add(r, s1, 71, &Entry{Gauge: &GaugeReading{Cylinder: "E1", Pressure: physio.Psi(150)}})
	add(r, s1, 72, &Entry{Event: &Event{Type: EventCylinderChange, Cylinder: "E2"}})
	add(r, s1, 75, &Entry{Event: &Event{Type: EventHandover}})
	e2 := add(r, s1, 76, &Entry{Gauge: &GaugeReading{Cylinder: "E2", Pressure: physio.Psi(600)}})
	add(r, s1, 80, &Entry{Close: &Closing{Outcome: "handed over"}})
	add(r, s1, 76, &Entry{Kind: KindAmend, Amends: e2, Reason: "gauge read again", Gauge: &GaugeReading{Cylinder: "E2", Pressure: physio.Psi(620)}})

	// 2. Road transfer, on plan.
	s2 := time.Date(2031, 5, 9, 14, 5, 0, 0, time.UTC)
	g := demoRoadID
	add(g, s2, 0, &Entry{Open: &Opening{
		Vehicle: "road ambulance", Crew: []string{"RP"},
		Origin:      Place{Name: "Ridge Post"},
		Destination: Place{Name: "Valley Base"},
		Patient:     Patient{AgeBand: AgeChild},
		Brief:       demoBrief(t, demoRoadPlan),
		Cylinders:   []CylinderSpec{{Label: "W", WaterCapacity: physio.Litres(10)}},
	}})
	add(g, s2, 0, &Entry{Gauge: &GaugeReading{Cylinder: "W", Pressure: physio.Bar(200)}})
	add(g, s2, 1, &Entry{Observe: &Observation{SpO2: spo2(96), FiO2: fio2(0.45), Device: "simple mask", Flow: flow(6)}})
	add(g, s2, 2, &Entry{Event: &Event{Type: EventDepart}})
	add(g, s2, 50, &Entry{Observe: &Observation{SpO2: spo2(97)}})
	add(g, s2, 88, &Entry{Event: &Event{Type: EventArrive}})
	add(g, s2, 89, &Entry{Gauge: &GaugeReading{Cylinder: "W", Pressure: physio.Bar(150)}})
	add(g, s2, 95, &Entry{Close: &Closing{}})

	// 3. A transfer still open, without a Brief.
	s3 := time.Date(2031, 5, 20, 22, 0, 0, 0, time.UTC)
	o := demoOpenID
	add(o, s3, 0, &Entry{Open: &Opening{Vehicle: "road ambulance", Origin: Place{Name: "Ridge Post"}, Destination: Place{Name: "Valley Base"},
		Cylinders: []CylinderSpec{{Label: "D", Size: "D"}}}})
	add(o, s3, 0, &Entry{Gauge: &GaugeReading{Cylinder: "D", Pressure: physio.Psi(1900)}})

	var b bytes.Buffer
	if err := v.Export(ctx, &b); err != nil {
		t.Fatal(err)
	}
	if err := os.WriteFile(demoPath, b.Bytes(), 0o644); err != nil {
		t.Fatal(err)
	}
}
