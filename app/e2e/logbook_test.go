//go:build !wasm

package e2e

import (
	"bytes"
	"context"
	"fmt"
	"os"
	"path/filepath"
	"slices"
	"sort"
	"strings"
	"sync"
	"testing"
	"time"

	cdpbrowser "github.com/chromedp/cdproto/browser"
	"github.com/chromedp/cdproto/target"
	"github.com/chromedp/chromedp"

	"alvea/app/logbook"
	"alvea/app/logbook/idb"
)

// Passphrases of these tests: invented, accepted by the vault's rules.
const (
	testPass  = "heron above the estuary at dusk"
	otherPass = "lantern in the quiet boathouse"
)

// waitLong is the limit for anything that derives a key in the browser
// (Argon2id at the default 64 MiB, t=5 takes about a second in wasm).
const waitLong = 90 * time.Second

// waitLB waits like waitFor, and on failure reports what the Logbook
// screen says (its status and problem lines).
func (b *browser) waitLB(what, expr string, timeout time.Duration) {
	b.t.Helper()
	deadline := time.Now().Add(timeout)
	for !eval[bool](b, "!!("+expr+")") {
		if time.Now().After(deadline) {
			b.t.Fatalf("waiting for %s: status %q, problem %q", what, b.text("#lb-status"), b.text("#lb-problem"))
		}
		time.Sleep(50 * time.Millisecond)
	}
}

func (b *browser) openLogbook(url string) {
	b.t.Helper()
	b.open(url)
	b.waitLB("the logbook to open", `document.querySelector("#lb-create, #lb-unlock, #lb-nav-list") !== null`, 30*time.Second)
}

func (b *browser) createVault(pass string) {
	b.t.Helper()
	b.typeInto("#lb-new-pass", pass)
	b.typeInto("#lb-new-again", pass)
	b.tap("#lb-create-go")
	b.waitLB("the vault to be created", `document.querySelector("#lb-nav-list") !== null`, waitLong)
}

func (b *browser) unlock(pass string) {
	b.t.Helper()
	b.typeInto("#lb-pass", pass)
	b.tap("#lb-unlock-go")
	b.waitLB("the vault to unlock", `document.querySelector("#lb-nav-list") !== null || (document.querySelector("#lb-problem")?.textContent ?? "") !== ""`, waitLong)
}

// startTransport opens a transport from the start form and waits for its
// timeline.
func (b *browser) startTransport(vehicle, origin, dest string) {
	b.t.Helper()
	b.startTransportWith(lbStart{vehicle: vehicle, crew: "ab cd", origin: origin, originElev: "1200", dest: dest, destElev: "10", weight: "72"})
}

// lbStart is a start of transport as typed into the form; a blank field is
// left as the form has it (openedAt blank: opened now).
type lbStart struct {
	vehicle, crew, origin, originElev, dest, destElev, weight, openedAt string
}

// startTransportWith opens the start form, types s into it, sends it and
// waits for the new transport's timeline.
func (b *browser) startTransportWith(s lbStart) {
	b.t.Helper()
	b.tap("#lb-nav-start")
	b.waitLB("the start form", `document.querySelector("#lb-start") !== null`, 10*time.Second)
	for _, f := range []struct{ sel, text string }{
		{"#lb-vehicle", s.vehicle}, {"#lb-crew", s.crew}, {"#lb-origin", s.origin}, {"#lb-origin-elev", s.originElev},
		{"#lb-dest", s.dest}, {"#lb-dest-elev", s.destElev}, {"#lb-weight", s.weight}, {"#lb-start-at", s.openedAt},
	} {
		if f.text != "" {
			b.typeInto(f.sel, f.text)
		}
	}
	b.tap("#lb-start-go")
	b.waitLB("the transport timeline", `document.querySelector("#lb-timeline li[data-seq]") !== null`, 20*time.Second)
}

// liftOffAndReading taps Lift-off and saves a gauge reading of 1800 on
// cylinder A: records 2 and 3 of a transport just started.
func (b *browser) liftOffAndReading() {
	b.t.Helper()
	b.tap("#lb-ev-lift-off")
	b.waitSeqs(2)
	b.typeInto("#lb-gauge-cyl", "A")
	b.typeInto("#lb-gauge-p", "1800")
	b.tap("#lb-gauge-go")
	b.waitSeqs(3)
}

// savedSeqs returns the record numbers the timeline shows (shown = saved).
func (b *browser) savedSeqs() []int {
	b.t.Helper()
	return eval[[]int](b, `Array.from(document.querySelectorAll("#lb-timeline li[data-seq]")).map(e => +e.dataset.seq)`)
}

func (b *browser) waitSeqs(n int) {
	b.t.Helper()
	b.waitLB(fmt.Sprintf("%d records in the timeline", n), fmt.Sprintf(`document.querySelectorAll("#lb-timeline li[data-seq]").length >= %d && !document.querySelector(".lb-busy")`, n), 20*time.Second)
}

func (b *browser) timelineText() string {
	b.t.Helper()
	return b.text("#lb-timeline")
}

// Create a vault, record a transport with events, a gauge reading,
// observations and a note, reload, unlock and see it all; a correction is
// a new record and both are shown.
func TestLogbookRecordReloadUnlock(t *testing.T) {
	srv := startApp(t, repoRoot)
	b := newBrowser(t, t.TempDir())
	b.openLogbook(srv.URL("/logbook"))
	b.createVault(testPass)
	b.startTransport("King Air B200", "Plateau clinic", "Coast hospital")

	b.liftOffAndReading()
	if v := b.value("#lb-gauge-p"); v != "" {
		t.Errorf("the saved reading stays in its field: %q", v)
	}
	b.typeInto("#lb-obs-spo2", "93")
	b.typeInto("#lb-obs-fio2", "0.4")
	b.typeInto("#lb-obs-rr", "18")
	b.typeInto("#lb-obs-etco2", "38")
	b.tap("#lb-obs-go")
	b.waitSeqs(4)
	b.typeInto("#lb-note-text", "patient settled after climb")
	b.tap("#lb-note-go")
	b.waitSeqs(5)
	b.tap("#lb-ev-landing")
	b.waitSeqs(6)
	// Correct the gauge reading (R3): a new record pointing at it.
	b.tap("#lb-correct-3")
	b.typeInto("#lb-amend-reason", "misread gauge")
	b.typeInto("#lb-amend-text", "1700")
	b.tap("#lb-amend-go")
	b.waitSeqs(7)
	b.tap("#lb-ev-handover")
	b.waitSeqs(8)

	b.reload()
	b.waitLB("the unlock form", `document.querySelector("#lb-unlock") !== null`, 30*time.Second)
	if b.exists("#lb-list") {
		t.Fatal("the list is shown before unlocking")
	}
	b.unlock(testPass)
	b.waitLB("the list", `document.querySelector("#lb-list tr[data-transport]") !== null`, 20*time.Second)
	row := b.text("#lb-list tbody tr")
	for _, want := range []string{"Plateau clinic → Coast hospital", "King Air B200", "open", "corrected"} {
		if !strings.Contains(row, want) {
			t.Errorf("list row %q lacks %q", row, want)
		}
	}
	b.tap("#lb-list tbody tr button")
	b.waitSeqs(8)
	tl := b.timelineText()
	for _, want := range []string{"lift-off", "Gauge A: 1800 psi", "SpO2 93 %", "FiO2 0.40", "RR 18/min", "EtCO2 38 mmHg",
		"Note: patient settled after climb", "landing", "Correction of R3 (misread gauge): Gauge A: 1700 psi", "corrected by R7", "handover"} {
		if !strings.Contains(tl, want) {
			t.Errorf("timeline lacks %q:\n%s", want, tl)
		}
	}
	// Search and filters work on the index.
	b.tap("#lb-nav-list")
	b.waitLB("the list", `document.querySelector("#lb-list") !== null`, 20*time.Second)
	b.typeInto("#lb-search", "coast")
	b.waitLB("one match", `document.querySelector("#lb-count")?.textContent.startsWith("1 of 1")`, 5*time.Second)
	b.typeInto("#lb-search", "nowhere")
	b.waitLB("no match", `document.querySelector("#lb-count")?.textContent.startsWith("0 of 1")`, 5*time.Second)
	b.typeInto("#lb-search", "")
	b.tap("#lb-show-closed")
	b.waitLB("no closed transport", `document.querySelector("#lb-count")?.textContent.startsWith("0 of 1")`, 5*time.Second)
	b.tap("#lb-show-open")
	b.waitLB("one open transport", `document.querySelector("#lb-count")?.textContent.startsWith("1 of 1")`, 5*time.Second)
}

// storageDumpJS returns, as one JSON string, everything the origin keeps in
// IndexedDB (every database, store, key and value; byte values as Latin-1
// text, so plain text inside them reads as itself), localStorage and
// sessionStorage. The database names are part of the dump.
const storageDumpJS = `(async () => {
	const req = r => new Promise((res, rej) => { r.onsuccess = () => res(r.result); r.onerror = () => rej(r.error); });
	const enc = v => v instanceof Uint8Array ? Array.from(v, c => String.fromCharCode(c)).join("")
		: v instanceof ArrayBuffer ? Array.from(new Uint8Array(v), c => String.fromCharCode(c)).join("")
		: JSON.stringify(v);
	const out = {idb: {}, local: {}, session: {}};
	for (const d of await indexedDB.databases()) {
		const db = await req(indexedDB.open(d.name));
		for (const s of Array.from(db.objectStoreNames)) {
			const os = db.transaction(s, "readonly").objectStore(s);
			const keys = await req(os.getAllKeys());
			const vals = await req(os.getAll());
			out.idb[d.name + "/" + s] = keys.map((k, i) => [JSON.stringify(k), enc(vals[i])]);
		}
		db.close();
	}
	for (let i = 0; i < localStorage.length; i++) { const k = localStorage.key(i); out.local[k] = localStorage.getItem(k); }
	for (let i = 0; i < sessionStorage.length; i++) { const k = sessionStorage.key(i); out.session[k] = sessionStorage.getItem(k); }
	return JSON.stringify(out);
})()`

// cacheContainsJS reports whether any response in Cache Storage (the
// service worker's caches), or any cached URL, contains the marker.
const cacheContainsJS = `(async (marker) => {
	for (const name of await caches.keys()) {
		if (name.includes(marker)) return true;
		const c = await caches.open(name);
		for (const r of await c.keys()) {
			if (r.url.includes(marker)) return true;
			const res = await c.match(r);
			const bytes = new Uint8Array(await res.arrayBuffer());
			const text = Array.from(bytes, c => String.fromCharCode(c)).join("");
			if (text.includes(marker)) return true;
		}
	}
	return false;
})`

// A marker typed into a note (and into the identifying field and the
// vehicle) never appears as plain text in IndexedDB, localStorage,
// sessionStorage, Cache Storage, the URL, or the console.
func TestLogbookMarkerNeverStoredInPlain(t *testing.T) {
	srv := startApp(t, repoRoot)
	b := newBrowser(t, t.TempDir())
	var consoleMu sync.Mutex
	var console []string
	chromedp.Listen(b.ctx, func(ev any) {
		consoleMu.Lock()
		defer consoleMu.Unlock()
		console = append(console, fmt.Sprintf("%#v", ev))
	})
	marker := "QX7MARKERZ" + fmt.Sprint(time.Now().UnixNano()%1e6)
	b.openLogbook(srv.URL("/logbook"))
	b.createVault(testPass)
	b.tap("#lb-nav-start")
	b.waitLB("the start form", `document.querySelector("#lb-start") !== null`, 10*time.Second)
	b.typeInto("#lb-vehicle", "Van "+marker+"V")
	b.typeInto("#lb-origin", "Ridge post")
	b.typeInto("#lb-dest", "Harbour ward")
	b.typeInto("#lb-ident", "name "+marker+"I")
	b.tap("#lb-start-go")
	b.waitSeqs(1)
	b.typeInto("#lb-note-text", "note "+marker+"N")
	b.tap("#lb-note-go")
	b.waitSeqs(2)
	if !strings.Contains(b.timelineText(), marker+"N") {
		t.Fatal("the note is not shown: the test would prove nothing")
	}
	// The check can fail: the marker is found when it is stored in plain.
	eval[bool](b, `(localStorage.setItem("probe", "`+marker+`P"), true)`)
	if !strings.Contains(eval[string](b, storageDumpJS), marker+"P") {
		t.Fatal("the storage dump does not see a plain value: the check is not working")
	}
	eval[bool](b, `(localStorage.removeItem("probe"), true)`)

	dump := eval[string](b, storageDumpJS)
	if strings.Contains(dump, marker) {
		i := strings.Index(dump, marker)
		t.Errorf("marker found in browser storage near %q", dump[max(0, i-80):i])
	}
	if !strings.Contains(dump, idb.DBName) {
		t.Errorf("the dump does not hold the vault database %q: the check saw nothing", idb.DBName)
	}
	if eval[bool](b, cacheContainsJS+`(`+fmt.Sprintf("%q", marker)+`)`) {
		t.Error("marker found in Cache Storage")
	}
	if u := eval[string](b, `location.href`); strings.Contains(u, marker) {
		t.Errorf("marker in the URL %q", u)
	}
	// Reload and unlock: still nothing in plain, and the console never saw it.
	b.reload()
	b.unlock(testPass)
	if strings.Contains(eval[string](b, storageDumpJS), marker) {
		t.Error("marker found in browser storage after reload and unlock")
	}
	consoleMu.Lock()
	for _, line := range console {
		if strings.Contains(line, marker) && strings.Contains(line, "Console") {
			t.Errorf("marker in console output: %.200s", line)
		}
	}
	consoleMu.Unlock()
}

// A wrong passphrase changes nothing: every byte the origin stores is the
// same before and after, the screen says so vaguely, and the right
// passphrase still unlocks.
func TestLogbookWrongPassphraseChangesNothing(t *testing.T) {
	srv := startApp(t, repoRoot)
	b := newBrowser(t, t.TempDir())
	b.openLogbook(srv.URL("/logbook"))
	b.createVault(testPass)
	b.startTransport("Ambulance", "Valley", "City")
	b.reload()
	b.waitLB("the unlock form", `document.querySelector("#lb-unlock") !== null`, 30*time.Second)
	before := eval[string](b, storageDumpJS)
	b.unlock(otherPass)
	if got := b.text("#lb-problem"); !strings.Contains(got, "Wrong passphrase, or the vault is damaged. Nothing was changed.") {
		t.Errorf("wrong passphrase: problem = %q", got)
	}
	if b.exists("#lb-list") || b.exists("#lb-nav-list") {
		t.Error("a wrong passphrase showed the logbook")
	}
	after := eval[string](b, storageDumpJS)
	if before != after {
		t.Errorf("storage changed after a wrong passphrase (%d → %d bytes of dump)", len(before), len(after))
	}
	if !strings.Contains(before, "alvea-logbook/meta") {
		t.Fatal("the dump holds no vault: the comparison proves nothing")
	}
	b.unlock(testPass)
	b.waitLB("the list", `document.querySelector("#lb-list tr[data-transport]") !== null`, 20*time.Second)
}

// Export the vault as a bundle (a download), check it with the Go vault
// code, then import it into a fresh browser profile and see the same
// transports.
func TestLogbookExportImportFreshProfile(t *testing.T) {
	srv := startApp(t, repoRoot)
	b := newBrowser(t, t.TempDir())
	b.openLogbook(srv.URL("/logbook"))
	b.createVault(testPass)
	b.startTransport("Helicopter H145", "Glacier hut", "Valley hospital")
	b.tap("#lb-ev-lift-off")
	b.waitSeqs(2)
	b.tap("#lb-nav-start")
	b.startTransport("Ambulance", "Farm road", "District clinic")
	b.tap("#lb-nav-list")
	b.waitLB("two transports", `document.querySelectorAll("#lb-list tr[data-transport]").length === 2`, 20*time.Second)
	rowsA := eval[[]string](b, `Array.from(document.querySelectorAll("#lb-list tbody tr")).map(r => r.textContent)`)

	dl := t.TempDir()
	if _, err := chromedp.Call(b.ctx, cdpbrowser.SetDownloadBehavior, cdpbrowser.SetDownloadBehaviorParams{
		Behavior: cdpbrowser.SetDownloadBehaviorBehaviorAllow, DownloadPath: dl,
	}); err != nil {
		t.Fatalf("download behaviour: %v", err)
	}
	b.tap("#lb-nav-manage")
	b.waitLB("the vault controls", `document.querySelector("#lb-export") !== null`, 10*time.Second)
	b.tap("#lb-export")
	var bundlePath string
	deadline := time.Now().Add(30 * time.Second)
	for bundlePath == "" {
		m, _ := filepath.Glob(filepath.Join(dl, "*"+logbook.BundleExt))
		if len(m) == 1 {
			bundlePath = m[0]
		} else if time.Now().After(deadline) {
			t.Fatalf("no bundle downloaded (status %q, problem %q)", b.text("#lb-status"), b.text("#lb-problem"))
		} else {
			time.Sleep(100 * time.Millisecond)
		}
	}
	if u := eval[string](b, `location.href`); u != srv.URL("/logbook") {
		t.Errorf("the URL changed on export: %q", u)
	}
	data, err := os.ReadFile(bundlePath)
	if err != nil {
		t.Fatal(err)
	}
	// The same Go code the desktop uses opens it: same transports, no problem.
	v, err := logbook.OpenBundle(context.Background(), data, testPass)
	if err != nil {
		t.Fatalf("the exported bundle does not open: %v", err)
	}
	if ps, err := v.Verify(context.Background()); err != nil || len(ps) != 0 {
		t.Errorf("exported bundle: verify = %v, %v", ps, err)
	}
	if l, err := v.List(context.Background()); err != nil || len(l.Transports) != 2 {
		t.Errorf("exported bundle lists %v transports (err %v), want 2", l, err)
	}

	// A fresh profile: import, then the same list.
	b2 := newBrowser(t, t.TempDir())
	b2.openLogbook(srv.URL("/logbook"))
	b2.waitLB("the empty logbook", `document.querySelector("#lb-import") !== null`, 30*time.Second)
	// A changed bundle is refused and nothing is written.
	bad := bytes.Clone(data)
	bad[len(bad)/2] ^= 0x01
	badPath := filepath.Join(t.TempDir(), "changed"+logbook.BundleExt)
	if err := os.WriteFile(badPath, bad, 0o644); err != nil {
		t.Fatal(err)
	}
	b2.must("choose the changed bundle", chromedp.SetUploadFiles("#lb-import-file", []string{badPath}))
	b2.typeInto("#lb-import-pass", testPass)
	b2.tap("#lb-import-go")
	b2.waitLB("the refusal", `(document.querySelector("#lb-problem")?.textContent ?? "").includes("Nothing was written")`, waitLong)
	if d := eval[string](b2, storageDumpJS); strings.Contains(d, `"alvea-logbook/meta":[[`) {
		t.Error("a refused bundle wrote a header")
	}
	b2.must("choose the bundle", chromedp.SetUploadFiles("#lb-import-file", []string{bundlePath}))
	b2.typeInto("#lb-import-pass", testPass)
	b2.tap("#lb-import-go")
	b2.waitLB("the imported list", `document.querySelectorAll("#lb-list tr[data-transport]").length === 2`, waitLong)
	rowsB := eval[[]string](b2, `Array.from(document.querySelectorAll("#lb-list tbody tr")).map(r => r.textContent)`)
	if !slices.Equal(rowsA, rowsB) {
		t.Errorf("imported list differs:\n got %q\nwant %q", rowsB, rowsA)
	}
	b2.tap("#lb-list tbody tr:last-child button")
	b2.waitSeqs(2)
	if tl := b2.timelineText(); !strings.Contains(tl, "lift-off") {
		t.Errorf("imported timeline lacks the lift-off: %s", tl)
	}
	// And it survives a reload in the new profile.
	b2.reload()
	b2.unlock(testPass)
	b2.waitLB("the list after reload", `document.querySelectorAll("#lb-list tr[data-transport]").length === 2`, 20*time.Second)
}

// tab opens a new tab in b's browser (same profile).
func (b *browser) tab() (*browser, context.CancelFunc) {
	ctx, cancel := chromedp.NewContext(b.ctx)
	if err := chromedp.Do(ctx); err != nil {
		b.t.Fatalf("new tab: %v", err)
	}
	// Bring it to the front: a background tab does not draw (the app
	// renders on animation frames), as a person would see it.
	id := chromedp.FromContext(ctx).Target.TargetID
	if _, err := chromedp.Call(ctx, target.ActivateTarget, target.ActivateTargetParams{TargetID: id}); err != nil {
		b.t.Fatalf("activate tab: %v", err)
	}
	tb := &browser{t: b.t, dataDir: b.dataDir, ctx: ctx}
	tb.viewport(1024, 768)
	return tb, cancel
}

// Closing the tab in the middle of saving, many times over, loses no record
// the screen showed as saved and leaves no half record: after each close a
// new tab unlocks, finds every record seen before, and the whole vault
// verifies with no problem.
func TestLogbookCloseTabWhileSaving(t *testing.T) {
	srv := startApp(t, repoRoot)
	b := newBrowser(t, t.TempDir())
	first, closeFirst := b.tab()
	first.openLogbook(srv.URL("/logbook"))
	first.createVault(testPass)
	first.startTransport("Fixed wing", "Island strip", "Mainland base")
	closeFirst()

	const rounds = 20
	var seen []int // every record any tab showed as saved
	for round := 0; round < rounds; round++ {
		tb, closeTab := b.tab()
		tb.openLogbook(srv.URL("/logbook"))
		tb.unlock(testPass)
		tb.waitLB("the list", `document.querySelector("#lb-list tbody button") !== null`, 20*time.Second)
		tb.tap("#lb-list tbody button")
		tb.waitLB("the timeline", `document.querySelector("#lb-timeline li[data-seq]") !== null && !document.querySelector(".lb-busy")`, 20*time.Second)
		shown := tb.savedSeqs()
		for _, s := range seen {
			if !slices.Contains(shown, s) {
				t.Errorf("round %d: record R%d was shown as saved before a close, and is gone", round, s)
			}
		}
		// Every record verifies (no half record, chain and head intact).
		tb.tap("#lb-nav-manage")
		tb.waitLB("the vault controls", `document.querySelector("#lb-verify") !== null`, 10*time.Second)
		tb.tap("#lb-verify")
		tb.waitLB("the check", `document.querySelector("#lb-verify-result") !== null`, 30*time.Second)
		if got := tb.text("#lb-verify-result"); got != "Every record checked: no problem found." {
			t.Errorf("round %d: check = %q", round, got)
		}
		tb.tap("#lb-nav-list")
		tb.waitLB("the list", `document.querySelector("#lb-list tbody button") !== null`, 20*time.Second)
		tb.tap("#lb-list tbody button")
		tb.waitLB("the timeline", `document.querySelector("#lb-note-text") !== null && !document.querySelector(".lb-busy")`, 20*time.Second)
		// Start an append, and close the tab a varying moment later.
		eval[bool](tb, fmt.Sprintf(`(() => { const t = document.querySelector("#lb-note-text"); t.value = "round %d"; t.dispatchEvent(new Event("input", {bubbles: true})); return true })()`, round))
		time.Sleep(50 * time.Millisecond) // the input reaches Go
		// Tap save, wait a varying few milliseconds (an append takes a
		// few here), note what the screen shows as saved, and close the tab
		// at once, so that some closes fall before, some during and some
		// after the transaction.
		eval[bool](tb, `(document.querySelector("#lb-note-go").click(), true)`)
		time.Sleep(time.Duration(round%10) * 500 * time.Microsecond)
		shownNow := tb.savedSeqs()
		closeTab()
		for _, s := range shownNow {
			if !slices.Contains(seen, s) {
				seen = append(seen, s)
			}
		}
		sort.Ints(seen)
	}
	// A last look: every record seen is there, and nothing is damaged.
	tb, closeTab := b.tab()
	defer closeTab()
	tb.openLogbook(srv.URL("/logbook"))
	tb.unlock(testPass)
	tb.tap("#lb-nav-manage")
	tb.waitLB("the vault controls", `document.querySelector("#lb-verify") !== null`, 10*time.Second)
	tb.tap("#lb-verify")
	tb.waitLB("the check", `document.querySelector("#lb-verify-result") !== null`, 30*time.Second)
	if got := tb.text("#lb-verify-result"); got != "Every record checked: no problem found." {
		t.Errorf("final check = %q", got)
	}
	tb.tap("#lb-nav-list")
	tb.waitLB("the list", `document.querySelector("#lb-list tbody button") !== null`, 20*time.Second)
	tb.tap("#lb-list tbody button")
	tb.waitLB("the timeline", `document.querySelector("#lb-timeline li[data-seq]") !== null && !document.querySelector(".lb-busy")`, 20*time.Second)
	final := tb.savedSeqs()
	for _, s := range seen {
		if !slices.Contains(final, s) {
			t.Errorf("record R%d was shown as saved and is gone", s)
		}
	}
	t.Logf("closing the tab while saving, %d rounds: %d notes shown saved before the close, %d notes in the vault at the end (the rest were cut before their transaction completed)",
		rounds, len(seen)-1, len(final)-1)
}

// Every state of the Logbook screen has no serious or critical axe-core
// violation (WCAG 2.1 A and AA), no control under 44×44 px, and is
// photographed at 1024×768 and 768×1024 for review.
func TestLogbookAccessibilityAndScreenshots(t *testing.T) {
	srv := startApp(t, repoRoot)
	b := newBrowser(t, t.TempDir())
	check := func(state string) {
		t.Helper()
		for _, v := range b.axe() {
			t.Errorf("logbook %s: axe %s [%s] %s at %v", state, v.ID, v.Impact, v.Help, v.Nodes)
		}
		for _, small := range smallTargets(b) {
			t.Errorf("logbook %s: touch target under 44 px: %s", state, small)
		}
		b.screenshot("logbook-"+state, 1024, 768)
		b.screenshot("logbook-"+state, 768, 1024)
	}
	b.openLogbook(srv.URL("/logbook"))
	check("create")
	b.createVault(testPass)
	b.startTransport("King Air B200", "Plateau clinic", "Coast hospital")
	b.liftOffAndReading()
	b.typeInto("#lb-obs-spo2", "93")
	b.typeInto("#lb-obs-fio2", "0.4")
	b.tap("#lb-obs-go")
	b.waitSeqs(4)
	b.tap("#lb-correct-3")
	check("record")
	b.tap("#lb-nav-start")
	b.waitLB("the start form", `document.querySelector("#lb-start") !== null`, 10*time.Second)
	check("start")
	b.tap("#lb-nav-manage")
	b.waitLB("the storage status", `document.querySelector("#lb-usage, #lb-storage") !== null`, 10*time.Second)
	check("vault")
	b.tap("#lb-nav-list")
	b.waitLB("the list", `document.querySelector("#lb-list") !== null`, 10*time.Second)
	check("list")
	b.tap("#lb-lock")
	b.waitLB("the unlock form", `document.querySelector("#lb-unlock") !== null`, 10*time.Second)
	check("locked")
}

// memStore is a plain in-memory logbook.Store for building a vault
// natively, to be copied byte for byte into the browser's IndexedDB.
type memStore struct {
	header, head []byte
	recs         []logbook.Sealed
}

func (m *memStore) Meta(context.Context) ([]byte, []byte, error) {
	if m.header == nil {
		return nil, nil, logbook.ErrNoVault
	}
	return m.header, m.head, nil
}
func (m *memStore) PutHeader(_ context.Context, h []byte) error {
	m.header = bytes.Clone(h)
	return nil
}
func (m *memStore) Append(_ context.Context, r logbook.Sealed, head []byte) error {
	m.recs = append(m.recs, r)
	m.head = bytes.Clone(head)
	return nil
}
func (m *memStore) Index(context.Context) ([]logbook.IndexItem, error) {
	out := make([]logbook.IndexItem, len(m.recs))
	for i, r := range m.recs {
		out[i] = logbook.IndexItem{Seq: r.Seq, Index: r.Index}
	}
	return out, nil
}
func (m *memStore) Body(_ context.Context, seq uint64) ([]byte, error) {
	return m.recs[seq-1].Body, nil
}
func (m *memStore) Clear(context.Context) error { *m = memStore{}; return nil }

// Side slots are not copied into the browser (seedVault writes records).
func (m *memStore) PutSide(context.Context, string, []byte) error { return nil }
func (m *memStore) GetSide(_ context.Context, name string) ([]byte, error) {
	return nil, logbook.SideNotFoundError(name)
}
func (m *memStore) DeleteSide(context.Context, string) error { return nil }

// seedVault builds natively a vault of n records (transports of 10 records
// each: open, 8 entries, close) with the default key derivation, and
// writes its sealed bytes into the page's IndexedDB with the layout of
// package idb. Nothing in the app is involved: no test hook ships.
func seedVault(t *testing.T, b *browser, n int) {
	t.Helper()
	ctx := context.Background()
	store := &memStore{}
	v, err := logbook.Create(ctx, store, testPass, logbook.DefaultKDF)
	if err != nil {
		t.Fatal(err)
	}
	start := time.Date(2031, 3, 1, 8, 0, 0, 0, time.UTC)
	var id logbook.TransportID
	for i := 0; i < n; i++ {
		at := start.Add(time.Duration(i) * time.Minute)
		e := &logbook.Entry{Transport: id, At: at}
		switch i % 10 {
		case 0:
			id = logbook.NewTransportID(at)
			e.Transport, e.Kind = id, logbook.KindOpen
			e.Open = &logbook.Opening{Vehicle: fmt.Sprintf("Vehicle %d", i/10%7), Crew: []string{"AB"},
				Origin: logbook.Place{Name: fmt.Sprintf("Origin %d", i/10)}, Destination: logbook.Place{Name: "Base"}}
		case 9:
			e.Kind, e.Close = logbook.KindClose, &logbook.Closing{Outcome: "handed over"}
		default:
			e.Kind, e.Note = logbook.KindNote, &logbook.Note{Text: fmt.Sprintf("note %d", i)}
		}
		if _, err := v.Append(ctx, e); err != nil {
			t.Fatal(err)
		}
	}
	recs := make([]idb.SeedRecord, 0, len(store.recs))
	for _, r := range store.recs {
		recs = append(recs, idb.SeedRecord{Seq: r.Seq, Index: r.Index, Body: r.Body})
	}
	for _, script := range idb.SeedScripts(recs, store.header, store.head) {
		eval[bool](b, script)
	}
}

// Measured in Chromium: unlocking at the default key derivation (Argon2id
// m = 64 MiB, t = 5, p = 1), and opening and listing a vault of 10 000
// records. Reported with t.Log; the pass/fail checks are on the result
// (every transport listed, the chain verified), not on the time.
func TestLogbookUnlockAndListTimings(t *testing.T) {
	srv := startApp(t, repoRoot)
	b := newBrowser(t, t.TempDir())
	b.open(srv.URL("/settings"))
	const n = 10000
	seedVault(t, b, n)

	b.openLogbook(srv.URL("/logbook"))
	b.waitLB("the unlock form", `document.querySelector("#lb-unlock") !== null`, 30*time.Second)
	var unlockTimes, listTimes []time.Duration
	for round := 0; round < 3; round++ {
		b.typeInto("#lb-pass", testPass)
		// Time from the tap to the end of the key derivation ("Reading
		// the logbook…" appears), then to the list drawn.
		res := eval[[]float64](b, `(async () => {
			const t0 = performance.now();
			document.querySelector("#lb-unlock-go").click();
			const until = (f) => new Promise(res => { const step = () => f() ? res(performance.now()) : setTimeout(step, 5); step(); });
			const t1 = await until(() => (document.querySelector("#lb-status")?.textContent ?? "").includes("Reading the logbook"));
			const t2 = await until(() => document.querySelector("#lb-count") !== null && !document.querySelector(".lb-busy"));
			return [t1 - t0, t2 - t1];
		})()`)
		unlockTimes = append(unlockTimes, time.Duration(res[0]*float64(time.Millisecond)))
		listTimes = append(listTimes, time.Duration(res[1]*float64(time.Millisecond)))
		want := fmt.Sprintf("%d of %d transports", n/10, n/10)
		if got := b.text("#lb-count"); got != want {
			t.Errorf("list count %q, want %q", got, want)
		}
		if b.exists("#lb-chain-problems") {
			t.Errorf("the seeded vault shows chain problems: %s", b.text("#lb-chain-problems"))
		}
		b.tap("#lb-lock")
		b.waitLB("the unlock form", `document.querySelector("#lb-unlock") !== null`, 10*time.Second)
	}
	t.Logf("Chromium, Argon2id m=64 MiB t=5 p=1: unlock (tap to key derived) %v", unlockTimes)
	t.Logf("Chromium, open and list %d records (%d transports) after unlock: %v", n, n/10, listTimes)
}

// Two tabs on the same vault append in turn: the second tab's record
// number is taken, IndexedDB refuses it (ConstraintError, no overwrite),
// the vault re-reads the chain and appends after it. Both records are
// there and the vault verifies.
func TestLogbookTwoTabsAppend(t *testing.T) {
	srv := startApp(t, repoRoot)
	b := newBrowser(t, t.TempDir())
	a, closeA := b.tab()
	defer closeA()
	a.openLogbook(srv.URL("/logbook"))
	a.createVault(testPass)
	a.startTransport("Fixed wing", "North strip", "South base")
	c, closeC := b.tab()
	defer closeC()
	c.openLogbook(srv.URL("/logbook"))
	c.unlock(testPass)
	c.waitLB("the list", `document.querySelector("#lb-list tbody button") !== null`, 20*time.Second)
	c.tap("#lb-list tbody button")
	c.waitLB("the timeline", `document.querySelector("#lb-note-text") !== null && !document.querySelector(".lb-busy")`, 20*time.Second)
	// Tab a appends R2; tab c still believes R1 is the last.
	a.typeInto("#lb-note-text", "from the first tab")
	a.tap("#lb-note-go")
	a.waitSeqs(2)
	c.typeInto("#lb-note-text", "from the second tab")
	c.tap("#lb-note-go")
	c.waitSeqs(3)
	tl := c.timelineText()
	if !strings.Contains(tl, "from the first tab") || !strings.Contains(tl, "from the second tab") {
		t.Errorf("timeline after two tabs:\n%s", tl)
	}
	c.tap("#lb-nav-manage")
	c.waitLB("the vault controls", `document.querySelector("#lb-verify") !== null`, 10*time.Second)
	c.tap("#lb-verify")
	c.waitLB("the check", `document.querySelector("#lb-verify-result") !== null`, 30*time.Second)
	if got := c.text("#lb-verify-result"); got != "Every record checked: no problem found." {
		t.Errorf("check = %q", got)
	}
}
