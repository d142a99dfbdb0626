//go:build !wasm

package e2e

import (
	"fmt"
	"strings"
	"testing"
	"time"

	"github.com/chromedp/cdproto/storage"
	"github.com/chromedp/chromedp"

	"alvea/app/logbook/idb"
)

// quotaMessage is the Logbook's sentence for a write the store refused for
// lack of space (logbook.ErrQuota; app/ui/logbook_text.go).
const quotaMessage = "The device's storage is full: this entry was NOT saved and is still on screen. Free some space on the device, then save again."

// probeDB is a database of this test only: fillDisk writes to it to learn
// when the browser starts refusing writes. The app never opens it.
const probeDB = "fulldisk-probe"

// setQuota sets the origin's storage quota in Chromium to bytes (nil: back
// to the browser's own quota), through the DevTools protocol.
func (b *browser) setQuota(origin string, bytes *float64) {
	b.t.Helper()
	if _, err := chromedp.Call(b.ctx, storage.OverrideQuotaForOrigin, storage.OverrideQuotaForOriginParams{Origin: origin, QuotaSize: bytes}); err != nil {
		b.t.Fatalf("quota override for %s: %v", origin, err)
	}
}

// fillDisk makes the origin's storage full: the quota becomes the usage
// the browser reports plus a few bytes, less than any record. Chromium's
// IndexedDB keeps the space it last learned it had for about 30 s (measured
// here: writes went on for 30 s after the override, then every write was
// refused; a new browser refuses at once), and navigator.storage.estimate
// goes on reporting the browser's own quota after the override. So
// fillDisk writes a few bytes to probeDB each half second until one is
// refused with QuotaExceededError. It returns how long that took.
func (b *browser) fillDisk(origin string) time.Duration {
	b.t.Helper()
	usage := eval[float64](b, `navigator.storage.estimate().then(e => e.usage)`)
	quota := usage + 100
	b.setQuota(origin, &quota)
	start := time.Now()
	for i := 0; ; i++ {
		got := eval[string](b, fmt.Sprintf(`(async () => {
			const db = await new Promise((res, rej) => {
				const r = indexedDB.open(%q, 1);
				r.onupgradeneeded = () => r.result.createObjectStore("s");
				r.onsuccess = () => res(r.result); r.onerror = () => rej(r.error);
			});
			const tx = db.transaction(["s"], "readwrite");
			tx.objectStore("s").put(new Uint8Array(64), %d);
			const out = await new Promise(res => {
				tx.oncomplete = () => res("written");
				tx.onabort = () => res(tx.error ? tx.error.name : "aborted");
			});
			db.close();
			return out;
		})()`, probeDB, i))
		switch {
		case got == "QuotaExceededError":
			return time.Since(start)
		case got != "written":
			b.t.Fatalf("filling the disk: the probe write failed with %q, not for lack of space", got)
		case time.Since(start) > 90*time.Second:
			b.t.Fatalf("filling the disk: writes still succeed %v after the quota was set to %.0f bytes (usage %.0f)", time.Since(start), quota, usage)
		}
		time.Sleep(500 * time.Millisecond)
	}
}

// freeDisk gives the origin the browser's own quota back and removes the
// probe database.
func (b *browser) freeDisk(origin string) {
	b.t.Helper()
	b.setQuota(origin, nil)
	eval[bool](b, fmt.Sprintf(`new Promise(res => { const r = indexedDB.deleteDatabase(%q); r.onsuccess = () => res(true); r.onerror = () => res(false); })`, probeDB))
}

// storedSeqs returns, as "index [1 2 …] body [1 2 …]", the record
// numbers the vault's database holds in its index and body stores (read
// with a connection of the test's own: reading needs no space). A record
// half written would show in one list and not the other.
func (b *browser) storedSeqs() string {
	b.t.Helper()
	return eval[string](b, fmt.Sprintf(`(async () => {
		const req = r => new Promise((res, rej) => { r.onsuccess = () => res(r.result); r.onerror = () => rej(r.error); });
		const db = await req(indexedDB.open(%q));
		const tx = db.transaction(["index", "body"], "readonly");
		const index = await req(tx.objectStore("index").getAllKeys());
		const body = await req(tx.objectStore("body").getAllKeys());
		db.close();
		return "index [" + index.join(" ") + "] body [" + body.join(" ") + "]";
	})()`, idb.DBName))
}

// press taps the element with the CSS selector after scrolling it to the
// middle of the view. A plain tap scrolls a control above the view only
// to the top edge, under the sticky header, and the tap then lands on the
// header's tab instead.
func (b *browser) press(sel string) {
	b.t.Helper()
	eval[bool](b, fmt.Sprintf(`(() => { document.querySelector(%q).scrollIntoView({block: "center"}); return true })()`, sel))
	b.tap(sel)
}

// fill is typeInto for a field scrolled to the middle of the view first
// (see press).
func (b *browser) fill(sel, text string) {
	b.t.Helper()
	eval[bool](b, fmt.Sprintf(`(() => { document.querySelector(%q).scrollIntoView({block: "center"}); return true })()`, sel))
	b.typeInto(sel, text)
}

// refusedEntry checks the screen after the full disk refused the entry
// saved as what ("note", "gauge reading"…): the full-disk sentence and the
// "not saved" line are shown, the timeline still has saved records and no
// more, nothing says saved, and the text typed into field is still there
// and in no timeline line.
func (b *browser) refusedEntry(what string, saved int, field, typed string) {
	b.t.Helper()
	unsaved := "Not saved: " + what + "."
	b.waitLB("the refusal of the "+what, fmt.Sprintf(`!document.querySelector(".lb-busy") && (document.querySelector("#lb-unsaved")?.textContent ?? "").startsWith(%q)`, unsaved), 20*time.Second)
	if got := b.text("#lb-problem"); got != quotaMessage {
		b.t.Errorf("%s on a full disk: the screen says %q, want %q", what, got, quotaMessage)
	}
	if got := b.text("#lb-status"); strings.Contains(got, "Saved") {
		b.t.Errorf("%s on a full disk: the status says %q", what, got)
	}
	if got := b.savedSeqs(); len(got) != saved {
		b.t.Errorf("%s on a full disk: the timeline shows records %v, want the %d saved before", what, got, saved)
	}
	if field == "" {
		return
	}
	if got := b.value(field); got != typed {
		b.t.Errorf("%s on a full disk: %s holds %q, want the typed %q", what, field, got, typed)
	}
	if strings.Contains(b.timelineText(), typed) {
		b.t.Errorf("%s on a full disk: the timeline shows the unsaved %q", what, typed)
	}
}

// savedEntry taps submit again (the entry still in its form) and checks
// that it is saved as record seq and its form emptied.
func (b *browser) savedEntry(what, submit string, seq int, field string) {
	b.t.Helper()
	b.press(submit)
	b.waitLB("the "+what+" saved", fmt.Sprintf(`!document.querySelector(".lb-busy") && (document.querySelector("#lb-status")?.textContent ?? "").startsWith("Saved %s as R%d ")`, what, seq), 20*time.Second)
	if got := b.savedSeqs(); len(got) != seq || got[len(got)-1] != seq {
		b.t.Errorf("%s retried with space again: the timeline shows %v, want R1…R%d", what, got, seq)
	}
	if b.exists("#lb-unsaved") || b.exists("#lb-problem") {
		b.t.Errorf("%s saved, and the screen still says %q %q", what, b.text("#lb-unsaved"), b.text("#lb-problem"))
	}
	if field != "" {
		if got := b.value(field); got != "" {
			b.t.Errorf("%s saved, and its field %s still holds %q", what, field, got)
		}
	}
}

// A full disk in real Chromium (the origin's quota set just above its
// usage through the DevTools protocol): each write a crew makes during a
// transport (a note, a gauge reading, observations, an event, a gauge
// reading saved from the Supply screen, closing it, starting the next) is
// refused with the full-disk sentence, is not shown as saved, and keeps
// what was typed on screen. With space back, the same tap saves it, once.
// After a reload the records saved before the disk filled are all there,
// the chain verifies, and nothing half-written is found. The Brief's draft
// gives the transport two E cylinders (E1, E2), so that Supply's reading
// has a cylinder of the transport to go to.
func TestLogbookFullDisk(t *testing.T) {
	draft, patient, _ := altitudeDraftScenario() // two E cylinders at 2000 psi
	srv := startApp(t, repoRoot)
	dir := t.TempDir()
	b := newBrowser(t, dir)
	b.seedDraft(srv, draft, patient)
	b.openLogbook(srv.URL("/logbook"))
	b.createVault(testPass)
	b.startTransport("King Air B200", "Ridge post", "Harbour ward")
	// Lift-off (R2) and a reading of 1800 on the first cylinder (R3).
	b.tap("#lb-ev-lift-off")
	b.waitSeqs(2)
	if got := b.value("#lb-gauge-cyl"); got != "E1" {
		t.Fatalf("the gauge form's cylinder is %q, want E1 (the Brief's first cylinder)", got)
	}
	b.typeInto("#lb-gauge-p", "1800")
	b.tap("#lb-gauge-go")
	b.waitSeqs(3)
	b.typeInto("#lb-note-text", "written before the disk filled")
	b.tap("#lb-note-go")
	b.waitSeqs(4)
	b.waitLB("the note saved", `(document.querySelector("#lb-status")?.textContent ?? "").startsWith("Saved note as R4 ")`, 20*time.Second)

	// The disk fills in the middle of the transport.
	t.Logf("Chromium refused IndexedDB writes %v after the quota override", b.fillDisk(srv.Origin()))

	marker := fmt.Sprintf("FD%06d", time.Now().UnixNano()%1e6)
	note, other, outcome := "note "+marker+"N", "event "+marker+"E", "outcome "+marker+"C"
	device := "mask " + marker + "O"
	b.fill("#lb-note-text", note)
	b.press("#lb-note-go")
	b.refusedEntry("note", 4, "#lb-note-text", note)

	b.fill("#lb-gauge-p", "1500")
	b.press("#lb-gauge-go")
	b.refusedEntry("gauge reading", 4, "#lb-gauge-p", "1500")
	if got := b.value("#lb-gauge-cyl"); got != "E1" {
		t.Errorf("gauge reading on a full disk: the cylinder field holds %q, want E1", got)
	}

	obs := map[string]string{"#lb-obs-spo2": "94", "#lb-obs-device": device, "#lb-obs-hr": "88"}
	for _, field := range []string{"#lb-obs-spo2", "#lb-obs-device", "#lb-obs-hr"} {
		b.fill(field, obs[field])
	}
	b.press("#lb-obs-go")
	b.refusedEntry("observations", 4, "#lb-obs-device", device)

	b.fill("#lb-other-text", other)
	b.press("#lb-other-go")
	b.refusedEntry("event", 4, "#lb-other-text", other)

	b.press("#lb-ev-landing")
	b.refusedEntry("landing", 4, "", "")
	if strings.Contains(b.timelineText(), "landing") {
		t.Error("landing on a full disk: the timeline shows it")
	}

	b.fill("#lb-outcome", outcome)
	b.press("#lb-close-go")
	b.refusedEntry("close", 4, "#lb-outcome", outcome)
	if !b.exists("#lb-close") || !b.exists("#lb-note") {
		t.Error("close on a full disk: the transport is shown closed")
	}
	// Every refused entry is still in its form, all at once.
	typed := map[string]string{"#lb-note-text": note, "#lb-gauge-p": "1500", "#lb-other-text": other, "#lb-outcome": outcome,
		"#lb-obs-spo2": "94", "#lb-obs-device": device, "#lb-obs-hr": "88"}
	checkTyped := func(when string) {
		t.Helper()
		for field, want := range typed {
			if got := b.value(field); got != want {
				t.Errorf("%s, %s holds %q, want %q", when, field, got, want)
			}
		}
	}
	checkTyped("after the refusals")
	if !b.exists("#lb-lock") {
		t.Error("after the refusals the logbook is no longer unlocked")
	}

	// Supply's "save to the logbook" on the full disk: refused with the
	// same sentence (app/ui/supply_logbook.go puts the entry's name before
	// it), not shown saved, the reading kept on Supply with its button.
	b.tap("#tab-supply")
	b.waitFor("the open transport on Supply", `document.querySelector("#supply-log-open") !== null`, 20*time.Second)
	b.toTop()
	b.typeInto("#supply-gauge", "1650")
	b.typeInto("#supply-flow", "4")
	b.waitFor("the save button", `document.querySelector("#supply-log-save") !== null`, 10*time.Second)
	b.press("#supply-log-save")
	b.waitFor("the refusal on Supply", `!document.querySelector("#supply-log-busy") && document.querySelector("#supply-log-problem") !== null`, 20*time.Second)
	if got, want := b.text("#supply-log-problem"), "Not saved to the logbook (reading of E1): "+quotaMessage; got != want {
		t.Errorf("Supply's reading on a full disk: the card says %q, want %q", got, want)
	}
	if b.exists("#supply-log-saved") || !b.exists("#supply-log-save") || strings.Contains(b.text("#supply-log-status"), "Saved") {
		t.Errorf("Supply's reading on a full disk: shown saved (%q), or its save button went", b.text("#supply-log-status"))
	}
	for field, want := range map[string]string{"#supply-gauge": "1650", "#supply-flow": "4"} {
		if got := b.value(field); got != want {
			t.Errorf("Supply's reading on a full disk: %s holds %q, want %q", field, got, want)
		}
	}
	if got, want := b.storedSeqs(), "index [1 2 3 4] body [1 2 3 4]"; got != want {
		t.Errorf("after the refusals the database holds %s, want %s", got, want)
	}

	// Back on the Logbook, the transport's refused entries are in their
	// forms again.
	b.tap("#tab-logbook")
	b.waitLB("the list", `document.querySelector(".lb-open-row") !== null`, 30*time.Second)
	b.toTop()
	b.tap(".lb-open-row")
	b.waitSeqs(4)
	checkTyped("back from Supply")

	// Space again: the same taps save each entry, once.
	b.freeDisk(srv.Origin())
	b.savedEntry("note", "#lb-note-go", 5, "#lb-note-text")
	b.savedEntry("gauge reading", "#lb-gauge-go", 6, "#lb-gauge-p")
	b.savedEntry("observations", "#lb-obs-go", 7, "#lb-obs-spo2")
	b.savedEntry("event", "#lb-other-go", 8, "#lb-other-text")
	b.savedEntry("landing", "#lb-ev-landing", 9, "")

	b.tap("#tab-supply")
	b.waitFor("the reading's save button on Supply", `document.querySelector("#supply-log-save") !== null`, 20*time.Second)
	if got := b.value("#supply-gauge"); got != "1650" {
		t.Errorf("back on Supply the gauge holds %q, want the unsaved 1650", got)
	}
	b.press("#supply-log-save")
	b.waitFor("Supply's reading saved", `document.querySelector("#supply-log-saved") !== null`, 20*time.Second)
	if got := b.text("#supply-log-status"); !strings.HasPrefix(got, "Saved to the logbook: reading of E1, record R10,") {
		t.Errorf("Supply's reading with space again: status %q, want it saved as R10", got)
	}
	if b.exists("#supply-log-problem") {
		t.Errorf("Supply's reading saved, and the card still says %q", b.text("#supply-log-problem"))
	}
	b.tap("#tab-logbook")
	b.waitLB("the list", `document.querySelector(".lb-open-row") !== null`, 30*time.Second)
	b.toTop()
	b.tap(".lb-open-row")
	b.waitSeqs(10)
	if got := b.value("#lb-outcome"); got != outcome {
		t.Errorf("back from Supply the outcome holds %q, want %q", got, outcome)
	}
	b.savedEntry("close", "#lb-close-go", 11, "")

	// The next transport, on a device already full when the app starts: a
	// new browser on the same profile (its IndexedDB learns the space left
	// at its first write).
	b.Close()
	b = newBrowser(t, dir)
	b.openLogbook(srv.URL("/logbook"))
	b.waitLB("the unlock form", `document.querySelector("#lb-unlock") !== null`, 30*time.Second)
	t.Logf("after a browser restart, Chromium refused IndexedDB writes %v after the quota override", b.fillDisk(srv.Origin()))
	b.unlock(testPass)
	b.waitLB("the list", `document.querySelector("#lb-list tr[data-transport]") !== null`, 20*time.Second)
	b.tap("#lb-nav-start")
	b.waitLB("the start form", `document.querySelector("#lb-start") !== null`, 10*time.Second)
	vehicle := "Van " + marker + "V"
	start := map[string]string{"#lb-vehicle": vehicle, "#lb-crew": "ef gh", "#lb-origin": "Harbour ward",
		"#lb-origin-elev": "10", "#lb-dest": "Island strip", "#lb-dest-elev": "5", "#lb-weight": "64"}
	for _, field := range []string{"#lb-vehicle", "#lb-crew", "#lb-origin", "#lb-origin-elev", "#lb-dest", "#lb-dest-elev", "#lb-weight"} {
		b.fill(field, start[field])
	}
	b.press("#lb-start-go")
	b.waitLB("the refusal of the start", `!document.querySelector(".lb-busy") && (document.querySelector("#lb-problem")?.textContent ?? "") !== ""`, waitLong)
	if got := b.text("#lb-problem"); got != quotaMessage {
		t.Errorf("start of transport on a full disk: the screen says %q, want %q", got, quotaMessage)
	}
	if got := b.text("#lb-status"); strings.Contains(got, "Saved") {
		t.Errorf("start of transport on a full disk: the status says %q", got)
	}
	if !b.exists("#lb-start") || b.exists("#lb-timeline") {
		t.Error("start of transport on a full disk: the start form is gone, or a timeline is shown")
	}
	for field, want := range start {
		if got := b.value(field); got != want {
			t.Errorf("start of transport on a full disk: %s holds %q, want %q", field, got, want)
		}
	}
	if got, want := b.storedSeqs(), "index [1 2 3 4 5 6 7 8 9 10 11] body [1 2 3 4 5 6 7 8 9 10 11]"; got != want {
		t.Errorf("after the refused start the database holds %s, want %s", got, want)
	}
	b.freeDisk(srv.Origin())
	b.press("#lb-start-go")
	b.waitLB("the transport started", `!document.querySelector(".lb-busy") && (document.querySelector("#lb-status")?.textContent ?? "").startsWith("Saved start of transport as R12 ")`, 20*time.Second)
	if got := b.savedSeqs(); len(got) != 1 || got[0] != 12 {
		t.Errorf("the retried start: the timeline shows %v, want [12]", got)
	}
	if got, want := b.storedSeqs(), "index [1 2 3 4 5 6 7 8 9 10 11 12] body [1 2 3 4 5 6 7 8 9 10 11 12]"; got != want {
		t.Errorf("after the retries the database holds %s, want %s", got, want)
	}

	// Reload and unlock: everything saved is there, once, and verifies.
	b.reload()
	b.waitLB("the unlock form", `document.querySelector("#lb-unlock") !== null`, 30*time.Second)
	b.unlock(testPass)
	b.waitLB("the list", `document.querySelectorAll("#lb-list tr[data-transport]").length >= 2`, 20*time.Second)
	if b.exists("#lb-chain-problems") {
		t.Errorf("after the full disk the logbook shows chain problems: %s", b.text("#lb-chain-problems"))
	}
	rows := eval[[]string](b, `Array.from(document.querySelectorAll("#lb-list tbody tr")).map(r => r.textContent)`)
	if len(rows) != 2 || strings.Count(strings.Join(rows, "\n"), vehicle) != 1 {
		t.Errorf("list after the full disk: %q, want two transports, the retried one once", rows)
	}
	b.tap("#lb-list tbody tr:last-child button")
	b.waitSeqs(11)
	// In time order: Supply's reading (R10) carries the time it was typed
	// there, while the disk was full, so it stands before the retries.
	if got := b.savedSeqs(); fmt.Sprint(got) != "[1 2 3 4 10 5 6 7 8 9 11]" {
		t.Errorf("first transport after reload: records %v, want R1…R11, R10 (typed on Supply before the retries) after R4", got)
	}
	tl := b.timelineText()
	for _, want := range []string{"Opened: Ridge post → Harbour ward", "lift-off", "Gauge E1: 1800 psi", "Note: written before the disk filled"} {
		if strings.Count(tl, want) != 1 {
			t.Errorf("a record saved before the disk filled is not there once: %q\n%s", want, tl)
		}
	}
	// The timeline's wording: lbPayloadText (app/ui/logbook_record.go).
	for _, want := range []string{"Note: " + note, "Gauge E1: 1500 psi", "Observations: SpO2 94 %, " + device + ", HR 88/min",
		"Event: other — " + other, "Event: landing", "Gauge E1: 1650 psi", "Closed: " + outcome} {
		if n := strings.Count(tl, want); n != 1 {
			t.Errorf("the retried %q is there %d times, want once:\n%s", want, n, tl)
		}
	}
	if b.exists(".lb-warn") {
		t.Errorf("the transport shows unreadable records: %s", b.text(".lb-warn"))
	}
	b.tap("#lb-nav-manage")
	b.waitLB("the vault controls", `document.querySelector("#lb-verify") !== null`, 10*time.Second)
	b.tap("#lb-verify")
	b.waitLB("the check", `document.querySelector("#lb-verify-result") !== null`, 30*time.Second)
	if got := b.text("#lb-verify-result"); got != "Every record checked: no problem found." {
		t.Errorf("check after the full disk = %q", got)
	}
}
