//go:build !wasm

package main

import (
	"errors"
	"fmt"
	"os"
	"time"

	"github.com/chromedp/chromedp"

	"alvea/app/ui"
)

// interactiveProbe runs in every page before its scripts. It records, on
// the page's own clock (milliseconds since the navigation started), when
// go-app removes its loader — go-app's app.js calls remove() on it once
// app.wasm has run its first render, for Alvea and the floor alike — and
// when Alvea's frame marks <html> as mounted. Nothing in either app is
// changed for it, and it adds no work per DOM change: an observer of every
// node added (as an earlier version had) costs a page with a large DOM
// more than a small one (a CPU profile of one warm start put 20 ms in its
// callback for Alvea, 0.2 ms for the floor, though the medians did not
// move beyond the run-to-run spread when it was replaced).
var interactiveProbe = fmt.Sprintf(`(() => {
	const remove = Element.prototype.remove;
	Element.prototype.remove = function () {
		const loader = this.id === "app-wasm-loader";
		const out = remove.call(this);
		if (loader && window.__benchLoaderGone === undefined) window.__benchLoaderGone = performance.now();
		return out;
	};
	const obs = new MutationObserver(() => {
		if (window.__benchMounted === undefined && document.documentElement.getAttribute(%[1]q) === "wasm") {
			window.__benchMounted = performance.now();
			obs.disconnect();
		}
	});
	obs.observe(document, {subtree: true, attributes: true, attributeFilter: [%[1]q]});
})();`, ui.ReadyAttr)

// interactiveExpr is [loader gone, marker set] once both are known
// (the floor sets no marker: its second is its first).
//
// Interactive, for both programs alike, is the loader gone: go-app removes
// it once app.wasm's main has run its first render, mounted the page with
// its event handlers and run the OnMount handlers. Alvea's marker comes
// later: the frame sets it in a deferred call, after go-app's next frame
// (its own update cycle, 1/120 s apart at the soonest), so that the
// browser tests see what OnMount loaded drawn. The screens read their
// saved data before the first render (app/ui/preload.go), so that frame
// draws nothing new; the marker is reported beside the budgeted figure.
func interactiveExpr(alvea bool) string {
	if alvea {
		return `(window.__benchLoaderGone !== undefined && window.__benchMounted !== undefined) ? [window.__benchLoaderGone, window.__benchMounted] : []`
	}
	return `window.__benchLoaderGone !== undefined ? [window.__benchLoaderGone, window.__benchLoaderGone] : []`
}

// waitInteractive waits for the loader gone and, for Alvea, the marker,
// and returns both (ms from the navigation).
func waitInteractive(c *chrome, alvea bool) (interactive, marked float64, err error) {
	deadline := time.Now().Add(120 * time.Second)
	for {
		v, err := evalJS[[]float64](c, interactiveExpr(alvea))
		if err == nil && len(v) == 2 {
			return v[0], v[1], nil
		}
		if time.Now().After(deadline) {
			if err == nil {
				err = errors.New("timed out")
			}
			return 0, 0, fmt.Errorf("waiting for the app to be interactive: %w", err)
		}
		time.Sleep(20 * time.Millisecond)
	}
}

// quiet waits until p's server has sent nothing for a second (the service
// worker's precache done) and returns the bytes sent since from.
func (p *program) quiet(from int64) int64 {
	last := p.bytesWritten.Load()
	stable := time.Now()
	for time.Since(stable) < time.Second {
		time.Sleep(100 * time.Millisecond)
		if n := p.bytesWritten.Load(); n != last {
			last, stable = n, time.Now()
		}
	}
	return last - from
}

type startRuns struct {
	first, warm             []float64 // ms, to interactive
	firstMarked, warmMarked []float64 // ms, to Alvea's marker
	firstBytes, warmByte    []float64
	relaunch                []float64 // ms, to interactive, in a browser started anew
}

// firstVisit opens p in a fresh profile (nothing cached, no service
// worker) at the CPU throttle rate and records the time to interactive and
// the bytes sent, once the service worker has precached. It returns the
// browser, left open for the warm starts.
func firstVisit(p *program, rate float64, f *startRuns) (*chrome, error) {
	c, err := newChrome()
	if err != nil {
		return nil, err
	}
	fail := func(err error) (*chrome, error) {
		c.close()
		return nil, fmt.Errorf("%s first visit: %w", p.Name, err)
	}
	if err := c.onEveryPage(interactiveProbe); err != nil {
		return fail(err)
	}
	if err := c.throttle(rate); err != nil {
		return fail(err)
	}
	from := p.bytesWritten.Load()
	if err := c.do(120*time.Second, chromedp.Navigate(p.origin+"/")); err != nil {
		return fail(err)
	}
	ms, marked, err := waitInteractive(c, p.Name == "Alvea")
	if err != nil {
		return fail(err)
	}
	f.first = append(f.first, ms)
	f.firstMarked = append(f.firstMarked, marked)
	// The service worker active means its precache is done.
	if _, err := evalJS[bool](c, `navigator.serviceWorker.ready.then(() => true)`); err != nil {
		return fail(fmt.Errorf("service worker: %w", err))
	}
	f.firstBytes = append(f.firstBytes, float64(p.quiet(from)))
	return c, nil
}

// warmStart reloads p in c (served by the service worker) and records the
// time to interactive and the bytes sent.
func warmStart(p *program, c *chrome, f *startRuns) error {
	from := p.bytesWritten.Load()
	if err := c.do(120*time.Second, chromedp.Reload()); err != nil {
		return fmt.Errorf("%s warm start: %w", p.Name, err)
	}
	ms, marked, err := waitInteractive(c, p.Name == "Alvea")
	if err != nil {
		return fmt.Errorf("%s warm start: %w", p.Name, err)
	}
	controlled, err := evalJS[bool](c, `navigator.serviceWorker.controller !== null`)
	if err != nil || !controlled {
		return fmt.Errorf("%s warm start: the page is not served by the service worker (%v)", p.Name, err)
	}
	f.warm = append(f.warm, ms)
	f.warmMarked = append(f.warmMarked, marked)
	f.warmByte = append(f.warmByte, float64(p.quiet(from)))
	return nil
}

// startTimes measures both programs at the CPU throttle rate, taking turns
// run by run (Alvea then the floor, then the floor then Alvea, …) so that a
// change in the machine's load over the minutes weighs on both alike:
// first, runs first visits each in a fresh profile; then runs warm starts,
// reloads in each program's last profile.
func startTimes(progs [2]*program, rate float64, runs int) ([2]*startRuns, error) {
	figs := [2]*startRuns{{}, {}}
	var last [2]*chrome
	defer func() {
		for _, c := range last {
			if c != nil {
				c.close()
			}
		}
	}()
	order := func(i int) []int {
		if i%2 == 0 {
			return []int{0, 1}
		}
		return []int{1, 0}
	}
	for i := 0; i < runs; i++ {
		for _, k := range order(i) {
			if last[k] != nil {
				last[k].close()
				last[k] = nil
			}
			c, err := firstVisit(progs[k], rate, figs[k])
			if err != nil {
				return figs, err
			}
			last[k] = c
		}
	}
	for i := 0; i < runs; i++ {
		for _, k := range order(i) {
			if err := warmStart(progs[k], last[k], figs[k]); err != nil {
				return figs, err
			}
		}
	}
	return figs, nil
}

// relaunchTimes measures starts in a browser started anew on a profile
// the program was installed in (first visit, service worker ready, browser
// closed): what a crew sees opening the app after the tablet closed the
// browser. A reload (warmStart) keeps the renderer process, and V8 keeps
// the compiled module in it, so a reload compiles nothing; here each start
// decodes and compiles app.wasm again (Chromium keeps no compiled wasm
// across browser starts on this machine, for either program: see
// DEVELOPERS.md). The two programs take turns as in startTimes.
func relaunchTimes(progs [2]*program, rate float64, runs int, figs [2]*startRuns) error {
	var profiles [2]string
	defer func() {
		for _, p := range profiles {
			if p != "" {
				os.RemoveAll(p)
			}
		}
	}()
	for k, p := range progs {
		dir, err := os.MkdirTemp("", "alvea-bench-relaunch-")
		if err != nil {
			return err
		}
		profiles[k] = dir
		if err := install(p, dir); err != nil {
			return err
		}
	}
	for i := 0; i < runs; i++ {
		order := []int{0, 1}
		if i%2 == 1 {
			order = []int{1, 0}
		}
		for _, k := range order {
			ms, err := relaunch(progs[k], profiles[k], rate)
			if err != nil {
				return err
			}
			figs[k].relaunch = append(figs[k].relaunch, ms)
		}
	}
	return nil
}

// install makes a first visit to p on the profile at dir and waits for
// its service worker to be ready and its precache done, then closes the
// browser.
func install(p *program, dir string) error {
	c, err := chromeOn(dir)
	if err != nil {
		return err
	}
	defer c.close()
	if err := c.onEveryPage(interactiveProbe); err != nil {
		return err
	}
	from := p.bytesWritten.Load()
	if err := c.do(120*time.Second, chromedp.Navigate(p.origin+"/")); err != nil {
		return fmt.Errorf("%s install: %w", p.Name, err)
	}
	if _, _, err := waitInteractive(c, p.Name == "Alvea"); err != nil {
		return fmt.Errorf("%s install: %w", p.Name, err)
	}
	if _, err := evalJS[bool](c, `navigator.serviceWorker.ready.then(() => true)`); err != nil {
		return fmt.Errorf("%s install: service worker: %w", p.Name, err)
	}
	p.quiet(from)
	return nil
}

// relaunch starts a browser on the profile at dir, opens p at the CPU
// throttle rate and returns the time to interactive, checking that the
// page was served by the service worker.
func relaunch(p *program, dir string, rate float64) (float64, error) {
	c, err := chromeOn(dir)
	if err != nil {
		return 0, err
	}
	defer c.close()
	if err := c.onEveryPage(interactiveProbe); err != nil {
		return 0, err
	}
	if err := c.throttle(rate); err != nil {
		return 0, err
	}
	if err := c.do(120*time.Second, chromedp.Navigate(p.origin+"/")); err != nil {
		return 0, fmt.Errorf("%s relaunch: %w", p.Name, err)
	}
	ms, _, err := waitInteractive(c, p.Name == "Alvea")
	if err != nil {
		return 0, fmt.Errorf("%s relaunch: %w", p.Name, err)
	}
	controlled, err := evalJS[bool](c, `navigator.serviceWorker.controller !== null`)
	if err != nil || !controlled {
		return 0, fmt.Errorf("%s relaunch: the page is not served by the service worker (%v)", p.Name, err)
	}
	// Let the start's own work (the worker's update check) end before
	// the browser is closed.
	p.quiet(p.bytesWritten.Load())
	return ms, nil
}

// browserFigures runs every Chromium measurement.
func browserFigures(alvea, floor *program, r *report) error {
	for _, p := range []*program{alvea, floor} {
		if err := p.start(); err != nil {
			return err
		}
		defer p.stop()
	}
	if wants("start") {
		if err := startFigures(alvea, floor, r); err != nil {
			return err
		}
	}
	if wants("brief") {
		if err := briefLatency(alvea, r); err != nil {
			return err
		}
	}
	if wants("vault") {
		return vaultInBrowser(alvea, r)
	}
	return nil
}

// startFigures measures first visits and warm starts of both programs.
func startFigures(alvea, floor *program, r *report) error {
	type key struct {
		p    *program
		rate float64
	}
	figs := map[key]*startRuns{}
	for _, rate := range []float64{1, 4} {
		progress("Alvea and the floor, taking turns: %d first visits and %d warm starts each at %gx CPU throttle", *runs, *runs, rate)
		f, err := startTimes([2]*program{alvea, floor}, rate, *runs)
		if err != nil {
			return err
		}
		progress("Alvea and the floor, taking turns: %d starts each in a browser started anew at %gx CPU throttle", *runs, rate)
		if err := relaunchTimes([2]*program{alvea, floor}, rate, *runs, f); err != nil {
			return err
		}
		figs[key{alvea, rate}], figs[key{floor, rate}] = f[0], f[1]
	}

	r.add(section("transfer (bytes on the wire, compressed, page and service worker)"))
	first := row{Name: "first visit", Unit: "B", A: summary(figs[key{alvea, 1}].firstBytes), F: summary(figs[key{floor, 1}].firstBytes)}
	first.Budget = &budget{Text: "≤ 3.0 MB", Met: first.A.Max <= 3.0e6}
	r.add(first)
	r.add(row{Name: "warm start (reload)", Unit: "B", A: summary(figs[key{alvea, 1}].warmByte), F: summary(figs[key{floor, 1}].warmByte)})

	r.add(section("start to interactive (ms from navigation)"))
	for _, rate := range []float64{1, 4} {
		a, f := figs[key{alvea, rate}], figs[key{floor, rate}]
		x := row{Name: fmt.Sprintf("first visit, %gx CPU", rate), Unit: "ms", A: summary(a.first), F: summary(f.first)}
		x.Budget = &budget{Text: "≤ 1.3 × floor", Met: x.A.Median <= 1.3*x.F.Median}
		r.add(x)
		y := row{Name: fmt.Sprintf("warm start (service worker), %gx CPU", rate), Unit: "ms", A: summary(a.warm), F: summary(f.warm)}
		y.Budget = &budget{Text: "≤ 1.2 × floor", Met: y.A.Median <= 1.2*y.F.Median}
		r.add(y)
		z := row{Name: fmt.Sprintf("warm start, browser started anew, %gx CPU", rate), Unit: "ms", A: summary(a.relaunch), F: summary(f.relaunch)}
		z.Budget = &budget{Text: "≤ 1.2 × floor", Met: z.A.Median <= 1.2*z.F.Median}
		r.add(z)
	}
	r.add(section("Alvea's mount marker (ms from navigation; not budgeted, see the note)"))
	for _, rate := range []float64{1, 4} {
		a := figs[key{alvea, rate}]
		r.add(row{Name: fmt.Sprintf("first visit, %gx CPU", rate), Unit: "ms", A: summary(a.firstMarked)})
		r.add(row{Name: fmt.Sprintf("warm start, %gx CPU", rate), Unit: "ms", A: summary(a.warmMarked)})
	}
	r.note("Interactive, for both programs alike: go-app has removed its loader, which it does once app.wasm's main has run its first render, mounted the page with its event handlers and run the OnMount handlers. Alvea's screens read their saved data before that first render. Alvea's frame also sets %s=\"wasm\" on <html> after go-app's next frame (for the browser tests); that time is shown in its own rows. Times are read on the page's clock from the start of the navigation. First visits each use a fresh profile; warm starts are reloads in the last of them, every resource served by the service worker: a reload keeps the renderer process, where V8 keeps the compiled app.wasm, so it compiles nothing and its time goes mostly to streaming app.wasm's bytes from the worker's cache (which grows with the raw size) and to the first render. A warm start in a browser started anew (the program installed on that profile, the browser closed, started again) decodes and compiles app.wasm again: Chromium kept no compiled wasm across browser starts for either program here. The two programs take turns run by run (ABBA…), so a drift in the machine's load weighs on both.", ui.ReadyAttr)
	r.note("Both programs get app.wasm the same way (the server package: a pre-compressed copy negotiated by Accept-Encoding). The floor is go-app as it comes: its own service worker and loader. Alvea's start is its own (app/server/loader.go): web/boot.js first in the head starts the compile, app.js instantiates that module, and a first visit registers the worker only once the app has mounted. Bytes are counted by a proxy in front of each server: headers, the page's requests and the worker's precache.")

	return nil
}
