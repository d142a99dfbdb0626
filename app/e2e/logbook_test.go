//go:build !wasm

package e2e

import (
	"fmt"
	"strings"
	"testing"
	"time"
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
	b.tap("#lb-nav-start")
	b.waitLB("the start form", `document.querySelector("#lb-start") !== null`, 10*time.Second)
	b.typeInto("#lb-vehicle", vehicle)
	b.typeInto("#lb-crew", "ab cd")
	b.typeInto("#lb-origin", origin)
	b.typeInto("#lb-origin-elev", "1200")
	b.typeInto("#lb-dest", dest)
	b.typeInto("#lb-dest-elev", "10")
	b.typeInto("#lb-weight", "72")
	b.tap("#lb-start-go")
	b.waitLB("the transport timeline", `document.querySelector("#lb-timeline li[data-seq]") !== null`, 20*time.Second)
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

	b.tap("#lb-ev-lift-off")
	b.waitSeqs(2)
	b.typeInto("#lb-gauge-cyl", "A")
	b.typeInto("#lb-gauge-p", "1800")
	b.tap("#lb-gauge-go")
	b.waitSeqs(3)
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
