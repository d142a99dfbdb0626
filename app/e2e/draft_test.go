//go:build !wasm

package e2e

import (
	"fmt"
	"strings"
	"testing"
	"time"

	"alvea/physio"
)

// The Brief draft's patient block in the browser: sealed in the logbook
// vault's draft slot, never in plain storage, back after a reload once the
// logbook is unlocked; kept in memory only (with a note) while it is not.

// Patient markers: PaO2 values no other field of these tests holds
// (invented, demo data).
const (
	drMarker    = "61.37"
	drOldMarker = "58.91"
)

// drSideDraftJS returns the sealed draft slot of the vault database
// (package idb's layout: store "meta", key "side:draft") as base64, or ""
// when there is none.
const drSideDraftJS = `(async () => {
	const req = r => new Promise((res, rej) => { r.onsuccess = () => res(r.result); r.onerror = () => rej(r.error); });
	const db = await req(indexedDB.open("alvea-logbook"));
	try {
		if (!db.objectStoreNames.contains("meta")) return "";
		const v = await req(db.transaction("meta", "readonly").objectStore("meta").get("side:draft"));
		return v ? btoa(Array.from(v, c => String.fromCharCode(c)).join("")) : "";
	} finally { db.close(); }
})()`

// drNoPlain fails the test if marker is in localStorage, sessionStorage,
// IndexedDB (any database, store, key or value) or Cache Storage.
func drNoPlain(t *testing.T, b *browser, marker, when string) {
	t.Helper()
	dump := eval[string](b, storageDumpJS)
	if i := strings.Index(dump, marker); i >= 0 {
		t.Errorf("%s: patient value %s in browser storage near %q", when, marker, dump[max(0, i-80):i])
	}
	if eval[bool](b, cacheContainsJS+`(`+fmt.Sprintf("%q", marker)+`)`) {
		t.Errorf("%s: patient value %s in Cache Storage", when, marker)
	}
}

// drGoLogbook switches to the Logbook tab and waits for it to open.
func (b *browser) drGoLogbook() {
	b.t.Helper()
	b.tap("#tab-logbook")
	b.waitLB("the logbook to open", `document.querySelector("#lb-create, #lb-unlock, #lb-nav-list") !== null`, 30*time.Second)
}

func (b *browser) drGoBrief() {
	b.t.Helper()
	b.tap("#tab-brief")
	b.waitExists("#b-pt-pao2")
}

// The scenario of brief_test.go with the marker PaO2 and age 61.
func drScenario() *physio.PlanDocument {
	doc := briefScenario()
	doc.Patient.PaO2MmHg = physio.PlanValue(61.37)
	doc.Patient.AgeYears = physio.PlanValue(61)
	return doc
}

// A crew fills the Brief with a patient value and no logbook: the note
// says it is kept in memory only. They create the logbook: the block is
// sealed in its draft slot; an edit is sealed again. Nothing readable
// reaches any browser storage. After a reload the route is back at once,
// the patient block is empty with the note; unlocking brings it back, and
// the plan equals physio's. The frame's Lock button locks: the values stay
// on screen and the note comes back. axe-core finds nothing serious.
func TestBriefDraftPatientSealedInVault(t *testing.T) {
	want, err := physio.ComputePlan(drScenario())
	if err != nil {
		t.Fatal(err)
	}
	needJS := `document.querySelector("#b-r-need-v")?.textContent === "` + want.OxygenNeededL.String() + `"`
	srv := startApp(t, repoRoot)
	b := newBrowser(t, t.TempDir())
	b.open(srv.URL("/"))
	fillBrief(b)
	b.typeInto("#b-pt-pao2", drMarker)
	b.waitFor("the note with no logbook", `(document.querySelector("#b-pt-kept")?.textContent ?? "").includes("Create the logbook")`, 10*time.Second)
	if b.exists("#frame-lock") {
		t.Error("Lock offered with no logbook")
	}
	b.waitFor("the draft saved", `(localStorage.getItem("alvea.brief.draft") ?? "").includes("25000")`, 10*time.Second)
	// The check can fail: a plain value is seen.
	eval[bool](b, `(sessionStorage.setItem("probe", "`+drMarker+`"), true)`)
	if !strings.Contains(eval[string](b, storageDumpJS), drMarker) {
		t.Fatal("the storage dump does not see a plain value: the check is not working")
	}
	eval[bool](b, `(sessionStorage.removeItem("probe"), true)`)
	drNoPlain(t, b, drMarker, "no logbook")

	// Create the logbook: the values on screen are sealed at once.
	b.drGoLogbook()
	b.createVault(testPass)
	b.waitFor("the sealed draft", drSideDraftJS+`.then(v => v !== "")`, 20*time.Second)
	if !b.exists("#frame-lock") {
		t.Error("no Lock button in the header while the logbook is unlocked")
	}
	b.drGoBrief()
	if got := b.value("#b-pt-pao2"); got != drMarker {
		t.Errorf("PaO2 after creating the logbook = %q", got)
	}
	if b.exists("#b-pt-kept") {
		t.Errorf("note shown while unlocked: %q", b.text("#b-pt-kept"))
	}
	sealed := eval[string](b, drSideDraftJS)
	b.typeInto("#b-pt-age", "61")
	b.waitFor("the edit sealed", drSideDraftJS+`.then(v => v !== "" && v !== `+fmt.Sprintf("%q", sealed)+`)`, 10*time.Second)
	b.waitFor("the plan", needJS, 15*time.Second)
	drNoPlain(t, b, drMarker, "logbook unlocked")

	// Reload: route and legs at once; patient empty with the note.
	b.reload()
	b.waitFor("the draft after reload", `document.querySelector("#b-leg1-flow")?.value === "6"`, 15*time.Second)
	if got := b.value("#b-pt-pao2"); got != "" {
		t.Errorf("PaO2 shown before unlocking: %q", got)
	}
	b.waitFor("the note while locked", `(document.querySelector("#b-pt-kept")?.textContent ?? "").includes("until the logbook is unlocked")`, 10*time.Second)
	drNoPlain(t, b, drMarker, "after reload")

	// Unlock in the Logbook, back to the Brief: the patient block is back.
	b.drGoLogbook()
	b.unlock(testPass)
	b.waitLB("the logbook unlocked", `document.querySelector("#lb-nav-list") !== null`, 20*time.Second)
	b.drGoBrief()
	b.waitFor("the patient block restored", `document.querySelector("#b-pt-pao2")?.value === "`+drMarker+`"`, 15*time.Second)
	for sel, v := range map[string]string{"#b-pt-fio2": "0.28", "#b-pt-paco2": "40", "#b-pt-hb": "13", "#b-pt-age": "61"} {
		if got := b.value(sel); got != v {
			t.Errorf("after unlock %s = %q, want %q", sel, got, v)
		}
	}
	b.waitFor("the plan after unlock (physio.ComputePlan)", needJS, 15*time.Second)
	if b.exists("#b-pt-kept") {
		t.Error("note shown after unlock")
	}
	if v := b.axe(); len(v) > 0 {
		t.Errorf("axe-core (unlocked, Lock button): %+v", v)
	}
	if w, h := b.drSize("#frame-lock"); w < 44 || h < 44 {
		t.Errorf("Lock button %v×%v px, want at least 44×44", w, h)
	}
	// The accessible name begins with the visible text (WCAG 2.5.3).
	if name, text := eval[string](b, `document.querySelector("#frame-lock").getAttribute("aria-label")`), b.text("#frame-lock"); name != "Lock logbook" || text != "Lock" {
		t.Errorf("Lock button: name %q, text %q", name, text)
	}
	// All six tabs stay in view beside it on a portrait tablet.
	b.viewport(768, 1024)
	if clipped := eval[[]string](b, `Array.from(document.querySelectorAll(".alv-tab")).filter(a => { const r = a.getBoundingClientRect(), n = a.closest("nav").getBoundingClientRect(); return r.right > n.right + 0.5 || r.left < n.left - 0.5 }).map(a => a.textContent)`); len(clipped) > 0 {
		t.Errorf("tabs cut off beside the Lock button at 768 px: %v", clipped)
	}
	b.viewport(1024, 768)
	b.screenshot("brief-unlocked", 1024, 768)
	b.screenshot("brief-unlocked", 768, 1024)

	// The frame's Lock: the key goes, what is on screen stays, the note
	// comes back.
	b.tap("#frame-lock")
	b.waitFor("the note after Lock", `(document.querySelector("#b-pt-kept")?.textContent ?? "").includes("until the logbook is unlocked")`, 10*time.Second)
	if b.exists("#frame-lock") {
		t.Error("Lock still offered after locking")
	}
	if got := b.value("#b-pt-pao2"); got != drMarker {
		t.Errorf("Lock wiped the patient value on screen: %q", got)
	}
	b.drGoLogbook()
	if !b.exists("#lb-unlock") {
		t.Error("the Logbook is not locked after the frame's Lock")
	}
	b.drGoBrief()
	if v := b.axe(); len(v) > 0 {
		t.Errorf("axe-core (note shown): %+v", v)
	}
	b.screenshot("brief-note", 1024, 768)
	drNoPlain(t, b, drMarker, "at the end")
}

func (b *browser) drSize(sel string) (float64, float64) {
	b.t.Helper()
	r := eval[[]float64](b, fmt.Sprintf(`(() => { const r = document.querySelector(%q)?.getBoundingClientRect(); return r ? [r.width, r.height] : [0, 0] })()`, sel))
	return r[0], r[1]
}

// A patient block an earlier version left in plain localStorage is taken
// into memory and deleted from localStorage at the next load, then sealed
// when the logbook is created, and comes back after a reload and unlock.
func TestBriefDraftOldPlainPatientMigrated(t *testing.T) {
	srv := startApp(t, repoRoot)
	b := newBrowser(t, t.TempDir())
	b.open(srv.URL("/"))
	eval[bool](b, `(localStorage.setItem("alvea.brief.patient", JSON.stringify({schema: 1, patient: {fio2: {t: "0.28"}, pao2: {t: "`+drOldMarker+`", u: "mmHg"}, measuredAt: "origin"}})), true)`)
	b.reload()
	b.waitFor("the old block on the Brief", `document.querySelector("#b-pt-pao2")?.value === "`+drOldMarker+`"`, 15*time.Second)
	if !eval[bool](b, `localStorage.getItem("alvea.brief.patient") === null`) {
		t.Error("the old plain patient block is still in localStorage")
	}
	drNoPlain(t, b, drOldMarker, "after migration")
	b.drGoLogbook()
	b.createVault(testPass)
	b.waitFor("the sealed draft", drSideDraftJS+`.then(v => v !== "")`, 20*time.Second)
	b.reload()
	b.waitLB("the unlock form", `document.querySelector("#lb-unlock") !== null`, 30*time.Second)
	b.unlock(testPass)
	b.waitLB("the logbook unlocked", `document.querySelector("#lb-nav-list") !== null`, 20*time.Second)
	b.drGoBrief()
	b.waitFor("the migrated block restored", `document.querySelector("#b-pt-pao2")?.value === "`+drOldMarker+`"`, 15*time.Second)
	if got := b.value("#b-pt-fio2"); got != "0.28" {
		t.Errorf("FiO2 after migration and unlock = %q", got)
	}
	drNoPlain(t, b, drOldMarker, "at the end")
}

// Settings: the auto-lock time is checked like every field and persists.
// Set to 1 minute it locks the logbook after 1 minute without use, and a
// tap anywhere (here on the Brief) postpones it. The page's monotonic clock
// (performance.now, which Go's runtime reads for its timers and time.Now)
// is moved forward instead of waiting a minute; an event the app does not
// count as use (a window resize) lets Go's scheduler run the due timer.
func TestSettingsAutoLockLocksWhenIdle(t *testing.T) {
	srv := startApp(t, repoRoot)
	b := newBrowser(t, t.TempDir())
	b.open(srv.URL("/settings"))
	if got := b.value("#set-autolock"); got != "5" {
		t.Errorf("default auto-lock = %q, want 5 (minutes)", got)
	}
	b.typeInto("#set-autolock", "0")
	b.waitExists("#set-autolock-msg")
	if msg := b.text("#set-autolock-msg"); !strings.Contains(msg, "between 1 and 60 min") {
		t.Errorf("auto-lock message %q", msg)
	}
	b.typeInto("#set-autolock", "1")
	b.waitFor("the message to clear", `document.querySelector("#set-autolock-msg") === null`, 10*time.Second)
	b.reload()
	if got := b.value("#set-autolock"); got != "1" {
		t.Fatalf("auto-lock after reload = %q, want 1", got)
	}

	b.drGoLogbook()
	b.createVault(testPass)
	b.drGoBrief()
	if !b.exists("#frame-lock") {
		t.Fatal("no Lock button after creating the logbook")
	}
	eval[bool](b, `(() => { const now = performance.now.bind(performance); window.__skew = 0;
		performance.now = () => now() + window.__skew; return true })()`)
	advance := func(seconds int) {
		t.Helper()
		eval[bool](b, fmt.Sprintf(`(window.__skew += %d, window.dispatchEvent(new Event("resize")), true)`, seconds*1000))
		// Let the page run the due timers and redraw.
		eval[bool](b, `new Promise(r => setTimeout(() => requestAnimationFrame(() => r(true)), 300))`)
	}
	advance(50)
	eval[bool](b, `(document.querySelector("#b-rt-origin").dispatchEvent(new PointerEvent("pointerdown", {bubbles: true})), true)`)
	advance(50)
	if !b.exists("#frame-lock") {
		t.Fatal("locked 50 s after a tap, with 1 minute set")
	}
	advance(11)
	b.waitFor("the idle lock", `document.querySelector("#frame-lock") === null`, 10*time.Second)
	b.waitFor("the note after the idle lock", `(document.querySelector("#b-pt-kept")?.textContent ?? "").includes("until the logbook is unlocked")`, 10*time.Second)
	b.drGoLogbook()
	if !b.exists("#lb-unlock") {
		t.Error("the Logbook is not locked after the idle time")
	}
}
