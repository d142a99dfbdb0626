//go:build !wasm

package e2e

import (
	"fmt"
	"strconv"
	"strings"
	"testing"
	"time"

	"alvea/physio"
)

// clockShift moves the page's clock (Date and performance.now, which Go's
// time.Now reads in app.wasm) forward by window.__clockShift ms, so a test
// can step past Supply's one-minute correction window without waiting it
// out. Timers keep real time.
const clockShift = `(() => {
	window.__clockShift = 0;
	const RealDate = Date;
	class ShiftedDate extends RealDate {
		constructor(...args) {
			if (args.length === 0) super(RealDate.now() + window.__clockShift);
			else super(...args);
		}
		static now() { return RealDate.now() + window.__clockShift; }
	}
	window.Date = ShiftedDate;
	const now = performance.now.bind(performance);
	performance.now = () => now() + window.__clockShift;
})();`

// A reading typed, saved to the open transport, and noticed only after the
// correction window to have been read earlier: Read at then waits for the
// next reading, and its button re-times the reading shown instead
// (supply.retimeShown; TestSupplyRetimeShownReading checks it natively).
// In the browser: the page's clock is moved 3 minutes on, Read at takes a
// time 10 minutes before the reading's minute, the button names it, and a
// tap makes the countdown count from it: the change is due at that time +
// the endurance physio gives (REFERENCES §7 [practice]: E 0.28 L/psi,
// residual 200 psi, (1500 − 200) × 0.28 ÷ 10 L/min = 36.4 min), and the
// minutes left are the endurance less the time since then. Saved again,
// the logbook holds a correction of the reading at the earlier time. The
// zone is Asia/Kathmandu (UTC+05:45, no summer time: the IANA database).
func TestSupplyRetimeShownReadingInBrowser(t *testing.T) {
	b, zone := supplyOnOpenTransport(t, clockShift)
	b.typeInto("#supply-gauge", "1500")
	b.typeInto("#supply-flow", "10")
	minutes, ms := supplyExpect(t, physio.Psi(1500), physio.Psi(200), 10)
	checkCountdown(t, b, minutes, ms)
	typedAt, err := strconv.ParseInt(eval[string](b, `document.querySelector("#supply-countdown").dataset.readingAt`), 10, 64)
	if err != nil {
		t.Fatal(err)
	}
	back := time.UnixMilli(typedAt).In(zone).Truncate(time.Minute).Add(-10 * time.Minute)
	b.waitFor("the save button", `document.querySelector("#supply-log-save") !== null`, 10*time.Second)
	b.tap("#supply-log-save")
	b.waitFor("the reading saved", `document.querySelector("#supply-log-saved") !== null`, 20*time.Second)

	// Three minutes on: past the window, Read at waits for the next
	// reading, and offers to re-time the one shown.
	eval[bool](b, `(() => { window.__clockShift = 3 * 60000; return true })()`)
	b.typeInto("#supply-read-at", back.Format("15:04"))
	b.waitFor("the re-time button", `document.querySelector("#supply-read-at-retime") !== null`, 10*time.Second)
	if note := b.text("#supply-read-at-next"); !strings.Contains(note, "kept for the next reading") {
		t.Errorf("the waiting note is %q", note)
	}
	if got := b.text("#supply-read-at-retime"); !strings.Contains(got, "read at "+back.Format("15:04")) || !strings.Contains(got, "less time left") {
		t.Errorf("the button reads %q, want it to name %s", got, back.Format("15:04"))
	}
	if at := eval[string](b, `document.querySelector("#supply-countdown").dataset.readingAt`); at != strconv.FormatInt(typedAt, 10) {
		t.Fatalf("the countdown moved before the tap: reading at %s", at)
	}

	// leftAt is what the countdown should show at the page's time now.
	leftAt := func() int64 {
		now := eval[float64](b, `Date.now()`)
		return (ms - (int64(now) - back.UnixMilli())) / 60000
	}
	before := leftAt()
	b.tap("#supply-read-at-retime")
	b.waitFor("the countdown from "+back.Format("15:04"), fmt.Sprintf(`document.querySelector("#supply-countdown")?.dataset.readingAt === "%d"`, back.UnixMilli()), 10*time.Second)
	left, err := strconv.ParseInt(b.text("#supply-minutes"), 10, 64)
	after := leftAt()
	if err != nil || (left != before && left != after) {
		t.Errorf("minutes left after the re-time = %q, want %d (or %d across a minute)", b.text("#supply-minutes"), before, after)
	}
	if left > minutes-13 {
		t.Errorf("minutes left after the re-time = %d: want at most %d (13 minutes since %s)", left, minutes-13, back.Format("15:04"))
	}
	if got, want := b.text("#supply-change-at"), back.Add(time.Duration(ms)*time.Millisecond).Truncate(time.Minute).Format("15:04"); got != want {
		t.Errorf("change at %q, want %q", got, want)
	}
	if b.exists("#supply-read-at-next") || b.exists("#supply-read-at-retime") {
		t.Error("after the tap, the time is still said to wait for the next reading")
	}

	// Saved again: the logbook corrects its reading to the earlier time.
	b.waitFor("the save button", `document.querySelector("#supply-log-save") !== null`, 10*time.Second)
	b.tap("#supply-log-save")
	b.waitFor("the correction saved", `document.querySelector("#supply-log-saved") !== null`, 20*time.Second)
	b.tap("#tab-logbook")
	b.waitLB("the list", `document.querySelector(".lb-open-row") !== null`, 30*time.Second)
	b.toTop()
	b.tap(".lb-open-row")
	b.waitSeqs(3)
	line := b.text(`#lb-timeline li[data-seq="3"]`)
	if !strings.Contains(line, "Correction of R2") || !strings.Contains(line, "1500 psi") {
		t.Fatalf("R3 is not a correction of the reading: %s", b.timelineText())
	}
	if at := b.text(`#lb-timeline li[data-seq="3"] .lb-time`); at != back.Format("15:04")+":00" {
		t.Errorf("the correction shows %q, want %s:00", at, back.Format("15:04"))
	}
	if !strings.Contains(b.text(`#lb-timeline li[data-seq="2"]`), "corrected by R3") {
		t.Errorf("R2 is not marked corrected: %s", b.text(`#lb-timeline li[data-seq="2"]`))
	}
}
