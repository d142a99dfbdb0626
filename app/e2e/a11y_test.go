//go:build !wasm

package e2e

import (
	"fmt"
	"testing"
)

// Every screen, in the day and the night theme, has no serious or critical
// axe-core violation (WCAG 2.1 A and AA rules), and every control is a
// touch target of at least 44×44 CSS px. Screenshots of each screen at
// 1024×768 and 768×1024 go to testoutput/screenshots/ for review.
func TestAccessibilityAndScreenshots(t *testing.T) {
	srv := startApp(t, repoRoot)
	b := newBrowser(t, t.TempDir())
	for _, theme := range []string{"day", "night"} {
		b.open(srv.URL("/settings"))
		b.tap("#set-theme-" + theme)
		b.waitFor("theme "+theme, fmt.Sprintf(`document.documentElement.getAttribute("data-theme") === %q`, theme), 10e9)
		for _, s := range screensUnderTest {
			b.open(srv.URL(s.path))
			for _, v := range b.axe() {
				t.Errorf("%s (%s): axe %s [%s] %s at %v", s.path, theme, v.ID, v.Impact, v.Help, v.Nodes)
			}
			for _, small := range smallTargets(b) {
				t.Errorf("%s (%s): touch target under 44 px: %s", s.path, theme, small)
			}
			b.screenshot(s.tab+"-"+theme, 1024, 768)
			b.screenshot(s.tab+"-"+theme, 768, 1024)
		}
	}
	// The check itself can fail: an unlabelled input added to the page is
	// reported (axe rule "label", critical).
	eval[bool](b, `(() => { const i = document.createElement("input"); i.id = "axe-probe"; document.querySelector("main").append(i); return true })()`)
	found := false
	for _, v := range b.axe() {
		if v.ID == "label" {
			found = true
		}
	}
	if !found {
		t.Error("axe did not report an unlabelled input: the accessibility check is not working")
	}

	// The landmarks a screen reader jumps between.
	b.open(srv.URL("/"))
	for _, sel := range []string{"header", "nav[aria-label]", "main#main", "footer"} {
		if !b.exists(sel) {
			t.Errorf("landmark %s missing", sel)
		}
	}
}

// smallTargets lists the visible buttons, links, inputs and summaries
// smaller than 44×44 CSS px (the skip link is off-screen until focused).
func smallTargets(b *browser) []string {
	return eval[[]string](b, `Array.from(document.querySelectorAll("button, a[href], input, select, summary"))
		.filter(e => !e.classList.contains("alv-skip"))
		.filter(e => { const r = e.getBoundingClientRect(); return r.width > 0 && r.height > 0 && (r.width < 44 || r.height < 44) })
		.map(e => e.outerHTML.slice(0, 80) + " " + Math.round(e.getBoundingClientRect().width) + "x" + Math.round(e.getBoundingClientRect().height))`)
}

// Whatever the page scrolls into view is never left under the sticky
// header (WCAG 2.2, 2.4.11 Focus Not Obscured): the skip link's target
// (a jump to #main) and a field scrolled to, as a link to it or a script
// does (scrollIntoView, block start), stop below the header, not at the
// window's top edge behind it. The Brief is scrolled to its end first.
func TestNothingScrolledUnderStickyHeader(t *testing.T) {
	srv := startApp(t, repoRoot)
	b := newBrowser(t, t.TempDir())
	b.viewport(1024, 768)
	b.open(srv.URL("/"))
	b.waitReady()
	cases := []struct{ what, scroll, shown string }{
		{"the skip link", `document.querySelector(".alv-skip").click()`, `document.querySelector("main h1")`},
		{"the origin field", `document.getElementById("b-rt-origin").scrollIntoView()`, `document.getElementById("b-rt-origin")`},
		{"leg 1's minutes", `document.getElementById("b-leg0-min").scrollIntoView()`, `document.getElementById("b-leg0-min")`},
	}
	// settled waits until the page has not scrolled for five frames: go-app
	// scrolls to a link's target itself, a frame or more after the click.
	const settled = `new Promise(res => {
		let last = -1, still = 0, frames = 0;
		const step = () => {
			still = window.scrollY === last ? still + 1 : 0;
			last = window.scrollY;
			if (still >= 5 || ++frames > 300) { res(true); return; }
			requestAnimationFrame(step);
		};
		requestAnimationFrame(step);
	})`
	for _, c := range cases {
		eval[bool](b, `(async () => { window.scrollTo(0, document.documentElement.scrollHeight); return await `+settled+`; })()`)
		if eval[float64](b, `window.scrollY`) < 200 {
			t.Fatal("the Brief does not scroll: the check would prove nothing")
		}
		gap := eval[float64](b, `(async () => {
			`+c.scroll+`;
			await `+settled+`;
			return `+c.shown+`.getBoundingClientRect().top - document.querySelector(".alv-header").getBoundingClientRect().bottom;
		})()`)
		if gap < 0 {
			t.Errorf("%s: what it shows starts %.0f px under the sticky header", c.what, -gap)
		}
	}
}
