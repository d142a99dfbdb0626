//go:build !wasm

package e2e

import (
	"fmt"
	"strings"
	"testing"
	"time"

	"github.com/chromedp/cdproto/emulation"
	"github.com/chromedp/chromedp"
)

// A late entry in the browser (the rule in DEVELOPERS.md, Logbook): the crew
// opens the transport giving an opening time 12 minutes back, then types a
// clock time 5 minutes back and taps Lift-off. The timeline shows that time
// and marks the entry "entered HH:MM"; the time control is blank again; a
// malformed time shows its message and saves nothing; after a reload and
// unlock the late entry is there with its time. The tablet's zone is fixed
// to Asia/Kathmandu (UTC+05:45 all year, no summer time: the IANA time zone
// database), an offset no UTC reading could pass for, so the test checks
// that the clock time is the tablet's local time.
func TestLogbookLateEntry(t *testing.T) {
	srv := startApp(t, repoRoot)
	b := newBrowser(t, t.TempDir())
	if _, err := chromedp.Call(b.ctx, emulation.SetTimezoneOverride, emulation.SetTimezoneOverrideParams{TimezoneID: "Asia/Kathmandu"}); err != nil {
		t.Fatalf("time zone override: %v", err)
	}
	zone := time.FixedZone("UTC+05:45", 5*3600+45*60)
	b.openLogbook(srv.URL("/logbook"))
	b.createVault(testPass)

	now := time.Now().In(zone)
	opened := now.Add(-12 * time.Minute)
	b.startTransportWith(lbStart{vehicle: "Pilatus PC-12", crew: "ef gh", origin: "Valley airstrip", originElev: "1400",
		dest: "City hospital", destElev: "40", openedAt: opened.Format("15:04")})

	lift := now.Add(-5 * time.Minute)
	b.typeInto("#lb-at", lift.Format("15:04"))
	b.tap("#lb-ev-lift-off")
	b.waitSeqs(2)
	if v := b.value("#lb-at"); v != "" {
		t.Errorf("the time control holds %q after saving, want blank (now)", v)
	}
	if s := b.text("#lb-status"); !strings.Contains(s, "for "+lift.Format("15:04")) {
		t.Errorf("status %q does not name the time given (%s)", s, lift.Format("15:04"))
	}
	checkLate := func(when string) {
		t.Helper()
		at := b.text(`#lb-timeline li[data-seq="2"] .lb-time`)
		if want := lift.Format("15:04") + ":00"; at != want {
			t.Errorf("%s: the lift-off shows %q, want %q", when, at, want)
		}
		mark := b.text(`#lb-timeline li[data-seq="2"] .lb-flag-late`)
		// Written is the moment of the tap: this minute or the next.
		if a, c := "entered "+now.Format("15:04"), "entered "+now.Add(time.Minute).Format("15:04"); mark != a && mark != c {
			t.Errorf("%s: the lift-off's mark is %q, want %q", when, mark, a)
		}
		if !strings.Contains(b.text(`#lb-timeline li[data-seq="2"]`), "lift-off") {
			t.Errorf("%s: R2 is not the lift-off: %s", when, b.timelineText())
		}
	}
	checkLate("after saving")

	// A malformed time: the message names the field, the range and the
	// format; nothing is saved and the time stays in its field.
	b.typeInto("#lb-at", "7.5")
	b.tap("#lb-ev-landing")
	b.waitLB("the refusal", `(document.querySelector("#lb-problem")?.textContent ?? "").includes("Time of the entry")`, 10*time.Second)
	p := b.text("#lb-problem")
	for _, want := range []string{"hh:mm", "00:00 to 23:59", "Nothing was saved"} {
		if !strings.Contains(p, want) {
			t.Errorf("the refusal %q lacks %q", p, want)
		}
	}
	time.Sleep(500 * time.Millisecond) // a save, had one started, would show by now
	if got := b.savedSeqs(); fmt.Sprint(got) != "[1 2]" || b.exists(".lb-busy") {
		t.Errorf("a malformed time saved something: records %v", got)
	}
	if v := b.value("#lb-at"); v != "7.5" {
		t.Errorf("the refused time is not kept in its field: %q", v)
	}

	b.reload()
	b.waitLB("the unlock form", `document.querySelector("#lb-unlock") !== null`, 30*time.Second)
	b.unlock(testPass)
	b.waitLB("the list", `document.querySelector("#lb-list tr[data-transport]") !== null`, 20*time.Second)
	b.tap("#lb-list tbody tr button")
	b.waitSeqs(2)
	checkLate("after reload and unlock")
	if at := b.text(`#lb-timeline li[data-seq="1"] .lb-time`); at != opened.Format("15:04")+":00" {
		t.Errorf("the opening shows %q, want %s:00", at, opened.Format("15:04"))
	}
}

// A close timed before an entry already in the transport is refused in the
// browser (a close is the last entry: app/ui/logbook_when.go,
// lbCloseRefusal): opened 12 minutes back, a landing tapped now, then a
// close typed for 5 minutes back. The sentence names the field, the
// landing's record as the lower bound and the hh:mm format; the outcome and
// the time stay typed; nothing is saved. Blank (now), the close goes in.
func TestLogbookLateCloseBeforeLatest(t *testing.T) {
	srv := startApp(t, repoRoot)
	b := newBrowser(t, t.TempDir())
	b.openLogbook(srv.URL("/logbook"))
	b.createVault(testPass)
	now := time.Now()
	b.startTransportWith(lbStart{vehicle: "Road ambulance", crew: "ij", origin: "Lake post", originElev: "300",
		dest: "County ward", destElev: "90", openedAt: now.Add(-12 * time.Minute).Format("15:04")})
	b.tap("#lb-ev-landing")
	b.waitSeqs(2)

	closeAt := now.Add(-5 * time.Minute).Format("15:04")
	b.typeInto("#lb-at", closeAt)
	b.fill("#lb-outcome", "handed over")
	b.press("#lb-close-go")
	b.waitLB("the refusal", `(document.querySelector("#lb-problem")?.textContent ?? "").includes("Time of the entry")`, 10*time.Second)
	p := b.text("#lb-problem")
	for _, want := range []string{"close at " + closeAt, "R2, the latest entry", "hh:mm", "Nothing was saved"} {
		if !strings.Contains(p, want) {
			t.Errorf("the refusal %q lacks %q", p, want)
		}
	}
	time.Sleep(500 * time.Millisecond) // a save, had one started, would show by now
	if got := b.savedSeqs(); fmt.Sprint(got) != "[1 2]" || !b.exists("#lb-close") || !b.exists("#lb-at-msg") {
		t.Errorf("a close before the landing: records %v, close form shown %v, time message shown %v", got, b.exists("#lb-close"), b.exists("#lb-at-msg"))
	}
	if at, out := b.value("#lb-at"), b.value("#lb-outcome"); at != closeAt || out != "handed over" {
		t.Errorf("after the refusal the time holds %q, the outcome %q; want both kept", at, out)
	}

	b.fill("#lb-at", "")
	b.press("#lb-close-go")
	b.waitLB("the close saved", `!document.querySelector(".lb-busy") && (document.querySelector("#lb-status")?.textContent ?? "").startsWith("Saved close as R3 ")`, 20*time.Second)
	if b.exists("#lb-close") {
		t.Error("the transport closed now still offers the close form")
	}
}
