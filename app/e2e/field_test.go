//go:build !wasm

package e2e

import (
	"fmt"
	"testing"
	"time"
)

// buttonSize returns the rendered width and height of the element, in CSS
// pixels.
func (b *browser) buttonSize(sel string) (float64, float64) {
	b.t.Helper()
	r := eval[[]float64](b, fmt.Sprintf(`(() => { const r = document.querySelector(%q)?.getBoundingClientRect(); return r ? [r.width, r.height] : [0, 0] })()`, sel))
	return r[0], r[1]
}

// A field a person typed in is emptied on screen when the screen sets its
// value back to "" (go-app drops an empty value instead of setting it: the
// typed text stayed). "New transport" on Supply asks in the page first,
// with two answers at least 44 px (WCAG 2.5.5 target size), and never with
// the browser's own confirm box.
func TestFieldClearedAfterTyping(t *testing.T) {
	srv := startApp(t, repoRoot)
	b := newBrowser(t, t.TempDir())
	b.open(srv.URL("/supply"))
	eval[bool](b, `(() => { window.__confirms = 0; window.confirm = () => { window.__confirms++; return true }; return true })()`)

	b.typeInto("#supply-gauge", "1500")
	b.typeInto("#supply-flow", "10")
	b.waitFor("the countdown", `document.querySelector("#supply-minutes") !== null`, 10*time.Second)

	b.tap("#supply-new")
	b.waitFor("the question", `document.querySelector("#supply-new-confirm") !== null`, 10*time.Second)
	for _, sel := range []string{"#supply-new-keep", "#supply-new-clear"} {
		if w, h := b.buttonSize(sel); w < 44 || h < 44 {
			t.Errorf("%s is %.0f×%.0f px, want at least 44×44", sel, w, h)
		}
	}
	if got := eval[string](b, `document.activeElement?.id ?? ""`); got != "supply-new-keep" {
		t.Errorf("focus on %q after the question appears, want the safe answer supply-new-keep", got)
	}
	if v := b.axe(); len(v) > 0 {
		t.Errorf("axe-core serious/critical violations with the question open: %+v", v)
	}

	// Keep: nothing is cleared.
	b.tap("#supply-new-keep")
	b.waitFor("the question gone", `document.querySelector("#supply-new-confirm") === null`, 10*time.Second)
	if got := b.value("#supply-gauge"); got != "1500" {
		t.Errorf("after keep the gauge shows %q, want 1500", got)
	}
	if !b.exists("#supply-minutes") {
		t.Error("after keep the countdown is gone")
	}

	// Clear: the readings go, and the fields typed in are empty on screen.
	b.tap("#supply-new")
	b.waitFor("the question", `document.querySelector("#supply-new-clear") !== null`, 10*time.Second)
	b.tap("#supply-new-clear")
	b.waitFor("the countdown gone", `document.querySelector("#supply-minutes") === null`, 10*time.Second)
	for _, sel := range []string{"#supply-gauge", "#supply-flow"} {
		b.waitFor(sel+" empty", fmt.Sprintf(`document.querySelector(%q).value === ""`, sel), 5*time.Second)
	}
	if n := eval[int](b, `window.__confirms`); n != 0 {
		t.Errorf("the browser's confirm box was used %d time(s)", n)
	}
	// Typing again after the clear works as before (back at the top of
	// the page, where a person would scroll to reach the fields).
	b.toTop()
	b.typeInto("#supply-gauge", "1800")
	b.typeInto("#supply-flow", "4")
	b.waitFor("a new countdown", `document.querySelector("#supply-minutes") !== null`, 10*time.Second)
	b.reload()
	if got := b.value("#supply-gauge"); got != "1800" {
		t.Errorf("after reload the gauge shows %q, want the reading typed after the clear", got)
	}
}
