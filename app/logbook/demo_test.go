package logbook

import (
	"bytes"
	"encoding/json"
	"flag"
	"os"
	"path/filepath"
	"testing"
	"time"

	"alvea/physio"
)

var update = flag.Bool("update", false, "rewrite testdata/vault/demo.alvea-bundle")

// DemoPassphrase opens testdata/vault/demo.alvea-bundle. Demo only: it is
// published, so it protects nothing.
const DemoPassphrase = "demo only: kestrel over the salt flats"

var demoPath = filepath.Join("..", "..", "testdata", "vault", "demo"+BundleExt)

// TestDemoBundle checks the committed demo bundle opens clean with the demo
// passphrase and holds the scenario below; with -update it writes a new one
// (fresh random keys and nonces, so the bytes change every time).
//
// Scenario (invented, ours): an air transfer from a high plateau clinic
// (2 300 m) to a coastal referral hospital in a pressurised twin, with an
// E cylinder and a 10 L water-capacity cylinder; a gauge misread corrected
// after closing; and a short ground transfer still open.
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
	l, err := v.List(ctx)
	if err != nil || len(l.Transports) != 2 {
		t.Fatalf("demo listing: %+v %v", l, err)
	}
	air := l.Transports[1]
	tr, err := v.Transport(ctx, air.ID)
	if err != nil {
		t.Fatal(err)
	}
	use := tr.CylinderUse()
	// Cylinder factor E 0.28 L/psi (common practice): 2 000 − 1 150 psi →
	// 238 L. Water capacity 10 L (V×P, common practice): 190 − 175 bar →
	// 150 L.
	if len(use) != 2 || !near(use[0].Used.Litres(), 238) || !near(use[1].Used.Litres(), 150) {
		t.Errorf("demo oxygen used: %+v", use)
	}
	if !air.ChangedAfterClose || !air.Amended {
		t.Errorf("demo amendment after closing not flagged: %+v", air)
	}
}

func near(a, b float64) bool { return a-b < 1e-9 && b-a < 1e-9 }

func writeDemo(t *testing.T) {
	s := NewMemStore()
	v, err := Create(ctx, s, DemoPassphrase, DefaultKDF)
	if err != nil {
		t.Fatal(err)
	}
	v.SetAutoLock(0, nil)
	add := func(e *Entry) uint64 {
		t.Helper()
		ie, err := v.Append(ctx, e)
		if err != nil {
			t.Fatal(err)
		}
		return ie.Seq
	}
	start := time.Date(2031, 9, 2, 6, 40, 0, 0, time.UTC)
	air := NewTransportID(start)
	at := func(min int) time.Time { return start.Add(time.Duration(min) * time.Minute) }
	add(&Entry{Transport: air, Kind: KindOpen, At: at(0), Open: &Opening{
		Vehicle: "pressurised twin turboprop", Crew: []string{"MK", "JT"},
		Origin:      Place{Name: "Plateau Clinic (demo)", Elevation: physio.Metres(2300), ElevationKnown: true},
		Destination: Place{Name: "Harbour Referral Hospital (demo)", Elevation: physio.Metres(20), ElevationKnown: true},
		Patient:     Patient{AgeBand: AgeOlderAdult, Sex: SexMale, WeightKg: 78},
		Brief: &Brief{Plan: json.RawMessage(`{"demo":true,"note":"placeholder plan document"}`),
			Result: json.RawMessage(`{"demo":true,"oxygen_needed_l":420}`), EngineVersion: "demo"},
		Cylinders: []CylinderSpec{{Label: "E1", Size: "E"}, {Label: "W10", WaterCapacity: physio.Litres(10)}},
	}})
	add(&Entry{Transport: air, Kind: KindGauge, At: at(5), Gauge: &GaugeReading{Cylinder: "E1", Pressure: physio.Psi(2000)}})
	add(&Entry{Transport: air, Kind: KindGauge, At: at(5), Gauge: &GaugeReading{Cylinder: "W10", Pressure: physio.Bar(190)}})
	add(&Entry{Transport: air, Kind: KindObserve, At: at(8), Observe: &Observation{SpO2: ptr(physio.Percent(91)), FiO2: ptr(physio.FractionOf(0.35)), Device: "Venturi 35%", Flow: ptr(physio.LitresPerMinute(8)), RespRate: ptr(22.0)}})
	add(&Entry{Transport: air, Kind: KindEvent, At: at(12), Event: &Event{Type: EventLiftOff}})
	add(&Entry{Transport: air, Kind: KindEvent, At: at(30), Event: &Event{Type: EventTopOfClimb, CabinAltitude: ptr(physio.Feet(6000))}})
	add(&Entry{Transport: air, Kind: KindObserve, At: at(35), Observe: &Observation{SpO2: ptr(physio.Percent(89)), FiO2: ptr(physio.FractionOf(0.40)), Device: "Venturi 40%", Flow: ptr(physio.LitresPerMinute(8))}})
	misread := add(&Entry{Transport: air, Kind: KindGauge, At: at(60), Gauge: &GaugeReading{Cylinder: "E1", Pressure: physio.Psi(1350)}})
	add(&Entry{Transport: air, Kind: KindEvent, At: at(88), Event: &Event{Type: EventLanding}})
	add(&Entry{Transport: air, Kind: KindGauge, At: at(95), Gauge: &GaugeReading{Cylinder: "W10", Pressure: physio.Bar(175)}})
	add(&Entry{Transport: air, Kind: KindEvent, At: at(110), Event: &Event{Type: EventHandover}})
	add(&Entry{Transport: air, Kind: KindClose, At: at(112), Close: &Closing{Outcome: "handed over, stable on Venturi 40%"}})
	add(&Entry{Transport: air, Kind: KindAmend, At: at(60), Amends: misread, Reason: "gauge read again at handover: 1150 psi, not 1350",
		Gauge: &GaugeReading{Cylinder: "E1", Pressure: physio.Psi(1150)}})

	road := NewTransportID(start.Add(6 * time.Hour))
	rs := start.Add(6 * time.Hour)
	add(&Entry{Transport: road, Kind: KindOpen, At: rs, Open: &Opening{
		Vehicle: "road ambulance", Crew: []string{"JT"},
		Origin:      Place{Name: "Harbour Referral Hospital (demo)", Elevation: physio.Metres(20), ElevationKnown: true},
		Destination: Place{Name: "Dune Rehabilitation Unit (demo)"},
		Patient:     Patient{AgeBand: AgeChild, Sex: SexFemale},
		Cylinders:   []CylinderSpec{{Label: "D1", Size: "D"}},
	}})
	add(&Entry{Transport: road, Kind: KindNote, At: rs.Add(3 * time.Minute), Note: &Note{Text: "room air, no oxygen needed so far"}})

	var b bytes.Buffer
	if err := v.Export(ctx, &b); err != nil {
		t.Fatal(err)
	}
	if err := os.WriteFile(demoPath, b.Bytes(), 0o644); err != nil {
		t.Fatal(err)
	}
}
