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
