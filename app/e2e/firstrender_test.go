//go:build !wasm

package e2e

import (
	"fmt"
	"strings"
	"testing"
	"time"

	"github.com/chromedp/cdproto/page"
	"github.com/chromedp/chromedp"
	"github.com/shopspring/decimal"
)

// firstDrawnProbe records, for each element with one of the ids watched
// that go-app puts in the page (once app.wasm runs: its "alvea:main" mark
// is set; the parser's copy of the server page comes before), what it
// holds (an input's value, any other element's text) twice:
//   - "rendered": at the moment go-app attaches it to the page (its
//     appendChild or replaceChild, go-app's only ways in), which is what
//     the render that made it gave it;
//   - "drawn": when the change that added it is reported (after that
//     render's task, before any later one), as firstRenderProbe does for
//     the Brief.
//
// The first is the stricter: a screen that renders its defaults and then,
// in the same task, what it loaded, shows only the second on screen, but
// did render the defaults first.
const firstDrawnProbe = `(() => {
	const ids = %s;
	window.__firstDrawn = {rendered: {}, drawn: {}};
	const running = () => performance.getEntriesByName("alvea:main").length > 0;
	const note = (kind, n) => {
		if (n.nodeType !== 1) return;
		for (const id of ids) {
			const e = n.id === id ? n : n.querySelector("#" + id);
			if (e) (window.__firstDrawn[kind][id] ??= []).push(e.tagName === "INPUT" ? e.value : e.textContent);
		}
	};
	for (const name of ["appendChild", "replaceChild"]) {
		const inner = Node.prototype[name];
		Node.prototype[name] = function (n, ...rest) {
			const out = inner.call(this, n, ...rest);
			if (running() && n.isConnected) note("rendered", n);
			return out;
		};
	}
	new MutationObserver((records) => {
		if (!running()) return;
		for (const r of records) for (const n of r.addedNodes) note("drawn", n);
	}).observe(document, {childList: true, subtree: true});
})();`

// firstDrawnIDs are the fields and unit labels the test watches.
var firstDrawnIDs = []string{"supply-gauge", "supply-gauge-unit", "alt-cruise", "alt-cruise-unit", "alt-paco2", "alt-paco2-unit"}

// drawnCounts is how many elements of each id were seen so far, by kind.
type drawnCounts map[string]map[string]int

// checkFirstDrawn fails the test unless every element with one of the ids
// in want that the app added since the counts in before (nil: since the
// page loaded) was first rendered and first drawn holding the wanted
// value; it returns the counts now.
func checkFirstDrawn(t *testing.T, b *browser, when string, before drawnCounts, want map[string]string) drawnCounts {
	t.Helper()
	seen := eval[map[string]map[string][]string](b, `window.__firstDrawn`)
	counts := drawnCounts{}
	for _, kind := range []string{"rendered", "drawn"} {
		for id, w := range want {
			all := seen[kind][id]
			added := all[min(before[kind][id], len(all)):]
			if len(added) == 0 {
				t.Errorf("%s: no #%s %s by the app (all seen: %q)", when, id, kind, all)
			}
			for i, v := range added {
				if v != w {
					t.Errorf("%s: #%s (%d) was first %s with %q, want the saved %q (all seen: %q)", when, id, i, kind, v, w, added)
				}
			}
		}
		counts[kind] = map[string]int{}
		for id, vs := range seen[kind] {
			counts[kind][id] = len(vs)
		}
	}
	return counts
}

// Supply and Altitude never put the default display units (or an empty
// reading) on screen before what is saved: with bar, metres and kPa chosen
// in Settings and a reading typed on Supply, the gauge field and its unit,
// the cruise altitude and PaCO2 fields and their units are first drawn
// with them, after a reload on each screen and on a switch from one to the
// other. (Both screens used to render with the defaults and again once
// OnMount had loaded the settings: app/ui/preload.go.)
func TestSupplyAltitudeFirstRenderShowSaved(t *testing.T) {
	srv := startApp(t, repoRoot)
	b := newBrowser(t, t.TempDir())
	b.open(srv.URL("/settings"))
	b.tap("#set-pressure-bar")
	b.tap("#set-altitude-m")
	b.tap("#set-gas-kPa")
	b.waitFor("the settings saved", `(() => { const s = localStorage.getItem("alvea.settings") ?? "";
		return s.includes('"pressureUnit":"bar"') && s.includes('"altitudeUnit":"m"') && s.includes('"gasUnit":"kPa"') })()`, 10*time.Second)

	b.tap("#tab-supply")
	b.waitFor("the gauge in bar", `document.querySelector("#supply-gauge-unit")?.textContent === "bar"`, 10*time.Second)
	b.typeInto("#supply-gauge", "100")
	b.typeInto("#supply-flow", "4")
	b.waitFor("the reading saved", `(() => { const s = localStorage.getItem("alvea.supply") ?? "";
		return s.includes('"gauge":"100"') && s.includes('"gaugeUnit":"bar"') && s.includes('"flow":"4"') })()`, 10*time.Second)

	ids := `["` + strings.Join(firstDrawnIDs, `","`) + `"]`
	if _, err := chromedp.Call(b.ctx, page.AddScriptToEvaluateOnNewDocument, page.AddScriptToEvaluateOnNewDocumentParams{Source: fmt.Sprintf(firstDrawnProbe, ids)}); err != nil {
		t.Fatal(err)
	}
	supply := map[string]string{"supply-gauge": "100", "supply-gauge-unit": "bar"}
	// The Altitude screen's start values (25 000 ft cruise, PaCO2 40 mmHg)
	// in the saved units, converted by GNU units (an external oracle) and
	// rounded to the screen's steps (1 m; 0.1 kPa).
	altitude := map[string]string{
		"alt-cruise":      decimal.RequireFromString(unitsConvert(t, "25000 ft", "m")).Round(0).String(),
		"alt-cruise-unit": "m",
		"alt-paco2":       decimal.RequireFromString(unitsConvert(t, "40 mmHg", "kPa")).Round(1).String(),
		"alt-paco2-unit":  "kPa",
	}

	b.reload()
	b.waitFor("the gauge field", `document.querySelector("#supply-gauge")?.value === "100"`, 10*time.Second)
	counts := checkFirstDrawn(t, b, "after a reload on Supply", nil, supply)

	b.tap("#tab-altitude")
	b.waitFor("Altitude", `document.querySelector("#alt-cruise-unit")?.textContent === "m"`, 10*time.Second)
	counts = checkFirstDrawn(t, b, "on the switch to Altitude", counts, altitude)

	b.reload()
	b.waitFor("the cruise field", `document.querySelector("#alt-cruise")?.value === "`+altitude["alt-cruise"]+`"`, 10*time.Second)
	counts = checkFirstDrawn(t, b, "after a reload on Altitude", nil, altitude)

	b.tap("#tab-supply")
	b.waitFor("Supply", `document.querySelector("#supply-gauge")?.value === "100"`, 10*time.Second)
	checkFirstDrawn(t, b, "on the switch back to Supply", counts, supply)
}
