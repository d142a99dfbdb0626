//go:build !wasm

package e2e

import (
	"fmt"
	"strconv"
	"strings"
	"testing"
	"time"

	"github.com/shopspring/decimal"

	"alvea/physio"
)

// supplyExpect computes, with physio, what the Supply screen must show for a
// reading of an E cylinder (cylinder factor method, REFERENCES §7) at gauge
// with the given residual and flow: the whole minutes left (rounded down)
// and the endurance in milliseconds.
func supplyExpect(t *testing.T, gauge, residual physio.Pressure, flowLpm float64) (int64, int64) {
	t.Helper()
	cyl, err := physio.FactorCylinder(physio.SizeE)
	if err != nil {
		t.Fatal(err)
	}
	usable, err := cyl.Usable(gauge, residual)
	if err != nil {
		t.Fatal(err)
	}
	d, err := physio.Endurance(usable, physio.LitresPerMinute(flowLpm))
	if err != nil {
		t.Fatal(err)
	}
	return int64(d / time.Minute), d.Milliseconds()
}

// checkCountdown waits for the countdown of the reading just typed and
// checks it against physio: the minutes at the reading exactly, the live
// minutes within the tick, and the change time as the browser's own clock
// writes reading time + endurance (local HH:MM, truncated).
func checkCountdown(t *testing.T, b *browser, minutes, enduranceMs int64) {
	t.Helper()
	want := strconv.FormatInt(minutes, 10)
	b.waitFor("minutes at the reading = "+want, fmt.Sprintf(`document.querySelector("#supply-minutes-reading")?.textContent === %q`, want), 10*time.Second)
	live, err := strconv.ParseInt(b.text("#supply-minutes"), 10, 64)
	if err != nil || live > minutes || live < minutes-1 {
		t.Errorf("minutes left now = %q, want %d (or one less across a minute)", b.text("#supply-minutes"), minutes)
	}
	at := eval[string](b, `document.querySelector("#supply-countdown").dataset.readingAt`)
	wantClock := eval[string](b, fmt.Sprintf(`(() => { const d = new Date(Math.floor((%s + %d) / 60000) * 60000);
		return String(d.getHours()).padStart(2, "0") + ":" + String(d.getMinutes()).padStart(2, "0") })()`, at, enduranceMs))
	if got := b.text("#supply-change-at"); got != wantClock {
		t.Errorf("change at %q, want %q (reading at %s ms + %d ms)", got, wantClock, at, enduranceMs)
	}
}

// A crew types gauge readings and flow: the countdown follows physio; the
// readings survive a reload; switching to bar in Settings shows the reading
// in bar (GNU units as the oracle) and takes bar readings; a value out of
// range shows its message and no figure.
func TestSupplyCountdownUnitsAndBadValue(t *testing.T) {
	srv := startApp(t, repoRoot)
	b := newBrowser(t, t.TempDir())
	b.open(srv.URL("/supply"))

	residual := physio.Psi(200) // the default safe residual of Settings
	b.typeInto("#supply-gauge", "2000")
	b.typeInto("#supply-flow", "10")
	// REFERENCES §7 [calc]: E at 2000 psi, 10 L/min, residual 200 → 50.4 min.
	minutes, ms := supplyExpect(t, physio.Psi(2000), residual, 10)
	if minutes != 50 {
		t.Fatalf("physio gives %d min, REFERENCES §7 says 50.4", minutes)
	}
	checkCountdown(t, b, minutes, ms)
	if !b.exists("#supply-plot") {
		t.Error("no plot after a valid reading")
	}

	b.typeInto("#supply-gauge", "1500")
	minutes, ms = supplyExpect(t, physio.Psi(1500), residual, 10)
	checkCountdown(t, b, minutes, ms)

	b.reload()
	if got := b.value("#supply-gauge"); got != "1500" {
		t.Errorf("after reload the gauge shows %q, want 1500", got)
	}
	b.waitFor("the countdown after reload", `document.querySelector("#supply-minutes-reading") !== null`, 10*time.Second)
	if got := b.text("#supply-minutes-reading"); got != strconv.FormatInt(minutes, 10) {
		t.Errorf("after reload minutes at the reading = %q, want %d", got, minutes)
	}

	// Settings: bar. The stored 1500 psi reading shows in bar, rounded
	// down (GNU units as the oracle).
	b.tap("#tab-settings")
	b.waitFor("the settings screen", `document.querySelector("#set-pressure-bar") !== null`, 10*time.Second)
	b.tap("#set-pressure-bar")
	b.waitFor("bar chosen", `document.querySelector("#set-pressure-bar").getAttribute("aria-pressed") === "true"`, 10*time.Second)
	b.tap("#tab-supply")
	b.waitFor("the supply screen", `document.querySelector("#supply-gauge") !== null`, 10*time.Second)
	inBar := decimal.RequireFromString(unitsConvert(t, "1500 psi", "bar")).RoundFloor(1).String()
	b.waitFor("the gauge in bar", fmt.Sprintf(`document.querySelector("#supply-gauge").value === %q`, inBar), 10*time.Second)
	if got := b.text(".alv-input-row:has(#supply-gauge) .alv-unit"); got != "bar" {
		t.Errorf("gauge unit = %q, want bar", got)
	}

	b.typeInto("#supply-gauge", "100")
	minutes, ms = supplyExpect(t, physio.Bar(100), residual, 10)
	checkCountdown(t, b, minutes, ms)

	// Out of range: an E cylinder reads at most 3000 psi = 206.8 bar
	// (rounded down).
	b.typeInto("#supply-gauge", "300")
	b.waitFor("the gauge message", `document.querySelector("#supply-gauge-msg") !== null`, 10*time.Second)
	msg := b.text("#supply-gauge-msg")
	wantMax := decimal.RequireFromString(unitsConvert(t, "3000 psi", "bar")).RoundFloor(1).String()
	if !strings.Contains(msg, "Gauge reading") || !strings.Contains(msg, "between 0 and "+wantMax+" bar") {
		t.Errorf("message = %q, want the range 0 to %s bar", msg, wantMax)
	}
	if b.exists("#supply-minutes") || b.exists("#supply-change-at") {
		t.Error("figures shown while the gauge is invalid")
	}
	if txt := b.text("main"); strings.Contains(txt, "NaN") || strings.Contains(txt, "Inf") {
		t.Error("the screen shows NaN or Inf")
	}
	b.typeInto("#supply-gauge", "100")
	checkCountdown(t, b, minutes, ms)

	if v := b.axe(); len(v) > 0 {
		t.Errorf("axe-core serious/critical violations on Supply: %+v", v)
	}
	b.tap("#tab-settings")
	b.waitFor("the settings screen", `document.querySelector("#set-theme-night") !== null`, 10*time.Second)
	b.tap("#set-pressure-psi")
	b.tap("#tab-supply")
	b.waitFor("the supply screen", `document.querySelector("#supply-plot") !== null`, 10*time.Second)
	b.screenshot("supply", 1024, 768)
	b.screenshot("supply", 768, 1024)
}

// A crew creates the logbook, starts a transport from the Brief, types a
// gauge reading on Supply and saves it: it is in the transport's timeline,
// as a reading of the transport's first cylinder, and a change of cylinder
// on Supply is a cylinder-change event there; after a reload and unlock
// both are still there. With the logbook locked, Supply says the readings
// stay on this tablet.
func TestSupplyReadingInLogbook(t *testing.T) {
	draft, patient, _ := altitudeDraftScenario() // two E cylinders at 2000 psi
	srv := startApp(t, repoRoot)
	b := newBrowser(t, t.TempDir())
	b.seedDraft(srv, draft, patient)
	b.openLogbook(srv.URL("/logbook"))
	b.createVault(testPass)
	b.startTransport("Twin turboprop", "Harbour field", "Ridge clinic")
	if got := b.text("#lb-record-title"); got != "Harbour field → Ridge clinic" {
		t.Fatalf("record title %q", got)
	}

	b.tap("#tab-supply")
	b.waitFor("the open transport on Supply", `document.querySelector("#supply-log-open") !== null`, 20*time.Second)
	if !strings.Contains(b.text("#supply-log-open"), "Harbour field → Ridge clinic") {
		t.Errorf("Supply names %q", b.text("#supply-log-open"))
	}
	b.toTop()
	b.typeInto("#supply-gauge", "1700")
	b.typeInto("#supply-flow", "4")
	b.waitFor("the save button", `document.querySelector("#supply-log-save") !== null`, 10*time.Second)
	b.tap("#supply-log-save")
	b.waitFor("the reading saved", `document.querySelector("#supply-log-saved") !== null`, 20*time.Second)
	if s := b.text("#supply-log-status"); !strings.Contains(s, "Saved to the logbook") || !strings.Contains(s, "E1") {
		t.Errorf("status %q", s)
	}
	b.tap("#supply-inuse-1")
	b.waitFor("the cylinder change saved", `(document.querySelector("#supply-log-status")?.textContent ?? "").includes("change to cylinder E2")`, 20*time.Second)

	wantLines := []string{"Gauge E1: 1700 psi", "Event: cylinder-change (cylinder E2)"}
	checkTimeline := func(when string) {
		t.Helper()
		b.tap("#tab-logbook")
		b.waitLB("the list", `document.querySelector(".lb-open-row") !== null`, 30*time.Second)
		b.toTop()
		b.tap(".lb-open-row")
		b.waitLB("the timeline", `document.querySelectorAll("#lb-timeline li[data-seq]").length >= 3`, 20*time.Second)
		text := b.timelineText()
		for _, w := range wantLines {
			if !strings.Contains(text, w) {
				t.Errorf("%s: the timeline lacks %q:\n%s", when, w, text)
			}
		}
	}
	checkTimeline("before reload")

	b.reload()
	b.tap("#tab-supply")
	b.waitFor("the locked note", `(document.querySelector("#supply-log-note")?.textContent ?? "").includes("Logbook is locked")`, 20*time.Second)
	if got := b.text("#supply-log-note"); !strings.Contains(got, "Kept on this tablet only; not in a transport record") {
		t.Errorf("locked: %q", got)
	}
	b.tap("#tab-logbook")
	b.waitLB("the unlock form", `document.querySelector("#lb-unlock") !== null`, 30*time.Second)
	b.unlock(testPass)
	checkTimeline("after reload and unlock")
}

// toTop scrolls the page to its top, as a person does after changing
// screens (the page keeps the scroll of the screen before), so that a tap
// never lands on the sticky tab bar over a field.
func (b *browser) toTop() {
	b.t.Helper()
	eval[bool](b, `(() => { window.scrollTo(0, 0); return true })()`)
}
