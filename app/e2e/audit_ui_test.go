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
