package logbook

import (
	"encoding/json"
	"testing"

	"alvea/physio"
)

// FuzzAuditBriefResult: any bytes stored as a Brief's result in a bundle.
// The audit never panics; a result it accepts has the plan's bounds
// (implausibleResult), its planned figures are never negative, and the
// audit encodes as JSON (no NaN or infinity reaches it). Seeds: the
// hand-written result of the audit tests, the demo's engine result, and
// the refused shapes of TestAuditRefusesImplausibleBriefResult.
func FuzzAuditBriefResult(f *testing.F) {
	f.Add([]byte(handResult))
	doc, err := physio.ParsePlan([]byte(demoRotorPlan))
	if err != nil {
		f.Fatal(err)
	}
	res, err := physio.ComputePlan(doc)
	if err != nil {
		f.Fatal(err)
	}
	engine, err := json.Marshal(res)
	if err != nil {
		f.Fatal(err)
	}
	f.Add(engine)
	for _, s := range []string{`{}`, `[]`, `null`, `{"engine_version":"x","legs":[{"minutes":1}]}`,
		`{"engine_version":"x","oxygen_calculated_l":1e400,"legs":[{"minutes":1,"oxygen_l":1e400}]}`,
		`{"engine_version":"x","oxygen_calculated_l":-5,"legs":[{"minutes":1,"oxygen_l":-5}]}`} {
		f.Add([]byte(s))
	}
	f.Fuzz(func(t *testing.T, result []byte) {
		b := newAuditBuilder()
		b.add(0, &Entry{Open: &Opening{
			Vehicle:   "fuzz",
			Brief:     &Brief{Plan: json.RawMessage(demoRotorPlan), Result: json.RawMessage(result), EngineVersion: "fuzz"},
			Cylinders: []CylinderSpec{{Label: "E", Size: "E"}},
		}})
		b.gauge(0, "E", physio.Psi(2000))
		b.spo2(10, 90)
		b.event(60, EventArrive)
		b.gauge(61, "E", physio.Psi(500))
		a := b.audit(AuditOptions{})
		for _, x := range []Amount{a.Oxygen.PlannedL, a.Oxygen.PlannedWithReserveL, a.Oxygen.PlannedUsableL, a.Oxygen.ReserveRequiredL} {
			if d, ok := x.Decimal(); ok && d.Sign() < 0 {
				t.Fatalf("negative planned figure %s from %q", x, result)
			}
		}
		if _, err := json.Marshal(a); err != nil {
			t.Fatalf("audit does not encode: %v (result %q)", err, result)
		}
	})
}
