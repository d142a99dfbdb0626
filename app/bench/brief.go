//go:build !wasm

package main

import (
	"fmt"
	"time"

	"github.com/chromedp/chromedp"
)

// latencyProbe times each keystroke in the Brief: from the input event
// (a capturing listener on window, which runs before the app's own) to the
// first change the app makes inside the result panel (#b-result), seen by
// a MutationObserver. Nothing in the app is changed for it.
const latencyProbe = `(() => {
	window.__lat = [];
	let t0 = null;
	window.addEventListener("input", () => { t0 = performance.now(); }, true);
	new MutationObserver((records) => {
		if (t0 === null) return;
		const panel = document.getElementById("b-result");
		if (!panel) return;
		for (const r of records) {
			if (panel.contains(r.target) || r.target === panel) {
				window.__lat.push(performance.now() - t0);
				t0 = null;
				return;
			}
		}
	}).observe(document.body, {childList: true, subtree: true, characterData: true, attributes: true});
	return true;
})()`

// fillBrief types a whole transport into the Brief, as the Brief's browser
// test does (a scenario of our own: 1000 ft to 5000 ft, pressurised cabin,
// three legs, two E cylinders).
func fillBrief(c *chrome) error {
	steps := []func() error{
		func() error { return c.typeInto("#b-rt-origin", "1000") },
		func() error { return c.typeInto("#b-rt-destination", "5000") },
		func() error { return c.tap("#b-rt-mode-pressurised") },
		func() error { return c.waitJS("#b-rt-diff", `document.querySelector("#b-rt-diff")`, 10*time.Second) },
		func() error { return c.typeInto("#b-rt-cruise", "25000") },
		func() error { return c.typeInto("#b-rt-diff", "6.5") },
	}
	legs := []struct{ min, device, flow string }{{"20", "nasal_cannula", "2"}, {"90", "simple_mask", "6"}, {"15", "nasal_cannula", "2"}}
	for i, l := range legs {
		p := fmt.Sprintf("#b-leg%d-", i)
		steps = append(steps,
			func() error { return c.typeInto(p+"min", l.min) },
			func() error { return c.pick(p+"device", l.device) },
			func() error {
				return c.waitJS(p+"flow", fmt.Sprintf(`document.querySelector(%q)`, p+"flow"), 10*time.Second)
			},
			func() error { return c.typeInto(p+"flow", l.flow) },
		)
	}
	for _, f := range [][2]string{{"#b-pt-fio2", "0.28"}, {"#b-pt-pao2", "85"}, {"#b-pt-paco2", "40"}, {"#b-pt-hb", "13"}, {"#b-pt-age", "60"}} {
		steps = append(steps, func() error { return c.typeInto(f[0], f[1]) })
	}
	steps = append(steps,
		func() error { return c.pick("#b-sup0-kind", "E") },
		func() error { return c.typeInto("#b-sup0-pressure", "2000") },
		func() error { return c.typeInto("#b-sup0-count", "2") },
		func() error {
			return c.waitJS("the plan", `document.querySelector("#b-r-need-v")`, 20*time.Second)
		},
	)
	for _, s := range steps {
		if err := s(); err != nil {
			return err
		}
	}
	return nil
}

// briefLatency fills the Brief at 1x, then at 4x CPU throttle types into
// the cabin leg's minutes, one key at a time (a digit, then a backspace:
// 8, 85, 8, 86, 8, …; every value a different plan), timing each.
func briefLatency(alvea *program, r *report) error {
	progress("Brief: %d keystrokes at 4x CPU throttle", *samples)
	c, err := newChrome()
	if err != nil {
		return err
	}
	defer c.close()
	if err := c.do(120*time.Second, chromedp.Navigate(alvea.origin+"/")); err != nil {
		return err
	}
	if err := c.waitJS("the app", `document.documentElement.getAttribute("data-alvea") === "wasm"`, 120*time.Second); err != nil {
		return err
	}
	if err := fillBrief(c); err != nil {
		return fmt.Errorf("filling the Brief: %w", err)
	}
	const field = "#b-leg1-min"
	if _, err := evalJS[bool](c, latencyProbe); err != nil {
		return err
	}
	if _, err := evalJS[bool](c, fmt.Sprintf(`(() => { const e = document.querySelector(%q); e.focus(); e.select(); return true })()`, field)); err != nil {
		return err
	}
	if err := c.throttle(4); err != nil {
		return err
	}
	defer c.throttle(1)
	digits := "5679432"
	missed := 0
	for i := 0; i < *samples; i++ {
		key := "8"
		switch {
		case i == 0:
		case i%2 == 1:
			key = string(digits[(i/2)%len(digits)])
		default:
			key = "\b"
		}
		before, err := evalJS[int](c, `window.__lat.length`)
		if err != nil {
			return err
		}
		if err := c.do(30*time.Second, chromedp.KeyEvent(key)); err != nil {
			return err
		}
		got, err := evalJS[int](c, fmt.Sprintf(`new Promise(res => { const s = performance.now();
			const f = () => (window.__lat.length > %d || performance.now() - s > 2000) ? res(window.__lat.length) : setTimeout(f, 10); f(); })`, before))
		if err != nil {
			return err
		}
		if got == before {
			missed++
		}
	}
	lat, err := evalJS[[]float64](c, `window.__lat`)
	if err != nil {
		return err
	}
	value, _ := evalJS[string](c, fmt.Sprintf(`document.querySelector(%q).value`, field))
	if len(lat) == 0 {
		return fmt.Errorf("no keystroke changed the Brief's result (field now %q)", value)
	}
	r.add(section("Brief recompute, input event to result panel updated, 4x CPU (ms)"))
	p50 := row{Name: "p50", Unit: "ms", A: stat{Median: percentile(lat, 50), N: len(lat), Set: true, Min: percentile(lat, 50), Max: percentile(lat, 50)}}
	p95 := row{Name: "p95", Unit: "ms", A: stat{Median: percentile(lat, 95), N: len(lat), Set: true, Min: percentile(lat, 95), Max: percentile(lat, 95)}}
	p95.Budget = &budget{Text: "≤ 8 ms", Met: p95.A.Median <= 8}
	all := summary(lat)
	r.add(p50)
	r.add(p95)
	r.add(row{Name: "all keystrokes", Unit: "ms", A: all})
	if missed > 0 {
		r.note("Brief: %d of %d keystrokes changed nothing in the result panel within 2 s and are not counted.", missed, *samples)
	}
	return nil
}
