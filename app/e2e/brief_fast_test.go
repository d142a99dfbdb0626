//go:build !wasm

package e2e

import (
	"encoding/json"
	"fmt"
	"strconv"
	"strings"
	"testing"
	"time"

	"github.com/chromedp/cdproto/page"
	"github.com/chromedp/chromedp"

	"alvea/physio"
)

// The Brief's direct path (app/ui/brief_result.go): a keystroke that
// leaves the result panel's shape as it is writes its texts straight into
// the panel; go-app's copy of the panel then holds older texts. These
// checks type a sequence that goes fast, fast, structural, back, and after
// each step compare every figure, warning and option shown with what
// physio.ComputePlan gives for the same plan; at the end the whole panel
// is compared with a fresh rendering of the same Brief (the screen left
// and opened again), so a stale text anywhere fails.

// directWatch runs before any script of the page: it wraps the function
// the page script defines as window.alveaSetTexts, so every write of the
// direct path is recorded (true when the page found every element named).
const directWatch = `(() => {
	window.__direct = [];
	let inner;
	Object.defineProperty(window, "alveaSetTexts", {
		configurable: true,
		get() { return inner; },
		set(f) { inner = (packed) => { const ok = f(packed); window.__direct.push(ok); return ok; }; },
	});
})()`

// panelWatch records every change inside the result panel.
const panelWatch = `(() => {
	window.__panel = {childList: 0, last: performance.now()};
	new MutationObserver((records) => {
		const panel = document.getElementById("b-result");
		if (!panel) return;
		for (const r of records) {
			if (panel.contains(r.target)) {
				window.__panel.last = performance.now();
				if (r.type === "childList") window.__panel.childList++;
			}
		}
	}).observe(document.documentElement, {childList: true, subtree: true, characterData: true, attributes: true});
	return typeof window.alveaSetTexts === "function";
})()`

// panelShown is what the panel shows, read as a person sees it: every
// figure's number, unit and whether it is shown; the warnings shown
// (code and text); the options shown under each leg.
const panelShown = `(() => {
	const shown = (el) => el !== null && el.closest("[hidden]") === null;
	const figs = {};
	for (const v of document.querySelectorAll("#b-result [id$='-v']")) {
		const id = v.id.slice(0, -2);
		const u = document.getElementById(id + "-u");
		figs[id] = {num: v.textContent, unit: u ? u.textContent.trim() : "", shown: shown(v)};
	}
	const warnings = [...document.querySelectorAll("#b-warnings > li")].filter(shown).map(li => li.dataset.code + " " + li.textContent);
	const options = [...document.querySelectorAll("#b-result .b-leg-result")].map(box =>
		[...box.querySelectorAll(".b-options > li")].filter(shown).map(li => li.textContent));
	return JSON.stringify({figs, warnings, options, status: document.querySelector("#b-status")?.dataset.status ?? ""});
})()`

// panelCanon writes the panel as it shows: elements with their attributes
// in name order and their texts, hidden elements left out.
const panelCanon = `(() => {
	const out = [];
	const walk = (n) => {
		if (n.nodeType === Node.TEXT_NODE) { if (n.nodeValue !== "") out.push(JSON.stringify(n.nodeValue)); return; }
		if (n.nodeType !== Node.ELEMENT_NODE || n.hidden) return;
		const tag = n.tagName.toLowerCase();
		const attrs = [...n.attributes].map(a => a.name + "=" + JSON.stringify(a.value)).sort();
		out.push("<" + tag + (attrs.length ? " " + attrs.join(" ") : "") + ">");
		for (const c of n.childNodes) walk(c);
		out.push("</" + tag + ">");
	};
	walk(document.getElementById("b-result"));
	return out.join("\n");
})()`

type shownFig struct {
	Num   string `json:"num"`
	Unit  string `json:"unit"`
	Shown bool   `json:"shown"`
}

type shownPanel struct {
	Figs     map[string]shownFig `json:"figs"`
	Warnings []string            `json:"warnings"`
	Options  [][]string          `json:"options"`
	Status   string              `json:"status"`
}

// expectedFigs maps the id of every figure the panel can show to its
// figure in physio's result (absent: the plan has none, so it is hidden).
func expectedFigs(r *physio.PlanResult) map[string]*physio.Figure {
	out := map[string]*physio.Figure{}
	put := func(id string, explain physio.Explanation, key string) {
		if f, ok := explain.Get(key); ok {
			out[id] = &f
		} else {
			out[id] = nil
		}
	}
	for id, key := range map[string]string{
		"b-r-cabin": "cabin_altitude_ft", "b-r-highest": "highest_altitude_ft", "b-r-fio2": "fio2_needed",
		"b-r-need": "oxygen_needed_l", "b-r-usable": "oxygen_usable_l", "b-r-margin": "oxygen_margin_l",
		"b-r-calc": "oxygen_calculated_l", "b-r-maxcabin": "max_cabin_altitude_ft",
		"b-r-maxcruise": "max_cruise_altitude_ft", "b-r-exhausted": "supply_exhausted_minute",
	} {
		put(id, r.Explain, key)
	}
	if r.CabinAltitudeFt == nil {
		out["b-r-cabin"] = nil
	}
	if r.MaxCruiseAltitudeFt == nil {
		out["b-r-maxcruise"] = nil
	}
	if r.SupplyExhaustedMin == nil {
		out["b-r-exhausted"] = nil
	}
	for i, l := range r.Legs {
		for what, key := range map[string]string{
			"alt": "altitude_ft", "pb": "pressure_mmhg", "fio2": "fio2_needed", "fio2low": "fio2_delivered_low",
			"pao2a": "pao2_mmhg", "pao2": "pao2_expected_mmhg", "spo2": "spo2_expected_percent",
			"lpm": "oxygen_lpm", "litres": "oxygen_l", "cao2": "cao2_expected_ml_dl",
		} {
			put(fmt.Sprintf("b-r-leg%d-%s", i, what), l.Explain, key)
		}
	}
	for id, key := range map[string]string{
		"b-r-g-pao2a": "pao2_alveolar_mmhg", "b-r-g-pao2": "pao2_arterial_mmhg", "b-r-g-spo2": "spo2_percent",
		"b-r-g-aa": "aa_ratio", "b-r-g-grad": "aa_gradient_mmhg", "b-r-g-gradexp": "expected_aa_gradient_mmhg",
		"b-r-g-cao2": "cao2_ml_dl",
	} {
		put(id, r.Ground.Explain, key)
	}
	for id, key := range map[string]string{
		"b-r-tg-ratio": "ratio", "b-r-tg-cuff": "cuff_at_altitude_ml", "b-r-tg-ptx": "pneumothorax_at_altitude_ml",
		"b-r-tg-rigid": "rigid_overpressure_cmh2o",
	} {
		put(id, r.TrappedGas.Explain, key)
	}
	for k, cy := range r.Cylinders {
		put("b-r-cyl"+strconv.Itoa(k+1)+"-usable", cy.Explain, "usable_l")
	}
	return out
}

// checkPanel compares what the panel shows with physio.ComputePlan for
// doc (display units ft and mmHg, the Settings defaults, so each number is
// the figure's own value).
func checkPanel(t *testing.T, b *browser, step string, doc *physio.PlanDocument) {
	t.Helper()
	want, err := physio.ComputePlan(doc)
	if err != nil {
		t.Fatalf("%s: physio on the plan: %v", step, err)
	}
	var got shownPanel
	if err := json.Unmarshal([]byte(eval[string](b, panelShown)), &got); err != nil {
		t.Fatalf("%s: reading the panel: %v", step, err)
	}
	if got.Status != want.Status {
		t.Errorf("%s: status %q shown, physio gives %q", step, got.Status, want.Status)
	}
	wantFigs := expectedFigs(want)
	for id, f := range wantFigs {
		g, ok := got.Figs[id]
		switch {
		case f == nil && ok && g.Shown:
			t.Errorf("%s: %s shows %q %q; physio gives no such figure", step, id, g.Num, g.Unit)
		case f == nil:
		case !ok || !g.Shown:
			t.Errorf("%s: %s not shown; physio gives %s %s", step, id, f.Value, f.Unit)
		case g.Num != f.Value.String() || g.Unit != f.Unit:
			t.Errorf("%s: %s shows %q %q; physio gives %s %s", step, id, g.Num, g.Unit, f.Value, f.Unit)
		}
	}
	for id, g := range got.Figs {
		if _, known := wantFigs[id]; !known && g.Shown {
			t.Errorf("%s: %s shows %q, not a figure of physio's plan", step, id, g.Num)
		}
	}
	var warnings []string
	for _, w := range want.Warnings {
		sev := map[string]string{physio.SeverityNoGo: "NO-GO", physio.SeverityCaution: "CAUTION"}[w.Severity]
		if sev == "" {
			sev = "NOTE"
		}
		warnings = append(warnings, w.Code+" "+sev+" "+w.Message)
	}
	if strings.Join(got.Warnings, "\n") != strings.Join(warnings, "\n") {
		t.Errorf("%s: warnings shown:\n%s\nphysio gives:\n%s", step, strings.Join(got.Warnings, "\n"), strings.Join(warnings, "\n"))
	}
	if len(got.Options) != len(want.Legs) {
		t.Errorf("%s: %d legs shown, physio gives %d", step, len(got.Options), len(want.Legs))
	}
	for i := 0; i < len(got.Options) && i < len(want.Legs); i++ {
		if len(got.Options[i]) != len(want.Legs[i].Options) {
			t.Errorf("%s: leg %d shows %d options, physio gives %d", step, i+1, len(got.Options[i]), len(want.Legs[i].Options))
		}
	}
}

// press sends one key to the input with the CSS selector, the caret at the
// end of its text, and waits until the field holds want and the panel has
// been quiet for 300 ms.
func press(b *browser, sel, key, want string) {
	b.t.Helper()
	eval[bool](b, fmt.Sprintf(`(() => { const e = document.querySelector(%q); e.focus(); e.setSelectionRange(e.value.length, e.value.length); return true })()`, sel))
	b.must("key into "+sel, chromedp.KeyEvent(key))
	b.waitFor(sel+" = "+want, fmt.Sprintf(`document.querySelector(%q).value === %q`, sel, want), 10*time.Second)
	settle(b)
}

// settle waits until the panel has been quiet for 300 ms.
func settle(b *browser) {
	b.t.Helper()
	b.waitFor("the panel to settle", `performance.now() - window.__panel.last > 300`, 10*time.Second)
}

// step is a keystroke's record: the direct writes it made (each true when
// the page found every element named) and the elements go-app added or
// removed in the panel.
type step struct {
	writes    []bool
	childList int
}

func (b *browser) stepSince(before step) step {
	b.t.Helper()
	writes := eval[[]bool](b, `window.__direct`)
	return step{writes: writes[len(before.writes):], childList: eval[int](b, `window.__panel.childList`) - before.childList}
}

func (b *browser) mark() step {
	b.t.Helper()
	return step{writes: eval[[]bool](b, `window.__direct`), childList: eval[int](b, `window.__panel.childList`)}
}

// direct reports a keystroke served by the direct path alone: one write,
// every element found, and no element added or removed in the panel.
func (s step) direct() bool { return len(s.writes) == 1 && s.writes[0] && s.childList == 0 }

// A crew types into the Brief: two keystrokes of the same shape (a
// warning goes, the minutes change), one that needs new elements (options
// appear under the flight leg), one back (the options go). Each step is
// checked against physio, the kind of update each took is checked, and
// the panel at the end against a fresh rendering of the same Brief.
func TestBriefDirectPathStaysTrue(t *testing.T) {
	srv := startApp(t, repoRoot)
	b := newBrowser(t, t.TempDir())
	if _, err := chromedp.Call(b.ctx, page.AddScriptToEvaluateOnNewDocument, page.AddScriptToEvaluateOnNewDocumentParams{Source: directWatch}); err != nil {
		t.Fatalf("adding the watch script: %v", err)
	}
	b.open(srv.URL("/"))
	if !eval[bool](b, panelWatch) {
		t.Fatal("window.alveaSetTexts is not defined by the page script")
	}
	fillBrief(b)
	b.waitFor("the plan", `document.querySelector("#b-r-need-v") !== null`, 15*time.Second)
	settle(b)
	doc := briefScenario()
	checkPanel(t, b, "filled", doc)

	// Fast: 90 → 9 minutes (two warnings go: their places stay, hidden).
	m := b.mark()
	press(b, "#b-leg1-min", "\b", "9")
	doc.Legs[1].Minutes = physio.PlanValue(9)
	checkPanel(t, b, "9 min", doc)
	if s := b.stepSince(m); !s.direct() {
		t.Errorf("9 min: not served by the direct path alone: %+v", s)
	}
	// Fast again: 9 → 91 minutes (the warnings come back into their places).
	m = b.mark()
	press(b, "#b-leg1-min", "1", "91")
	doc.Legs[1].Minutes = physio.PlanValue(91)
	checkPanel(t, b, "91 min", doc)
	if s := b.stepSince(m); !s.direct() {
		t.Errorf("91 min: not served by the direct path alone: %+v", s)
	}

	// "How" open while typing: its inputs follow the keystroke.
	b.tap("#b-r-leg1-litres-how > summary")
	b.waitExists("#b-r-leg1-litres-how .b-how")
	settle(b)
	m = b.mark()
	press(b, "#b-leg1-min", "\b", "9")
	doc.Legs[1].Minutes = physio.PlanValue(9)
	checkPanel(t, b, "9 min, How open", doc)
	if s := b.stepSince(m); !s.direct() {
		t.Errorf("9 min with a How open: not served by the direct path alone: %+v", s)
	}
	want, _ := physio.ComputePlan(doc)
	how := b.text("#b-r-leg1-litres-how .b-how")
	oxygenL, _ := want.Legs[1].Explain.Get("oxygen_l")
	for _, in := range oxygenL.Inputs {
		if v := strconv.FormatFloat(in.Value, 'f', -1, 64); !strings.Contains(how, in.Name+" = "+v) {
			t.Errorf("How of leg 2's oxygen %q lacks %s = %s (physio's input)", how, in.Name, v)
		}
	}
	b.tap("#b-r-leg1-litres-how > summary")
	b.waitFor("the How closed", `document.querySelector("#b-r-leg1-litres-how .b-how") === null`, 10*time.Second)
	press(b, "#b-leg1-min", "0", "90")
	doc.Legs[1].Minutes = physio.PlanValue(90)
	checkPanel(t, b, "90 min", doc)

	// Structural: cruise 4100 → 41000 ft puts the cabin above 8000 ft;
	// options appear under the flight leg, which had no place for them.
	b.typeInto("#b-rt-cruise", "4100")
	b.waitFor("cruise 4100", `document.querySelector("#b-rt-cruise").value === "4100"`, 10*time.Second)
	settle(b)
	doc.Route.CruiseAltitudeFt = physio.PlanValue(4100)
	checkPanel(t, b, "cruise 4100 ft", doc)
	m = b.mark()
	press(b, "#b-rt-cruise", "0", "41000")
	doc.Route.CruiseAltitudeFt = physio.PlanValue(41000)
	checkPanel(t, b, "cruise 41000 ft", doc)
	if s := b.stepSince(m); s.childList == 0 {
		t.Errorf("cruise 41000 ft: options appeared with no element added: %+v", s)
	}
	if want, _ := physio.ComputePlan(doc); len(want.Legs[1].Options) == 0 {
		t.Fatal("the structural step does not bring options under the flight leg (scenario changed?)")
	}

	// Back: 41000 → 4100 ft; the options go, their places stay.
	m = b.mark()
	press(b, "#b-rt-cruise", "\b", "4100")
	doc.Route.CruiseAltitudeFt = physio.PlanValue(4100)
	checkPanel(t, b, "cruise 4100 ft again", doc)
	if s := b.stepSince(m); !s.direct() {
		t.Errorf("cruise back to 4100 ft: not served by the direct path alone: %+v", s)
	}

	// The panel as typed against a fresh rendering of the same Brief.
	typed := eval[string](b, panelCanon)
	b.tap("#tab-settings")
	b.waitExists("#set-altitude-m")
	b.tap("#tab-brief")
	b.waitFor("the Brief again", `document.querySelector("#b-rt-cruise")?.value === "4100" && document.querySelector("#b-r-need-v") !== null`, 15*time.Second)
	settle(b)
	fresh := eval[string](b, panelCanon)
	if typed != fresh {
		t.Errorf("the panel as typed differs from a fresh rendering:\n%s", lineDiff(typed, fresh))
	}
	checkPanel(t, b, "fresh rendering", doc)
}

// lineDiff shows the first lines where two texts differ.
func lineDiff(a, b string) string {
	x, y := strings.Split(a, "\n"), strings.Split(b, "\n")
	for i := 0; i < len(x) && i < len(y); i++ {
		if x[i] != y[i] {
			end := min(i+3, len(x), len(y))
			return fmt.Sprintf("typed:  %s\nfresh:  %s", strings.Join(x[i:end], " "), strings.Join(y[i:end], " "))
		}
	}
	return fmt.Sprintf("typed has %d lines, fresh %d", len(x), len(y))
}
