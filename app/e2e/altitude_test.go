//go:build !wasm

package e2e

import (
	"context"
	"fmt"
	"os"
	"path/filepath"
	"strings"
	"testing"
	"time"

	"github.com/chromedp/chromedp"

	"alvea/physio"
)

// Cabin altitude both ways, checked against physio for the same inputs
// (REFERENCES §2: about 9.25 psi holds an 8 000 ft cabin at 50 000 ft,
// [calc] 9.234 psi); a bad value shows its message and no figure; axe-core
// and screenshots.
func TestAltitudeCabinBothWaysAndBadValue(t *testing.T) {
	srv := startApp(t, repoRoot)
	b := newBrowser(t, t.TempDir())
	b.open(srv.URL("/altitude"))

	b.typeInto("#alt-cruise", "50000")
	b.typeInto("#alt-diff", "9.234")
	cabin, err := physio.CabinAltitude(physio.Feet(50000), physio.Psi(9.234), physio.Feet(0))
	if err != nil {
		t.Fatal(err)
	}
	wantCabin, _ := physio.Round(cabin.Feet(), 0, physio.RoundUp)
	if d := cabin.Feet() - 8000; d < -10 || d > 10 {
		t.Fatalf("physio cabin %v ft, REFERENCES §2 says about 8000", cabin.Feet())
	}
	b.waitFor("the cabin altitude", fmt.Sprintf(`document.querySelector("#alt-cabin")?.textContent === %q`, wantCabin.String()), 10*time.Second)

	cruise, err := physio.MaxCruiseAltitude(physio.Feet(8000), physio.Psi(9.234))
	if err != nil {
		t.Fatal(err)
	}
	wantCruise, _ := physio.Round(cruise.Feet(), 0, physio.RoundDown)
	if got := b.text("#alt-max-cruise"); got != wantCruise.String() {
		t.Errorf("highest cruise = %q ft, want %s", got, wantCruise)
	}
	b.typeInto("#alt-cabin-limit", "6000")
	cruise, _ = physio.MaxCruiseAltitude(physio.Feet(6000), physio.Psi(9.234))
	wantCruise, _ = physio.Round(cruise.Feet(), 0, physio.RoundDown)
	b.waitFor("the highest cruise for 6000 ft", fmt.Sprintf(`document.querySelector("#alt-max-cruise")?.textContent === %q`, wantCruise.String()), 10*time.Second)
	for _, id := range []string{"#alt-gas-plot", "#alt-spo2-plot"} {
		if !b.exists(id) {
			t.Errorf("plot %s missing", id)
		}
	}

	b.typeInto("#alt-cruise", "70000")
	b.waitFor("the cruise message", `document.querySelector("#alt-cruise-msg") !== null`, 10*time.Second)
	if msg := b.text("#alt-cruise-msg"); !strings.Contains(msg, "Cruise altitude") || !strings.Contains(msg, "between -2000 and 65000 ft") {
		t.Errorf("message = %q", msg)
	}
	if b.exists("#alt-cabin") || b.exists("#alt-gas-plot") {
		t.Error("figures shown while the cruise altitude is invalid")
	}
	if txt := b.text("main"); strings.Contains(txt, "NaN") || strings.Contains(txt, "Inf") {
		t.Error("the screen shows NaN or Inf")
	}
	b.typeInto("#alt-cruise", "25000")
	b.typeInto("#alt-diff", "6")
	b.waitFor("the figures back", `document.querySelector("#alt-cabin") !== null`, 10*time.Second)

	if v := b.axe(); len(v) > 0 {
		t.Errorf("axe-core serious/critical violations on Altitude: %+v", v)
	}
	b.screenshot("altitude", 1024, 768)
	b.screenshot("altitude", 768, 1024)
}

// plotTextSizes returns, for the SVG plot with the CSS selector, the
// smallest rendered size of its text (the font size in the drawing's units
// times the drawing's scale on screen), in CSS pixels.
func (b *browser) plotTextSize(sel string) float64 {
	b.t.Helper()
	return eval[float64](b, fmt.Sprintf(`(() => {
		const svg = document.querySelector(%q);
		if (!svg) return 0;
		const scale = svg.getScreenCTM().a;
		let min = Infinity;
		for (const t of svg.querySelectorAll("text")) min = Math.min(min, parseFloat(getComputedStyle(t).fontSize) * scale);
		return min; })()`, sel))
}

// The two Altitude plots sit side by side on a 1024×768 landscape tablet
// and one above the other on a 768×1024 portrait one; in both, every text
// of the plots is drawn at 12 px or more, and the page does not scroll
// sideways. Element screenshots of the plots go to the test output.
func TestAltitudePlotTextLegible(t *testing.T) {
	srv := startApp(t, repoRoot)
	b := newBrowser(t, t.TempDir())
	b.open(srv.URL("/altitude"))
	b.waitFor("the plots", `document.querySelector("#alt-spo2-plot") !== null`, 10*time.Second)
	for _, vp := range []struct {
		w, h       int64
		sideBySide bool
	}{{1024, 768, true}, {768, 1024, false}} {
		b.viewport(vp.w, vp.h)
		eval[chromedp.Void](b, `new Promise(r => requestAnimationFrame(() => requestAnimationFrame(() => r())))`)
		for _, id := range []string{"#alt-gas-plot", "#alt-spo2-plot"} {
			if px := b.plotTextSize(id); px < 12 {
				t.Errorf("%d×%d: the smallest text of %s is %.1f px, want at least 12", vp.w, vp.h, id, px)
			}
		}
		clipped := eval[[]string](b, `[...document.querySelectorAll("#alt-gas-plot, #alt-spo2-plot")].flatMap(svg => {
			const box = svg.getBoundingClientRect();
			return [...svg.querySelectorAll("text")].filter(t => { const r = t.getBoundingClientRect();
				return r.left < box.left - 0.5 || r.right > box.right + 0.5 || r.top < box.top - 0.5 || r.bottom > box.bottom + 0.5 }).map(t => svg.id + ": " + t.textContent) })`)
		if len(clipped) > 0 {
			t.Errorf("%d×%d: text cut by the plot's edge: %q", vp.w, vp.h, clipped)
		}
		same := eval[bool](b, `Math.abs(document.querySelector("#alt-gas-plot").getBoundingClientRect().top - document.querySelector("#alt-spo2-plot").getBoundingClientRect().top) < 2`)
		if same != vp.sideBySide {
			t.Errorf("%d×%d: plots side by side = %v, want %v", vp.w, vp.h, same, vp.sideBySide)
		}
		if over := eval[bool](b, `document.documentElement.scrollWidth > window.innerWidth + 1`); over {
			t.Errorf("%d×%d: the page scrolls sideways", vp.w, vp.h)
		}
		b.elementShot(".alv-plots-pair", fmt.Sprintf("altitude-plots-detail-%dx%d", vp.w, vp.h))
	}
	b.viewport(1024, 768)
	b.screenshot("altitude-plots", 1024, 768)
	b.screenshot("altitude-plots", 768, 1024)
}

// elementShot writes a PNG of the viewport with the element with the CSS
// selector in its middle, at the size on screen, to
// testoutput/screenshots/NAME.png (for a reviewer to read the text as
// drawn).
func (b *browser) elementShot(sel, name string) {
	b.t.Helper()
	eval[bool](b, fmt.Sprintf(`(() => { document.querySelector(%q).scrollIntoView({block: "center"}); return true })()`, sel))
	ctx, cancel := context.WithTimeout(b.ctx, 60*time.Second)
	defer cancel()
	png, err := chromedp.Run(ctx, chromedp.CaptureScreenshot())
	if err != nil {
		b.t.Fatalf("screenshot of %s: %v", sel, err)
	}
	dir := filepath.Join(repoRoot, "testoutput", "screenshots")
	if err := os.MkdirAll(dir, 0o755); err != nil {
		b.t.Fatal(err)
	}
	if err := os.WriteFile(filepath.Join(dir, name+".png"), png, 0o644); err != nil {
		b.t.Fatal(err)
	}
}
