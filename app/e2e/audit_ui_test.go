//go:build !wasm

package e2e

import (
	"fmt"
	"strings"
	"testing"
	"time"
)

// A comma between digit groups ("8,000 ft", "2,000 psi") is how English
// writes thousands; much of Europe writes "1,5" for one and a half. The SI
// Brochure (BIPM, 9th edition 2019, §5.4.4) names both the point and the
// comma as decimal markers and tells writers to group digits with spaces
// only, because either mark between groups misleads. Settings, Supply and
// Altitude take a comma as the decimal mark ("1,5" stays accepted), so
// "8,000" was read as 8 with no word: a cruise of 25 ft, a safe residual of
// 1 psi. Such a number is now refused, naming the field, its range and its
// unit, and the text stays as typed.
func TestAuditThousandsCommaRefused(t *testing.T) {
	srv := startApp(t, repoRoot)
	b := newBrowser(t, t.TempDir())

	refused := func(sel, typed, label, rng string) {
		t.Helper()
		b.waitFor(sel+" message", fmt.Sprintf(`(document.querySelector(%q)?.textContent ?? "") !== ""`, sel+"-msg"), 10*time.Second)
		msg := b.text(sel + "-msg")
		for _, part := range []string{label, rng, typed} {
			if !strings.Contains(msg, part) {
				t.Errorf("%s %q: message %q lacks %q", sel, typed, msg, part)
			}
		}
		if got := b.value(sel); got != typed {
			t.Errorf("%s shows %q after the refusal, want %q as typed", sel, got, typed)
		}
	}

	b.open(srv.URL("/altitude"))
	b.typeInto("#alt-cruise", "25,000")
	refused("#alt-cruise", "25,000", "Cruise altitude", "between -2000 and 65000 ft")

	b.open(srv.URL("/settings"))
	b.typeInto("#set-residual", "1,000")
	refused("#set-residual", "1,000", "Safe residual", "between 0 and 1000 psi")
	b.typeInto("#set-cyl-name", "Audit tank")
	b.typeInto("#set-cyl-water", "10")
	b.typeInto("#set-cyl-pressure", "2,200")
	b.tap("#cyl-add")
	refused("#set-cyl-pressure", "2,200", "Full pressure", "psi")
	// A decimal comma is still read as before.
	b.typeInto("#set-factor", "1,5")
	eval[bool](b, `new Promise(r => setTimeout(() => r(true), 300))`)
	if msg := b.text("#set-factor-msg"); msg != "" {
		t.Errorf("reserve factor 1,5 refused: %q", msg)
	}

	b.open(srv.URL("/supply"))
	b.typeInto("#supply-gauge", "2,000")
	b.typeInto("#supply-flow", "10")
	refused("#supply-gauge", "2,000", "Gauge reading", "between 0 and 3000 psi")
	b.typeInto("#supply-cyl-0-gauge", "1,800")
	refused("#supply-cyl-0-gauge", "1,800", "Gauge reading", "between 0 and 3000 psi")
}

// The start of transport reads the patient's weight as a plain decimal:
// "7e1" and "0x1p6" (exponent and hexadecimal forms Go's strconv.ParseFloat
// documents) were saved as 70 and 64 kg with no word. Refused now, naming
// the field and its unit, with the form as typed and nothing saved.
func TestAuditLogbookWeightPlainDecimal(t *testing.T) {
	srv := startApp(t, repoRoot)
	b := newBrowser(t, t.TempDir())
	b.openLogbook(srv.URL("/logbook"))
	b.createVault(testPass)
	b.tap("#lb-nav-start")
	b.waitLB("the start form", `document.querySelector("#lb-start") !== null`, 10*time.Second)
	b.typeInto("#lb-vehicle", "Audit van")
	b.typeInto("#lb-origin", "Ridge post")
	b.typeInto("#lb-dest", "Harbour ward")
	for _, typed := range []string{"7e1", "0x1p6"} {
		b.typeInto("#lb-weight", typed)
		b.tap("#lb-start-go")
		b.waitFor("the weight message", `(document.querySelector("#lb-weight-msg")?.textContent ?? "") !== ""`, 10*time.Second)
		if msg := b.text("#lb-weight-msg"); !strings.Contains(msg, "Weight") || !strings.Contains(msg, typed) || !strings.Contains(msg, "Allowed: 0.2 to 400 kg.") {
			t.Errorf("weight %q: message %q", typed, msg)
		}
		if b.exists("#lb-timeline li[data-seq]") {
			t.Fatalf("weight %q: the transport was saved", typed)
		}
		for sel, want := range map[string]string{"#lb-weight": typed, "#lb-vehicle": "Audit van", "#lb-origin": "Ridge post", "#lb-dest": "Harbour ward"} {
			if got := b.value(sel); got != want {
				t.Errorf("after the refusal of %q, %s shows %q, want %q", typed, sel, got, want)
			}
		}
	}
}
