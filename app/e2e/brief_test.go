//go:build !wasm

package e2e

import (
	"fmt"
	"math"
	"strconv"
	"strings"
	"testing"
	"time"

	"github.com/shopspring/decimal"

	"alvea/physio"
)

// briefScenario is a transport of our own (invented for the test): a
// pressurised fixed-wing transfer from a field at 1000 ft to one at
// 5000 ft, a patient on a nasal cannula, two E cylinders.
func briefScenario() *physio.PlanDocument {
	v := physio.PlanValue
	two := 2
	return &physio.PlanDocument{
		Version: physio.PlanDocumentVersion,
		Route: physio.PlanRoute{
			OriginElevationFt: v(1000), DestinationElevationFt: v(5000),
			CruiseAltitudeFt: v(25000), MaxDifferentialPsi: v(6.5),
		},
		Legs: []physio.PlanLeg{
			{Where: "origin", Minutes: v(20), Oxygen: &physio.PlanOxygen{Device: physio.NasalCannula, FlowLpm: v(2)}},
			{Where: "cabin", Minutes: v(90), Oxygen: &physio.PlanOxygen{Device: physio.SimpleMask, FlowLpm: v(6)}},
			{Where: "destination", Minutes: v(15), Oxygen: &physio.PlanOxygen{Device: physio.NasalCannula, FlowLpm: v(2)}},
		},
		Patient: physio.PlanPatient{FiO2: v(0.28), PaO2MmHg: v(85), PaCO2MmHg: v(40), HbGPerDL: v(13), AgeYears: v(60), MeasuredAt: "origin"},
		Supply:  []physio.PlanSupply{{Size: physio.SizeE, PressurePsi: v(2000), Count: &two}},
		// The Settings defaults: 200 psi, 1.5 ×, 30 min, 94 %.
		Policy: &physio.PlanPolicy{ResidualPsi: v(200), ReserveFactor: v(1.5), ReserveMinutes: v(30), SpO2TargetPercent: v(94)},
	}
}

// pick chooses an option of a <select> as a tap on the option would, and
// fires the change event the browser fires then.
func (b *browser) pick(sel, value string) {
	b.t.Helper()
	ok := eval[bool](b, fmt.Sprintf(`(() => { const e = document.querySelector(%q); if (!e) return false;
		e.focus(); e.value = %q; e.dispatchEvent(new Event("change", {bubbles: true})); return e.value === %q })()`, sel, value, value))
	if !ok {
		b.t.Fatalf("select %s: no option %q", sel, value)
	}
}

func (b *browser) waitExists(sel string) {
	b.t.Helper()
	b.waitFor(sel, fmt.Sprintf(`document.querySelector(%q) !== null`, sel), 10*time.Second)
}

// fillBrief types the scenario into the Brief as a crew would.
func fillBrief(b *browser) {
	b.t.Helper()
	b.typeInto("#b-rt-origin", "1000")
	b.typeInto("#b-rt-destination", "5000")
	b.tap("#b-rt-mode-pressurised")
	b.waitExists("#b-rt-diff")
	b.typeInto("#b-rt-cruise", "25000")
	b.typeInto("#b-rt-diff", "6.5")

	legs := []struct{ min, device, flow string }{{"20", "nasal_cannula", "2"}, {"90", "simple_mask", "6"}, {"15", "nasal_cannula", "2"}}
	for i, l := range legs {
		p := fmt.Sprintf("#b-leg%d-", i)
		b.typeInto(p+"min", l.min)
		b.pick(p+"device", l.device)
		b.waitExists(p + "flow")
		b.typeInto(p+"flow", l.flow)
	}

	b.typeInto("#b-pt-fio2", "0.28")
	b.typeInto("#b-pt-pao2", "85")
	b.typeInto("#b-pt-paco2", "40")
	b.typeInto("#b-pt-hb", "13")
	b.typeInto("#b-pt-age", "60")

	b.pick("#b-sup0-kind", "E")
	b.typeInto("#b-sup0-pressure", "2000")
	b.typeInto("#b-sup0-count", "2")
}

// shown returns the number and unit displayed for a result figure.
func (b *browser) shown(id string) (string, string) {
	b.t.Helper()
	return b.text("#" + id + "-v"), b.text("#" + id + "-u")
}

// A crew fills the whole Brief; what it shows matches physio.ComputePlan
// for the same inputs; the units follow Settings; a bad value shows its
// range and unit and takes every number out of the result area; the draft
// survives a reload; axe-core finds nothing serious; screenshots for review.
func TestBriefFullPlan(t *testing.T) {
	want, err := physio.ComputePlan(briefScenario())
	if err != nil {
		t.Fatalf("physio on the scenario: %v", err)
	}
	srv := startApp(t, repoRoot)
	b := newBrowser(t, t.TempDir())
	b.open(srv.URL("/"))

	// An empty form: no plan, no number, a list of what to fill in.
	if got := eval[string](b, `document.querySelector("#b-status")?.dataset.status ?? ""`); got != "incomplete" {
		t.Fatalf("empty brief status = %q, want incomplete", got)
	}
	fillBrief(b)
	b.waitFor("the plan", `document.querySelector("#b-r-need-v") !== null`, 15*time.Second)

	check := func(id string, wantNum physio.Number, wantUnit string) {
		t.Helper()
		num, unit := b.shown(id)
		if num != wantNum.String() || unit != wantUnit {
			t.Errorf("%s shows %q %q; physio.ComputePlan gives %s %s", id, num, unit, wantNum, wantUnit)
		}
	}
	check("b-r-cabin", *want.CabinAltitudeFt, "ft")
	check("b-r-fio2", want.FiO2Needed, "")
	check("b-r-need", want.OxygenNeededL, "L")
	check("b-r-usable", want.OxygenUsableL, "L")
	check("b-r-margin", want.OxygenMarginL, "L")
	for i, l := range want.Legs {
		check(fmt.Sprintf("b-r-leg%d-fio2", i), l.FiO2Needed, "")
		check(fmt.Sprintf("b-r-leg%d-litres", i), l.OxygenL, "L")
		check(fmt.Sprintf("b-r-leg%d-pao2", i), l.PaO2ExpectedMmHg, "mmHg")
	}
	if got := eval[string](b, `document.querySelector("#b-status").dataset.status`); got != want.Status {
		t.Errorf("status shown %q, physio gives %q", got, want.Status)
	}
	// Every warning physio raises is shown, by its code.
	for _, w := range want.Warnings {
		if !b.exists(fmt.Sprintf(`#b-warnings [data-code=%q]`, w.Code)) {
			t.Errorf("warning %s (%s) is not shown", w.Code, w.Message)
		}
	}

	// "How" beside the cabin altitude: formula, inputs, source, rounding.
	b.tap("#b-r-cabin-how > summary")
	b.waitExists("#b-r-cabin-how .b-how")
	how := b.text("#b-r-cabin-how .b-how")
	f, _ := want.Explain.Get("cabin_altitude_ft")
	for _, part := range []string{f.Formula, f.Source, "up, the safe side", "cruise altitude = 25000 ft", "max differential = 6.5 psi"} {
		if !strings.Contains(how, part) {
			t.Errorf("How of the cabin altitude %q lacks %q", how, part)
		}
	}

	// A bad value: its range and unit beside it, and no number in the result.
	b.typeInto("#b-rt-origin", "30000")
	b.waitExists("#b-rt-origin-msg")
	msg := b.text("#b-rt-origin-msg")
	if !strings.Contains(msg, "between -2000 and 18000 ft") || !strings.Contains(msg, "30000 ft") {
		t.Errorf("origin message = %q, want the range in ft and the value entered", msg)
	}
	if got := eval[string](b, `document.querySelector("#b-rt-origin").getAttribute("aria-describedby")`); !strings.Contains(got, "b-rt-origin-msg") {
		t.Errorf("aria-describedby = %q, want it to name the message", got)
	}
	b.waitFor("the result to drop its numbers", `document.querySelector("#b-status").dataset.status === "incomplete"`, 10*time.Second)
	if n := eval[int](b, `document.querySelectorAll("#b-result .alv-num, #b-result .b-fig, #b-result table").length`); n != 0 {
		t.Errorf("the result area still shows %d figures with an invalid field", n)
	}
	if txt := b.text("#b-result"); strings.Contains(txt, "NaN") || strings.Contains(txt, "Inf") || strings.Contains(txt, want.OxygenNeededL.String()+" L") {
		t.Errorf("result area with an invalid field shows %q", txt)
	}
	b.typeInto("#b-rt-origin", "1000")
	b.waitFor("the plan back", `document.querySelector("#b-r-need-v")?.textContent === "`+want.OxygenNeededL.String()+`"`, 10*time.Second)

	// Units from Settings: metres and kPa, then back to the Brief.
	b.tap("#tab-settings")
	b.waitExists("#set-altitude-m")
	b.tap("#set-altitude-m")
	b.tap("#set-gas-kPa")
	b.tap("#tab-brief")
	b.waitFor("the cabin in metres", `document.querySelector("#b-r-cabin-u")?.textContent === "m"`, 10*time.Second)
	// 1 ft = 0.3048 m exactly (international foot, 1959); GNU units checks
	// the conversion of the origin field as shown.
	if got, oracle := b.value("#b-rt-origin"), unitsConvert(t, "1000 ft", "m"); !sameNumber(got, oracle) {
		t.Errorf("origin shown as %q m; GNU units gives %s m", got, oracle)
	}
	cabinM, _ := physio.Round(physio.Feet(want.CabinAltitudeFt.InexactFloat64()).Metres(), 0, physio.RoundUp)
	check("b-r-cabin", physio.Number{Decimal: cabinM}, "m")
	pao2k, _ := physio.Round(physio.MmHg(want.Legs[1].PaO2ExpectedMmHg.InexactFloat64()).Kilopascals(), 1, physio.RoundDown)
	check("b-r-leg1-pao2", physio.Number{Decimal: pao2k}, "kPa")
	check("b-r-need", want.OxygenNeededL, "L") // unchanged: the stored values are the ones typed in ft
	// The plan's warnings give their altitudes in metres as well, physio's
	// feet kept in brackets; GNU units gives the conversion, rounded here
	// to the metre.
	converted := 0
	for i, w := range want.Warnings {
		for _, where := range []struct{ name, ft string }{{"origin", "1000"}, {"destination", "5000"}} {
			from := "(" + where.name + ", " + where.ft + " ft)"
			if !strings.Contains(w.Message, from) {
				continue
			}
			m, err := strconv.ParseFloat(unitsConvert(t, where.ft+" ft", "m"), 64)
			if err != nil {
				t.Fatal(err)
			}
			shown := "(" + where.name + ", " + strconv.FormatFloat(math.Round(m), 'f', 0, 64) + " m (" + where.ft + " ft))"
			if got := b.text(fmt.Sprintf("#b-warn%d-msg", i)); !strings.Contains(got, shown) {
				t.Errorf("warning %d in metres = %q, want it to contain %q", i, got, shown)
			}
			converted++
		}
	}
	if converted == 0 {
		t.Error("the scenario has no warning naming a field altitude: nothing checked the warnings in metres")
	}

	// The draft survives a reload (saved a moment after the last key):
	// route, legs and cylinders at once. With no logbook the patient block
	// is kept in memory only, so it is empty after the reload and its card
	// says why (draft_test.go reloads with the logbook: the patient block
	// comes back, sealed).
	b.waitFor("the draft saved", `(localStorage.getItem("alvea.brief.draft") ?? "").includes("25000")`, 10*time.Second)
	b.reload()
	b.waitFor("the draft after reload", `document.querySelector("#b-leg1-flow")?.value === "6"`, 15*time.Second)
	for sel, want := range map[string]string{"#b-rt-diff": "6.5", "#b-leg0-min": "20", "#b-leg2-flow": "2", "#b-sup0-count": "2"} {
		if got := b.value(sel); got != want {
			t.Errorf("after reload %s = %q, want %q", sel, got, want)
		}
	}
	if got := b.value("#b-pt-fio2"); got != "" {
		t.Errorf("after reload with no logbook patient FiO2 = %q, want empty (memory only)", got)
	}
	b.waitFor("the note on the patient card", `(document.querySelector("#b-pt-kept")?.textContent ?? "").includes("Create the logbook")`, 10*time.Second)
	if note := b.text("#b-pt-kept"); !strings.Contains(note, "only in memory") {
		t.Errorf("patient card note = %q", note)
	}
	// Patient values back (typed again, with their unit: the display is
	// in kPa now): the plan as before.
	b.typeInto("#b-pt-fio2", "0.28")
	b.typeInto("#b-pt-pao2", "85 mmHg")
	b.typeInto("#b-pt-paco2", "40 mmHg")
	b.typeInto("#b-pt-hb", "13")
	b.typeInto("#b-pt-age", "60")
	b.waitFor("the plan after reload", `document.querySelector("#b-r-need-v")?.textContent === "`+want.OxygenNeededL.String()+`"`, 15*time.Second)

	// Accessibility and screenshots.
	if v := b.axe(); len(v) > 0 {
		t.Errorf("axe-core: %d serious or critical violations: %+v", len(v), v)
	}
	b.tap("#b-r-fio2-how > summary")
	b.screenshot("brief", 1024, 768)
	b.screenshot("brief", 768, 1024)
	if off := b.requestsNotFrom(srv.Origin()); len(off) > 0 {
		t.Errorf("requests to other origins: %q", off)
	}
}

// sameNumber compares two decimal texts numerically (GNU units may print
// trailing digits differently).
func sameNumber(a, b string) bool {
	x, err1 := decimal.NewFromString(strings.TrimSpace(a))
	y, err2 := decimal.NewFromString(strings.TrimSpace(b))
	if err1 != nil || err2 != nil {
		fa, e1 := strconv.ParseFloat(a, 64)
		fb, e2 := strconv.ParseFloat(b, 64)
		return e1 == nil && e2 == nil && math.Abs(fa-fb) < 1e-9
	}
	return x.Equal(y)
}
