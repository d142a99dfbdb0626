//go:build !wasm

package e2e

import (
	"encoding/json"
	"fmt"
	"strconv"
	"testing"
	"time"

	"github.com/chromedp/chromedp"
	"github.com/shopspring/decimal"

	"alvea/physio"
)

// The Brief draft as the app keeps it in localStorage (app/ui/draft.go):
// route, legs, supply and policy under one key, each field as typed with
// the display unit it was typed under. The patient block is not part of it.
const draftStorageKey = "alvea.brief.draft"

// draftPatientStorageKey is where an earlier version kept the patient
// block in plain storage; the Brief moves it into memory when it loads.
const draftPatientStorageKey = "alvea.brief.patient"

type seedEntry struct {
	T string `json:"t,omitempty"`
	U string `json:"u,omitempty"`
}

type seedLeg struct {
	Where   string    `json:"where"`
	Minutes seedEntry `json:"minutes"`
	Device  string    `json:"device"`
	Flow    seedEntry `json:"flow"`
}

type seedSupply struct {
	Kind          string    `json:"kind"`
	WaterCapacity seedEntry `json:"waterCapacity"`
	Pressure      seedEntry `json:"pressure"`
	Count         seedEntry `json:"count"`
}

type seedDraft struct {
	Schema int `json:"schema"`
	Route  struct {
		Origin        seedEntry `json:"origin"`
		Destination   seedEntry `json:"destination"`
		Cruise        seedEntry `json:"cruise"`
		Cabin         string    `json:"cabin"`
		Differential  seedEntry `json:"differential"`
		CabinAltitude seedEntry `json:"cabinAltitude"`
	} `json:"route"`
	Legs   []seedLeg    `json:"legs"`
	Supply []seedSupply `json:"supply"`
	Policy struct {
		Override   bool      `json:"override"`
		Residual   seedEntry `json:"residual"`
		Factor     seedEntry `json:"factor"`
		Minutes    seedEntry `json:"minutes"`
		SpO2Target seedEntry `json:"spo2Target"`
	} `json:"policy"`
}

type seedPatient struct {
	Schema  int `json:"schema"`
	Patient struct {
		FiO2        seedEntry `json:"fio2"`
		PaO2        seedEntry `json:"pao2"`
		PaCO2       seedEntry `json:"paco2"`
		RQ          seedEntry `json:"rq"`
		Temperature seedEntry `json:"temperature"`
		MeasuredAt  string    `json:"measuredAt"`
	} `json:"patient"`
}

// openBlank loads a plain file of the app's origin (no app on it), so that
// storage can be seeded before the app first starts.
func (b *browser) openBlank(srv *testServer) {
	b.t.Helper()
	b.must("navigate to a plain file", chromedp.Navigate(srv.URL("/web/icon.svg")))
}

// seedDraft stores a Brief draft and its patient block in the app's origin
// before any page of the app runs (from a plain file of that origin).
func (b *browser) seedDraft(srv *testServer, draft, patient any) {
	b.t.Helper()
	b.openBlank(srv)
	b.seedStorage(draftStorageKey, draft)
	b.seedStorage(draftPatientStorageKey, patient)
}

// seedStorage writes key = JSON of v into the page's localStorage.
func (b *browser) seedStorage(key string, v any) {
	b.t.Helper()
	raw, err := json.Marshal(v)
	if err != nil {
		b.t.Fatal(err)
	}
	eval[bool](b, fmt.Sprintf(`(() => { localStorage.setItem(%q, %q); return true })()`, key, string(raw)))
}

// supplyDraftScenario is a transport of our own (invented for the test):
// an unpressurised flight at 9500 ft, two E cylinders at 1900 psi and a
// 10 L water-capacity cylinder at 200 bar, and a reserve policy of the
// Brief's own (300 psi residual, 20 min) that differs from the Settings
// defaults (200 psi, 30 min). No patient: Supply does not need one.
func supplyDraftScenario() seedDraft {
	var d seedDraft
	d.Schema = 1
	d.Route.Origin = seedEntry{"300", "ft"}
	d.Route.Destination = seedEntry{"1200", "ft"}
	d.Route.Cabin = "unpressurised"
	d.Route.Cruise = seedEntry{"9500", "ft"}
	d.Legs = []seedLeg{
		{Where: "origin", Minutes: seedEntry{"15", ""}, Device: "nasal_cannula", Flow: seedEntry{"2", ""}},
		{Where: "cabin", Minutes: seedEntry{"80", ""}, Device: "simple_mask", Flow: seedEntry{"6", ""}},
		{Where: "destination", Minutes: seedEntry{"10", ""}, Device: "nasal_cannula", Flow: seedEntry{"2", ""}},
	}
	d.Supply = []seedSupply{
		{Kind: "E", Pressure: seedEntry{"1900", "psi"}, Count: seedEntry{"2", ""}},
		{Kind: "wc", WaterCapacity: seedEntry{"10", ""}, Pressure: seedEntry{"200", "bar"}, Count: seedEntry{"1", ""}},
	}
	d.Policy.Override = true
	d.Policy.Residual = seedEntry{"300", "psi"}
	d.Policy.Factor = seedEntry{"1.5", ""}
	d.Policy.Minutes = seedEntry{"20", ""}
	d.Policy.SpO2Target = seedEntry{"94", ""}
	return d
}

// usableL is physio's usable oxygen of a cylinder at gauge above residual.
func usableL(t *testing.T, c physio.Cylinder, gauge, residual physio.Pressure) physio.Volume {
	t.Helper()
	v, err := c.Usable(gauge, residual)
	if err != nil {
		t.Fatal(err)
	}
	return v
}

func floorL(v physio.Volume) string {
	d, _ := physio.Round(v.Litres(), 0, physio.RoundDown)
	return d.String()
}

// Supply adopts the Brief draft's cylinders (each line expanded by its
// count), its legs (marked on the plot) and its own reserve policy, with no
// patient in the draft; the countdown for the first cylinder is physio's.
func TestSupplyAdoptsBriefDraft(t *testing.T) {
	srv := startApp(t, repoRoot)
	b := newBrowser(t, t.TempDir())
	b.openBlank(srv)
	b.seedStorage(draftStorageKey, supplyDraftScenario())
	b.open(srv.URL("/supply"))

	b.waitFor("three cylinders from the draft", `document.querySelector("#supply-inuse-2") !== null`, 10*time.Second)
	if b.exists("#supply-inuse-3") {
		t.Error("more than the three cylinders of the draft (2 E + 1 water capacity)")
	}
	for i, want := range []string{"1 · E", "2 · E", "3 · WC 10 L"} {
		if got := b.text(fmt.Sprintf("#supply-inuse-%d", i)); got != want {
			t.Errorf("cylinder %d = %q, want %q", i+1, got, want)
		}
	}
	if b.exists("#supply-add") {
		t.Error("the cylinder list from the Brief can be edited here (it is changed on the Brief)")
	}

	e, err := physio.FactorCylinder(physio.SizeE)
	if err != nil {
		t.Fatal(err)
	}
	wc, err := physio.WaterCapacityCylinder(physio.Litres(10))
	if err != nil {
		t.Fatal(err)
	}
	residual := physio.Psi(300) // the Brief's own policy, not Settings' 200
	eFull := usableL(t, e, physio.Psi(1900), residual)
	wcFull := usableL(t, wc, physio.Bar(200), residual)
	// Hand-worked (REFERENCES §7, factor and V×P methods, common practice):
	// E: (1900 − 300) psi × 0.28 L/psi = 448 L; 10 L × (200 − 20.684) bar
	// = 1793.2 L (300 psi = 20.684 bar, GNU units).
	if floorL(eFull) != "448" || floorL(wcFull) != "1793" {
		t.Fatalf("physio usable E %v L, WC %v L; hand-worked 448 and 1793.2", eFull.Litres(), wcFull.Litres())
	}
	for id, want := range map[string]string{"#supply-cyl-0-usable": floorL(eFull), "#supply-cyl-1-usable": floorL(eFull), "#supply-cyl-2-usable": floorL(wcFull)} {
		if got := b.text(id); got != want+" L" {
			t.Errorf("%s = %q, want %s L", id, got, want)
		}
	}

	// A reading of the first cylinder: 1700 psi at 6 L/min.
	b.typeInto("#supply-gauge", "1700")
	b.typeInto("#supply-flow", "6")
	inUse := usableL(t, e, physio.Psi(1700), residual)
	d, err := physio.Endurance(inUse, physio.LitresPerMinute(6))
	if err != nil {
		t.Fatal(err)
	}
	// (1700 − 300) × 0.28 / 6 = 65.3 min (REFERENCES §7 formula).
	if int64(d/time.Minute) != 65 {
		t.Fatalf("physio gives %v, hand-worked 65.3 min", d)
	}
	checkCountdown(t, b, int64(d/time.Minute), d.Milliseconds())
	total := inUse + eFull + wcFull
	if got := b.text("#supply-total"); got != floorL(total) {
		t.Errorf("on board = %q L, want %s (in use + the two unopened cylinders)", got, floorL(total))
	}
	if got := b.text("#supply-usable"); got != floorL(inUse) {
		t.Errorf("usable in the cylinder in use = %q L, want %s", got, floorL(inUse))
	}
	// The Brief's reserve: 20 min at 6 L/min = 120 L (physio's policy).
	pol := physio.ReservePolicy{Residual: residual, Factor: 1, AddedMinutes: 20 * time.Minute}
	reserve, err := pol.Required(0, physio.LitresPerMinute(6))
	if err != nil {
		t.Fatal(err)
	}
	rd, _ := physio.Round(reserve.Litres(), 0, physio.RoundUp)
	if rd.String() != "120" {
		t.Fatalf("physio reserve %v L, hand-worked 120", reserve.Litres())
	}
	toReserve, err := physio.Endurance(total-reserve, physio.LitresPerMinute(6))
	if err != nil {
		t.Fatal(err)
	}
	at := eval[string](b, `document.querySelector("#supply-countdown").dataset.readingAt`)
	wantReserveAt := eval[string](b, fmt.Sprintf(`(() => { const d = new Date(Math.floor((%s + %d) / 60000) * 60000);
		return String(d.getHours()).padStart(2, "0") + ":" + String(d.getMinutes()).padStart(2, "0") })()`, at, toReserve.Milliseconds()))
	if got := b.text("#supply-reserve-at"); got != wantReserveAt {
		t.Errorf("reserve reached at %q, want %q", got, wantReserveAt)
	}

	// The plot marks the three legs and the Brief's reserve.
	b.waitFor("the plot", `document.querySelector("#supply-plot") !== null`, 10*time.Second)
	labels := eval[[]string](b, `[...document.querySelectorAll("#supply-plot .alv-plot-band-label")].map(e => e.textContent)`)
	wantLabels := []string{"Leg 1 (origin)", "Leg 2 (flight)", "Leg 3 (destination)"}
	if fmt.Sprint(labels) != fmt.Sprint(wantLabels) {
		t.Errorf("leg bands %q, want %q", labels, wantLabels)
	}
	if got := eval[int](b, `document.querySelectorAll("#supply-plot rect.alv-plot-band").length`); got != 3 {
		t.Errorf("%d leg bands drawn, want 3", got)
	}
	if !eval[bool](b, `[...document.querySelectorAll("#supply-plot text")].some(e => e.textContent === "Reserve 120 L")`) {
		t.Error("no reserve line at 120 L")
	}
}

// altitudeDraftScenario is a return transfer of our own (invented for the
// test): from a field at 500 ft to one at 4200 ft in an aircraft holding
// 6.2 psi at 27 000 ft, the patient breathing air, measured at the
// destination field, with a respiratory quotient and body temperature
// other than the defaults. The flight leg is on room air, so the plan's
// flight figures are those of the ground FiO2 that Altitude shows.
func altitudeDraftScenario() (seedDraft, seedPatient, *physio.PlanDocument) {
	var d seedDraft
	d.Schema = 1
	d.Route.Origin = seedEntry{"500", "ft"}
	d.Route.Destination = seedEntry{"4200", "ft"}
	d.Route.Cabin = "pressurised"
	d.Route.Cruise = seedEntry{"27000", "ft"}
	d.Route.Differential = seedEntry{"6.2", "psi"}
	d.Legs = []seedLeg{
		{Where: "origin", Minutes: seedEntry{"25", ""}, Device: "room_air"},
		{Where: "cabin", Minutes: seedEntry{"110", ""}, Device: "room_air"},
		{Where: "destination", Minutes: seedEntry{"20", ""}, Device: "nasal_cannula", Flow: seedEntry{"2", ""}},
	}
	d.Supply = []seedSupply{{Kind: "E", Pressure: seedEntry{"2000", "psi"}, Count: seedEntry{"2", ""}}}
	var p seedPatient
	p.Schema = 1
	p.Patient.FiO2 = seedEntry{"0.21", ""}
	p.Patient.PaO2 = seedEntry{"70", "mmHg"}
	p.Patient.PaCO2 = seedEntry{"38", "mmHg"}
	p.Patient.RQ = seedEntry{"0.9", ""}
	p.Patient.Temperature = seedEntry{"38.5", ""}
	p.Patient.MeasuredAt = "destination"

	v := physio.PlanValue
	two := 2
	doc := &physio.PlanDocument{
		Version: physio.PlanDocumentVersion,
		Route:   physio.PlanRoute{OriginElevationFt: v(500), DestinationElevationFt: v(4200), CruiseAltitudeFt: v(27000), MaxDifferentialPsi: v(6.2)},
		Legs: []physio.PlanLeg{
			{Where: "origin", Minutes: v(25), Oxygen: &physio.PlanOxygen{Device: physio.RoomAir}},
			{Where: "cabin", Minutes: v(110), Oxygen: &physio.PlanOxygen{Device: physio.RoomAir}},
			{Where: "destination", Minutes: v(20), Oxygen: &physio.PlanOxygen{Device: physio.NasalCannula, FlowLpm: v(2)}},
		},
		Patient: physio.PlanPatient{FiO2: v(0.21), PaO2MmHg: v(70), PaCO2MmHg: v(38), RQ: v(0.9), TemperatureC: v(38.5), MeasuredAt: "destination"},
		Supply:  []physio.PlanSupply{{Size: physio.SizeE, PressurePsi: v(2000), Count: &two}},
		Policy:  &physio.PlanPolicy{ResidualPsi: v(200), ReserveFactor: v(1.5), ReserveMinutes: v(30), SpO2TargetPercent: v(94)},
	}
	return d, p, doc
}

// floorText rounds a plan figure down to places (the Altitude screen's own
// places are coarser than the plan's and round the same way, so rounding
// the plan's figure again gives the screen's).
func floorText(n physio.Number, places int32) string {
	return n.Decimal.RoundFloor(places).String()
}

func ceilText(n physio.Number, places int32) string {
	return n.Decimal.RoundCeil(places).String()
}

// Altitude fills its route and patient fields from the Brief draft and
// shows the cabin altitude, the highest altitude, the oxygen at the cabin
// and the trapped-gas figures physio.ComputePlan gives for the same
// document.
func TestAltitudeAdoptsBriefDraft(t *testing.T) {
	draft, patient, doc := altitudeDraftScenario()
	want, err := physio.ComputePlan(doc)
	if err != nil {
		t.Fatalf("physio on the scenario: %v", err)
	}
	srv := startApp(t, repoRoot)
	b := newBrowser(t, t.TempDir())
	b.seedDraft(srv, draft, patient)
	b.open(srv.URL("/")) // the Brief loads the draft (and takes the patient block in)
	b.tap("#tab-altitude")
	b.waitFor("the route from the draft", `document.querySelector("#alt-cruise")?.value === "27000"`, 10*time.Second)

	fields := map[string]string{
		"#alt-origin": "500", "#alt-dest": "4200", "#alt-cruise": "27000", "#alt-diff": "6.2", "#alt-cabin-stated": "",
		"#alt-fio2": "0.21", "#alt-paco2": "38", "#alt-pao2-ground": "70", "#alt-rq": "0.9", "#alt-temp": "38.5",
	}
	for sel, w := range fields {
		if got := b.value(sel); got != w {
			t.Errorf("%s = %q, want %q from the draft", sel, got, w)
		}
	}
	if got := eval[string](b, `document.querySelector("#alt-measured-destination")?.getAttribute("aria-pressed") ?? ""`); got != "true" {
		t.Errorf("measured at destination not chosen (aria-pressed %q)", got)
	}
	// Set the cuff to 0 cmH2O: the plan's rigid-space figure is the rise
	// from 0.
	b.typeInto("#alt-cuff-p", "0")

	flight := want.Legs[1]
	if flight.Where != "cabin" {
		t.Fatalf("leg 2 is %q", flight.Where)
	}
	tg := want.TrappedGas
	checks := map[string]string{
		"#alt-cabin":     want.CabinAltitudeFt.String(),
		"#alt-highest":   want.HighestAltitudeFt.String(),
		"#alt-pao2-alv":  floorText(flight.PAO2MmHg, 0),
		"#alt-pao2-art":  floorText(flight.PaO2ExpectedMmHg, 0),
		"#alt-spo2":      floorText(flight.SpO2ExpectedPercent, 0),
		"#alt-ratio":     "×" + ceilText(tg.Ratio, 2),
		"#alt-cuff-vol":  ceilText(tg.CuffAtAltitudeMl, 1),
		"#alt-ptx-vol":   tg.PneumothoraxAltitudeMl.String(),
		"#alt-cuff-rise": tg.RigidOverpressureCmH2O.String(),
	}
	b.waitFor("the figures", fmt.Sprintf(`document.querySelector("#alt-cuff-rise")?.textContent === %q`, checks["#alt-cuff-rise"]), 10*time.Second)
	for sel, w := range checks {
		if got := b.text(sel); got != w {
			t.Errorf("%s = %q, want %q (physio.ComputePlan)", sel, got, w)
		}
	}
	// The cabin altitude is the plan's highest leg; the destination field
	// is below it.
	if c, _ := strconv.ParseFloat(want.CabinAltitudeFt.String(), 64); c < 4200 {
		t.Errorf("scenario: cabin %v ft below the destination", c)
	}
	// The plan's cabin altitude is the figure Altitude computes from cruise
	// and differential: a pilot's stated cabin altitude replaces it.
	b.typeInto("#alt-cabin-stated", "7000")
	b.waitFor("the stated cabin", `document.querySelector("#alt-cabin")?.textContent === "7000"`, 10*time.Second)
	stated := *doc
	stated.Route.CabinAltitudeFt = physio.PlanValue(7000)
	ws, err := physio.ComputePlan(&stated)
	if err != nil {
		t.Fatal(err)
	}
	if got, w := b.text("#alt-pao2-alv"), floorText(ws.Legs[1].PAO2MmHg, 0); got != w {
		t.Errorf("PAO2 at a stated 7000 ft cabin = %q, want %q", got, w)
	}
	if _, err := decimal.NewFromString(b.text("#alt-spo2")); err != nil {
		t.Errorf("SpO2 at the stated cabin is not a number: %q", b.text("#alt-spo2"))
	}
}
