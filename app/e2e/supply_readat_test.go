//go:build !wasm

package e2e

import (
	"fmt"
	"strconv"
	"strings"
	"testing"
	"time"

	"github.com/chromedp/cdproto/emulation"
	"github.com/chromedp/cdproto/page"
	"github.com/chromedp/chromedp"

	"alvea/physio"
)

// supplyOnOpenTransport starts the app with the tablet's zone fixed to
// Asia/Kathmandu (UTC+05:45 all year, no summer time: the IANA time zone
// database), a Brief with two E cylinders at 2000 psi, a logbook with a
// transport opened 30 minutes back, and opens Supply on it. pageScript,
// when given, runs in every page before its own scripts.
func supplyOnOpenTransport(t *testing.T, pageScript string) (*browser, *time.Location) {
	t.Helper()
	draft, patient, _ := altitudeDraftScenario()
	srv := startApp(t, repoRoot)
	b := newBrowser(t, t.TempDir())
	if _, err := chromedp.Call(b.ctx, emulation.SetTimezoneOverride, emulation.SetTimezoneOverrideParams{TimezoneID: "Asia/Kathmandu"}); err != nil {
		t.Fatalf("time zone override: %v", err)
	}
	if pageScript != "" {
		if _, err := chromedp.Call(b.ctx, page.AddScriptToEvaluateOnNewDocument, page.AddScriptToEvaluateOnNewDocumentParams{Source: pageScript}); err != nil {
			t.Fatal(err)
		}
	}
	zone := time.FixedZone("UTC+05:45", 5*3600+45*60)
	b.seedDraft(srv, draft, patient)
	b.openLogbook(srv.URL("/logbook"))
	b.createVault(testPass)
	opened := time.Now().In(zone).Add(-30 * time.Minute)
	b.startTransportWith(lbStart{vehicle: "Twin turboprop", crew: "ef gh", origin: "Harbour field", originElev: "20",
		dest: "Ridge clinic", destElev: "1900", openedAt: opened.Format("15:04")})
	b.tap("#tab-supply")
	b.waitFor("the open transport on Supply", `document.querySelector("#supply-log-open") !== null`, 20*time.Second)
	b.toTop()
	return b, zone
}

// A gauge reading given the time it was read, in the browser (Supply's
// Read at, the Logbook's rule: DEVELOPERS.md, late entries). A transport
// is opened 30 minutes back from a Brief with two E cylinders; on Supply
// the crew types 1700 psi at 4 L/min. Timed as typed, the countdown is
// physio's (REFERENCES §7 method, as TestSupplyCountdownUnitsAndBadValue
// checks it). A malformed Read at is refused beside the field, naming it,
// the range and the format, with the gauge and flow kept and no countdown.
// Read at this minute, then 20 minutes back: the countdown counts from the
// time given, the minutes left 20 fewer and the change and reserve times
// 20 minutes earlier. Saved to the transport, the Logbook shows the
// reading at that time, marked as entered late; after a reload Supply
// still counts from it. The tablet's zone is fixed to Asia/Kathmandu
// (UTC+05:45 all year, no summer time: the IANA time zone database), an
// offset no UTC reading could pass for.
func TestSupplyReadAtInBrowser(t *testing.T) {
	b, zone := supplyOnOpenTransport(t, "")
	if b.exists("#supply-log-at") {
		t.Error("the logbook card still has its own time control")
	}
	if note := b.text("#supply-read-at-note"); !strings.Contains(note, "the countdown counts from it") {
		t.Errorf("the Read at note is %q", note)
	}

	// The two readings compared below must be drawn within one clock
	// minute (then their minutes left differ by exactly the 20 minutes
	// between their times): start early in a minute.
	for time.Now().Second() > 20 {
		time.Sleep(time.Second)
	}
	b.typeInto("#supply-gauge", "1700")
	b.typeInto("#supply-flow", "4")
	// REFERENCES §7 [practice]: E 0.28 L/psi, residual 200 psi:
	// (1700 − 200) × 0.28 ÷ 4 L/min = 105 min, computed here by physio.
	minutes, ms := supplyExpect(t, physio.Psi(1700), physio.Psi(200), 4)
	checkCountdown(t, b, minutes, ms)
	typedAt, err := strconv.ParseInt(eval[string](b, `document.querySelector("#supply-countdown").dataset.readingAt`), 10, 64)
	if err != nil {
		t.Fatal(err)
	}
	thisMinute := time.UnixMilli(typedAt).In(zone).Truncate(time.Minute)
	back := thisMinute.Add(-20 * time.Minute)

	// A malformed time: refused beside the field, nothing lost.
	b.typeInto("#supply-read-at", "7.5")
	b.waitFor("the Read at message", `document.querySelector("#supply-read-at-msg") !== null`, 10*time.Second)
	msg := b.text("#supply-read-at-msg")
	for _, want := range []string{"Read at", "hh:mm", "00:00 to 23:59"} {
		if !strings.Contains(msg, want) {
			t.Errorf("the refusal %q lacks %q", msg, want)
		}
	}
	if b.value("#supply-read-at") != "7.5" || b.value("#supply-gauge") != "1700" || b.value("#supply-flow") != "4" || b.exists("#supply-minutes") {
		t.Errorf("refused: the fields hold %q, %q, %q, or a countdown is shown", b.value("#supply-read-at"), b.value("#supply-gauge"), b.value("#supply-flow"))
	}

	// countdownAt types Read at and returns what the countdown then shows.
	countdownAt := func(at time.Time) (left int64, changeAt, reserveAt string) {
		t.Helper()
		b.typeInto("#supply-read-at", at.Format("15:04"))
		b.waitFor("the countdown from "+at.Format("15:04"), fmt.Sprintf(`document.querySelector("#supply-countdown")?.dataset.readingAt === "%d"`, at.UnixMilli()), 10*time.Second)
		left, err := strconv.ParseInt(b.text("#supply-minutes"), 10, 64)
		if err != nil {
			t.Fatalf("minutes left %q: %v", b.text("#supply-minutes"), err)
		}
		if got := b.text("#supply-minutes-reading"); got != strconv.FormatInt(minutes, 10) {
			t.Errorf("read at %s: minutes at the reading %q, want %d", at.Format("15:04"), got, minutes)
		}
		// The change is due at the reading's time + physio's endurance,
		// truncated to the minute.
		if got, want := b.text("#supply-change-at"), at.Add(time.Duration(ms)*time.Millisecond).Truncate(time.Minute).Format("15:04"); got != want {
			t.Errorf("read at %s: change at %q, want %q", at.Format("15:04"), got, want)
		}
		return left, b.text("#supply-change-at"), b.text("#supply-reserve-at")
	}
	leftNow, changeNow, reserveNow := countdownAt(thisMinute)
	leftBack, changeBack, reserveBack := countdownAt(back)
	if drawn := time.Now().In(zone).Truncate(time.Minute); !drawn.Equal(thisMinute) {
		t.Fatalf("the readings were drawn across a minute (%s to %s): the comparison below would not hold", thisMinute.Format("15:04"), drawn.Format("15:04"))
	}
	if leftNow-leftBack != 20 {
		t.Errorf("minutes left: %d read now, %d read 20 min back; want 20 fewer", leftNow, leftBack)
	}
	for name, pair := range map[string][2]string{"change at": {changeNow, changeBack}, "reserve at": {reserveNow, reserveBack}} {
		n, err1 := time.Parse("15:04", pair[0])
		k, err2 := time.Parse("15:04", pair[1])
		if err1 != nil || err2 != nil || (n.Sub(k)+24*time.Hour)%(24*time.Hour) != 20*time.Minute {
			t.Errorf("%s: %q read now, %q read 20 min back; want 20 min earlier", name, pair[0], pair[1])
		}
	}
	if note := b.text("#supply-countdown"); !strings.Contains(note, "At the reading ("+back.Format("15:04")+")") {
		t.Errorf("the countdown does not name %s: %q", back.Format("15:04"), note)
	}

	b.waitFor("the save button", `document.querySelector("#supply-log-save") !== null`, 10*time.Second)
	b.tap("#supply-log-save")
	b.waitFor("the reading saved", `document.querySelector("#supply-log-saved") !== null`, 20*time.Second)
	if s := b.text("#supply-log-status"); !strings.Contains(s, "for "+back.Format("15:04")) || !strings.Contains(s, "late entry") {
		t.Errorf("status %q does not name the time given (%s)", s, back.Format("15:04"))
	}

	b.tap("#tab-logbook")
	b.waitLB("the list", `document.querySelector(".lb-open-row") !== null`, 30*time.Second)
	b.toTop()
	b.tap(".lb-open-row")
	b.waitSeqs(2)
	if line := b.text(`#lb-timeline li[data-seq="2"]`); !strings.Contains(line, "Gauge E1: 1700 psi") {
		t.Fatalf("R2 is not the reading: %s", b.timelineText())
	}
	if at := b.text(`#lb-timeline li[data-seq="2"] .lb-time`); at != back.Format("15:04")+":00" {
		t.Errorf("the reading shows %q, want %s:00", at, back.Format("15:04"))
	}
	if mark := b.text(`#lb-timeline li[data-seq="2"] .lb-flag-late`); !strings.HasPrefix(mark, "entered ") {
		t.Errorf("the reading is not marked entered late: %q", mark)
	}

	// Reloaded, Supply keeps the reading's time and counts from it.
	b.reload()
	b.tap("#tab-supply")
	b.waitFor("the countdown after reload", fmt.Sprintf(`document.querySelector("#supply-countdown")?.dataset.readingAt === "%d"`, back.UnixMilli()), 20*time.Second)
	if v := b.value("#supply-read-at"); v != back.Format("15:04") {
		t.Errorf("after reload Read at holds %q, want %s", v, back.Format("15:04"))
	}
}
