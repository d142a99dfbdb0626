package cli

import (
	"bytes"
	"context"
	"encoding/json"
	"os"
	"path/filepath"
	"strings"
	"testing"
	"time"

	"alvea/app/logbook"
	"alvea/physio"
)

// The audit CLI runs on a bundle built here through the logbook API, in a
// scenario of our own (invented places, crews and readings; demo data
// only). Its summary, CSV and JSON are golden files under testdata/audit,
// refreshed only with go test ./app/cli -update.

const auditDir = "../../testdata/audit"

const auditPass = "quiet-harbour-compass-58" // test-only passphrase

// transportID makes a valid id with a fixed random part (the check
// character as in logbook.TransportID: Crockford mod-37 over the six).
func transportID(date, six string) logbook.TransportID {
	const alphabet = "0123456789ABCDEFGHJKMNPQRSTVWXYZ*~$=U"
	sum := 0
	for _, c := range six {
		sum = (sum*32 + strings.IndexRune(alphabet[:32], c)) % 37
	}
	return logbook.TransportID("T" + date + "-" + six + string(alphabet[sum]))
}

// scenarioBrief computes a plan with the engine and snapshots it, as the
// Brief screen does.
func scenarioBrief(t *testing.T, doc string) *logbook.Brief {
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
	return &logbook.Brief{Plan: json.RawMessage(doc), Result: out, EngineVersion: res.EngineVersion}
}

const rotorPlan = `{"version": 1, "title": "Fell Station to Estuary Hospital (demo)",
 "route": {"origin_elevation_ft": 3900, "destination_elevation_ft": 30, "cruise_altitude_ft": 7500},
 "legs": [
  {"label": "loading", "where": "origin", "minutes": 15, "oxygen": {"device": "nasal_cannula", "flow_lpm": 3}},
  {"label": "flight", "where": "cabin", "minutes": 50, "oxygen": {"device": "nasal_cannula", "flow_lpm": 4}},
  {"label": "to the ward", "where": "destination", "minutes": 10, "oxygen": {"device": "nasal_cannula", "flow_lpm": 2}}],
 "patient": {"fio2": 0.21, "spo2_percent": 92, "paco2_mmhg": 40},
 "supply": [{"name": "E", "size": "E", "pressure_psi": 1000, "count": 2}],
 "policy": {"residual_psi": 200, "reserve_factor": 1.5}}`

const roadPlan = `{"version": 1, "title": "Ridge Post to Valley Base (demo)",
 "route": {"origin_elevation_ft": 2000, "destination_elevation_ft": 600},
 "legs": [{"label": "road", "where": "origin", "minutes": 90, "oxygen": {"device": "simple_mask", "flow_lpm": 6}}],
 "patient": {"fio2": 0.21, "spo2_percent": 95, "paco2_mmhg": 40},
 "supply": [{"name": "10 L", "water_capacity_l": 10, "pressure_bar": 200, "count": 1}],
 "policy": {"residual_bar": 14, "reserve_factor": 2}}`

// buildScenario writes the demo bundle and returns its path and the
// record number of its last record.
func buildScenario(t *testing.T, dir string) (string, uint64) {
	t.Helper()
	ctx := context.Background()
	v, err := logbook.Create(ctx, logbook.NewMemStore(), auditPass, logbook.MinimumKDF)
	if err != nil {
		t.Fatal(err)
	}
	defer v.Lock()
	v.SetAutoLock(0, nil)
	var last uint64
	add := func(id logbook.TransportID, start time.Time, minute float64, e *logbook.Entry) uint64 {
		t.Helper()
		e.Transport, e.At = id, start.Add(physio.Minutes(minute))
		if e.Kind == 0 {
			switch {
			case e.Open != nil:
				e.Kind = logbook.KindOpen
			case e.Event != nil:
				e.Kind = logbook.KindEvent
			case e.Gauge != nil:
				e.Kind = logbook.KindGauge
			case e.Observe != nil:
				e.Kind = logbook.KindObserve
			case e.Brief != nil:
				e.Kind = logbook.KindBrief
			case e.Close != nil:
				e.Kind = logbook.KindClose
			case e.Note != nil:
				e.Kind = logbook.KindNote
			}
		}
		ie, err := v.Append(ctx, e)
		if err != nil {
			t.Fatal(err)
		}
		last = ie.Seq
		return ie.Seq
	}
	spo2 := func(p float64) *physio.Fraction { f := physio.Percent(p); return &f }
	fio2 := func(x float64) *physio.Fraction { f := physio.FractionOf(x); return &f }
	flow := func(x float64) *physio.Flow { f := physio.LitresPerMinute(x); return &f }
	alt := func(ft float64) *physio.Altitude { a := physio.Feet(ft); return &a }

	// 1. Rotor transport: two E cylinders, a dip in SpO2, a late change, a
	// correction after the close.
	s1 := time.Date(2031, 5, 3, 6, 40, 0, 0, time.UTC)
	r := transportID("20310503", "4K7QM2")
	add(r, s1, 0, &logbook.Entry{Open: &logbook.Opening{
		Vehicle: "rotor, unpressurised", Crew: []string{"JW", "MT"},
		Origin:      logbook.Place{Name: "Fell Station", Elevation: physio.Feet(3900), ElevationKnown: true},
		Destination: logbook.Place{Name: "Estuary Hospital", Elevation: physio.Feet(30), ElevationKnown: true},
		Patient:     logbook.Patient{AgeBand: logbook.AgeOlderAdult, Sex: logbook.SexMale, WeightKg: 82, Identifying: "DEMO-IDENTIFYING-MARKER"},
		Brief:       scenarioBrief(t, rotorPlan),
		Cylinders:   []logbook.CylinderSpec{{Label: "E1", Size: "E"}, {Label: "E2", Size: "E"}},
	}})
	add(r, s1, 1, &logbook.Entry{Gauge: &logbook.GaugeReading{Cylinder: "E1", Pressure: physio.Psi(1000)}})
	add(r, s1, 1, &logbook.Entry{Gauge: &logbook.GaugeReading{Cylinder: "E2", Pressure: physio.Psi(1000)}})
	add(r, s1, 2, &logbook.Entry{Observe: &logbook.Observation{SpO2: spo2(95), FiO2: fio2(0.32), Device: "nasal cannula", Flow: flow(3)}})
	add(r, s1, 15, &logbook.Entry{Event: &logbook.Event{Type: logbook.EventLiftOff}})
	add(r, s1, 25, &logbook.Entry{Event: &logbook.Event{Type: logbook.EventTopOfClimb, CabinAltitude: alt(7500)}})
	add(r, s1, 30, &logbook.Entry{Observe: &logbook.Observation{SpO2: spo2(91)}})
	add(r, s1, 38, &logbook.Entry{Observe: &logbook.Observation{SpO2: spo2(90), FiO2: fio2(0.36), Flow: flow(4)}})
	add(r, s1, 40, &logbook.Entry{Brief: scenarioBrief(t, strings.Replace(rotorPlan, `"flow_lpm": 4`, `"flow_lpm": 5`, 1))})
	add(r, s1, 45, &logbook.Entry{Observe: &logbook.Observation{SpO2: spo2(94)}})
	add(r, s1, 65, &logbook.Entry{Event: &logbook.Event{Type: logbook.EventLanding}})
	add(r, s1, 71, &logbook.Entry{Gauge: &logbook.GaugeReading{Cylinder: "E1", Pressure: physio.Psi(150)}})
	add(r, s1, 72, &logbook.Entry{Event: &logbook.Event{Type: logbook.EventCylinderChange, Cylinder: "E2"}})
	add(r, s1, 75, &logbook.Entry{Event: &logbook.Event{Type: logbook.EventHandover}})
	e2 := add(r, s1, 76, &logbook.Entry{Gauge: &logbook.GaugeReading{Cylinder: "E2", Pressure: physio.Psi(600)}})
	add(r, s1, 80, &logbook.Entry{Close: &logbook.Closing{Outcome: "handed over"}})
	add(r, s1, 76, &logbook.Entry{Kind: logbook.KindAmend, Amends: e2, Reason: "gauge read again", Gauge: &logbook.GaugeReading{Cylinder: "E2", Pressure: physio.Psi(620)}})

	// 2. Road transport: one 10 L cylinder, on plan.
	s2 := time.Date(2031, 5, 9, 14, 5, 0, 0, time.UTC)
	g := transportID("20310509", "9XH3TB")
	add(g, s2, 0, &logbook.Entry{Open: &logbook.Opening{
		Vehicle: "road ambulance", Crew: []string{"RP"},
		Origin:      logbook.Place{Name: "Ridge Post"},
		Destination: logbook.Place{Name: "Valley Base"},
		Patient:     logbook.Patient{AgeBand: logbook.AgeChild},
		Brief:       scenarioBrief(t, roadPlan),
		Cylinders:   []logbook.CylinderSpec{{Label: "W", WaterCapacity: physio.Litres(10)}},
	}})
	add(g, s2, 0, &logbook.Entry{Gauge: &logbook.GaugeReading{Cylinder: "W", Pressure: physio.Bar(200)}})
	add(g, s2, 1, &logbook.Entry{Observe: &logbook.Observation{SpO2: spo2(96), FiO2: fio2(0.45), Device: "simple mask", Flow: flow(6)}})
	add(g, s2, 2, &logbook.Entry{Event: &logbook.Event{Type: logbook.EventDepart}})
	add(g, s2, 50, &logbook.Entry{Observe: &logbook.Observation{SpO2: spo2(97)}})
	add(g, s2, 88, &logbook.Entry{Event: &logbook.Event{Type: logbook.EventArrive}})
	add(g, s2, 89, &logbook.Entry{Gauge: &logbook.GaugeReading{Cylinder: "W", Pressure: physio.Bar(150)}})
	add(g, s2, 95, &logbook.Entry{Close: &logbook.Closing{}})

	// 3. A transport still open, without a Brief.
	s3 := time.Date(2031, 5, 20, 22, 0, 0, 0, time.UTC)
	o := transportID("20310520", "0B8ZR5")
	add(o, s3, 0, &logbook.Entry{Open: &logbook.Opening{Vehicle: "road ambulance", Origin: logbook.Place{Name: "Ridge Post"}, Destination: logbook.Place{Name: "Valley Base"},
		Cylinders: []logbook.CylinderSpec{{Label: "D", Size: "D"}}}})
	add(o, s3, 0, &logbook.Entry{Gauge: &logbook.GaugeReading{Cylinder: "D", Pressure: physio.Psi(1900)}})

	var buf bytes.Buffer
	if err := v.Export(ctx, &buf); err != nil {
		t.Fatal(err)
	}
	path := filepath.Join(dir, "demo"+logbook.BundleExt)
	if err := os.WriteFile(path, buf.Bytes(), 0o600); err != nil {
		t.Fatal(err)
	}
	return path, last
}

func runAudit(args []string, stdin string) (int, string, string) {
	var out, errb bytes.Buffer
	code := Audit(args, strings.NewReader(stdin), &out, &errb)
	return code, out.String(), errb.String()
}

func writePass(t *testing.T, dir, pass string) string {
	t.Helper()
	p := filepath.Join(dir, "pass.txt")
	if err := os.WriteFile(p, []byte(pass+"\n"), 0o600); err != nil {
		t.Fatal(err)
	}
	return p
}

func golden(t *testing.T, name string, got []byte) {
	t.Helper()
	path := filepath.Join(auditDir, name)
	if *updateGolden {
		if err := os.MkdirAll(auditDir, 0o755); err != nil {
			t.Fatal(err)
		}
		if err := os.WriteFile(path, got, 0o644); err != nil {
			t.Fatal(err)
		}
	}
	want, err := os.ReadFile(path)
	if err != nil {
		t.Fatalf("%v (run go test ./app/cli -update to create it)", err)
	}
	if !bytes.Equal(got, want) {
		t.Errorf("%s differs from the golden file (go test ./app/cli -update refreshes it after review):\n%s", name, got)
	}
}

func TestAuditGolden(t *testing.T) {
	dir := t.TempDir()
	bundle, _ := buildScenario(t, dir)
	old := time.Date(2031, 6, 1, 12, 0, 0, 0, time.UTC)
	if err := os.Chtimes(bundle, old, old); err != nil {
		t.Fatal(err)
	}
	before, _ := os.ReadFile(bundle)
	csvPath, jsonPath := filepath.Join(dir, "out.csv"), filepath.Join(dir, "out.json")
	code, out, errs := runAudit([]string{bundle, "--passphrase-file", writePass(t, dir, auditPass), "--csv", csvPath, "--json", jsonPath}, "")
	if code != ExitAuditOK || errs != "" {
		t.Fatalf("exit %d, stderr %q", code, errs)
	}
	golden(t, "demo.summary.txt", []byte(out))
	csvOut, _ := os.ReadFile(csvPath)
	golden(t, "demo.csv", csvOut)
	jsonOut, _ := os.ReadFile(jsonPath)
	golden(t, "demo.json", jsonOut)

	// The bundle is only read: same bytes, same modification time.
	after, _ := os.ReadFile(bundle)
	st, err := os.Stat(bundle)
	if err != nil || !bytes.Equal(before, after) || !st.ModTime().Equal(old) {
		t.Errorf("bundle changed: bytes equal %v, mtime %v (want %v)", bytes.Equal(before, after), st.ModTime(), old)
	}
	// Identifying fields stay out of the CSV and JSON by default.
	for _, marker := range []string{"DEMO-IDENTIFYING-MARKER", "Fell Station", "JW"} {
		if bytes.Contains(csvOut, []byte(marker)) {
			t.Errorf("CSV carries %q", marker)
		}
	}
	if bytes.Contains(jsonOut, []byte("DEMO-IDENTIFYING-MARKER")) {
		t.Error("JSON carries the patient's identifying text")
	}
	// Asked for, they are included.
	code, _, errs = runAudit([]string{bundle, "--passphrase-file", writePass(t, dir, auditPass), "--csv", csvPath, "--csv-include", "id,patient"}, "")
	csvOut, _ = os.ReadFile(csvPath)
	if code != ExitAuditOK || !bytes.Contains(csvOut, []byte("DEMO-IDENTIFYING-MARKER")) || !bytes.Contains(csvOut, []byte("T20310503-4K7QM2")) {
		t.Errorf("--csv-include: exit %d %s\n%s", code, errs, csvOut)
	}
}

func TestAuditPassphraseFromStdinAndFilters(t *testing.T) {
	dir := t.TempDir()
	bundle, _ := buildScenario(t, dir)
	// No terminal: one line from standard input.
	code, out, errs := runAudit([]string{"--vehicle", "road", "--from", "2031-05-09", "--to", "2031-05-09", bundle}, auditPass+"\n")
	if code != ExitAuditOK {
		t.Fatalf("exit %d: %s", code, errs)
	}
	if !strings.Contains(out, "Across transports (1)") || !strings.Contains(out, "T20310509-9XH3TB") || strings.Contains(out, "T20310503") {
		t.Errorf("filter by vehicle and date:\n%s", out)
	}
	code, out, _ = runAudit([]string{bundle, "--flag", "RESERVE_BREACHED,SPO2_BELOW_TARGET"}, auditPass)
	if code != ExitAuditOK || !strings.Contains(out, "Across transports (1)") || !strings.Contains(out, "T20310503-4K7QM2") {
		t.Errorf("filter by flags (exit %d):\n%s", code, out)
	}
}

func TestAuditTamperedExits3NamingRecord(t *testing.T) {
	dir := t.TempDir()
	bundle, last := buildScenario(t, dir)
	data, _ := os.ReadFile(bundle)
	// The last bytes before the 32-byte whole-file check belong to the last
	// record's body.
	data[len(data)-32-5] ^= 0x40
	tampered := filepath.Join(dir, "tampered"+logbook.BundleExt)
	if err := os.WriteFile(tampered, data, 0o600); err != nil {
		t.Fatal(err)
	}
	code, out, _ := runAudit([]string{tampered, "--passphrase-file", writePass(t, dir, auditPass)}, "")
	if code != ExitAuditDamaged {
		t.Fatalf("exit %d, want %d:\n%s", code, ExitAuditDamaged, out)
	}
	if !strings.Contains(out, logbook.RecordName(last)+" ") || !strings.Contains(out, "VERIFICATION FAILED") {
		t.Errorf("record %s not named:\n%s", logbook.RecordName(last), out)
	}
	// Not a bundle at all.
	junk := filepath.Join(dir, "junk")
	os.WriteFile(junk, []byte("not a bundle"), 0o600)
	if code, _, _ := runAudit([]string{junk}, auditPass); code != ExitAuditDamaged {
		t.Errorf("junk file: exit %d", code)
	}
}

func TestAuditWrongPassphraseExits4(t *testing.T) {
	dir := t.TempDir()
	bundle, _ := buildScenario(t, dir)
	code, out, errs := runAudit([]string{bundle, "--passphrase-file", writePass(t, dir, "wrong-but-long-passphrase")}, "")
	if code != ExitAuditPassphrase || out != "" || !strings.Contains(errs, "wrong passphrase") {
		t.Errorf("exit %d, stdout %q, stderr %q", code, out, errs)
	}
}

func TestAuditUsageExits2(t *testing.T) {
	dir := t.TempDir()
	bundle := filepath.Join(dir, "b"+logbook.BundleExt)
	os.WriteFile(bundle, []byte("x"), 0o600)
	for _, args := range [][]string{
		{},
		{bundle, bundle},
		{bundle, "--nope"},
		{bundle, "--flag", "NOT_A_CODE"},
		{bundle, "--from", "03/05/2031"},
		{bundle, "--from", "2031-06-01", "--to", "2031-05-01"},
		{bundle, "--spo2-target", "120"},
		{bundle, "--spo2-limit", "-1"},
		{bundle, "--csv-include", "id"},
		{bundle, "--csv", "o.csv", "--csv-include", "name"},
		{bundle, "--json", bundle},
		{filepath.Join(dir, "missing")},
		{bundle, "--passphrase-file", filepath.Join(dir, "missing")},
	} {
		if code, _, errs := runAudit(args, ""); code != ExitUsage || errs == "" {
			t.Errorf("%q: exit %d, stderr %q", args, code, errs)
		}
	}
	if code, out, _ := runAudit([]string{"-h"}, ""); code != 0 || !strings.Contains(out, "usage: alvea audit") {
		t.Errorf("-h: exit %d", code)
	}
}
