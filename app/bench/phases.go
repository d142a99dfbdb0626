//go:build !wasm

package main

import (
	"fmt"
	"time"

	"github.com/chromedp/chromedp"
)

// Phases of a warm start, for finding where it goes (make bench
// BENCHFLAGS=-probe=5): a first visit, then five reloads served by the
// service worker, each a few seconds apart, printing on the page's clock
// when app.wasm was asked for and received, when it was instantiated, when
// go-app removed its loader and when Alvea's frame mounted. Printed only,
// not part of the report.

// phaseProbe wraps the compile calls to note when they start and end.
const phaseProbe = `(() => {
	window.__ph = {};
	const is = WebAssembly.instantiateStreaming;
	WebAssembly.instantiateStreaming = function(r, io) {
		window.__ph.instStart = performance.now();
		const p = is.call(WebAssembly, r, io);
		p.then(() => { window.__ph.instEnd = performance.now(); });
		return p;
	};
	const cs = WebAssembly.compileStreaming;
	WebAssembly.compileStreaming = function(r) {
		window.__ph.cs = performance.now();
		const p = cs.call(WebAssembly, r);
		p.then(() => { window.__ph.csEnd = performance.now(); });
		return p;
	};
	const ci = WebAssembly.instantiate;
	WebAssembly.instantiate = function(a, b) {
		window.__ph.instStart2 = performance.now();
		const p = ci.call(WebAssembly, a, b);
		p.then(() => { window.__ph.instEnd2 = performance.now(); });
		return p;
	};
})();`

// phasesJS reads the phases of the page's start.
const phasesJS = `(() => { const w = performance.getEntriesByType("resource").find(e => e.name.endsWith("app.wasm")); const n = performance.getEntriesByType("navigation")[0]; return Object.assign({}, window.__ph, {wasmStart: w ? w.startTime : -1, goMain: (performance.getEntriesByName("alvea:main")[0] || {startTime: -1}).startTime, goMount: (performance.getEntriesByName("alvea:mount")[0] || {startTime: -1}).startTime, wasmFetches: performance.getEntriesByType("resource").filter(e => e.name.endsWith("app.wasm")).length, early: window.alveaWasm === null ? 1 : 0, cs: window.__ph.cs || -1, wasmEnd: w ? w.responseEnd : -1, dcl: n.domContentLoadedEventEnd, loaderGone: window.__benchLoaderGone, mounted: window.__benchMounted || -1, workerStart: n.workerStart, navRespStart: n.responseStart, navRespEnd: n.responseEnd, domInteractive: n.domInteractive}, Object.fromEntries(performance.getEntriesByType("resource").filter(e => !e.name.endsWith("app.wasm")).map(e => [e.name.replace(/^.*\//, "") + "@", Math.round(e.startTime) * 1000 + Math.round(e.responseEnd)]))); })()`

// probePhases prints the phases of p's warm starts at the CPU rate, wait
// apart.
func probePhases(p *program, rate float64, wait time.Duration) error {
	if err := p.start(); err != nil {
		return err
	}
	defer p.stop()
	c, err := newChrome()
	if err != nil {
		return err
	}
	defer c.close()
	alvea := p.Name == "Alvea"
	probe := interactiveProbe
	c.onEveryPage(probe)
	c.onEveryPage(phaseProbe)
	c.throttle(rate)
	if err := c.do(120*time.Second, chromedp.Navigate(p.origin+"/")); err != nil {
		return err
	}
	ms, marked, _ := waitInteractive(c, alvea)
	ph, _ := evalJS[map[string]float64](c, phasesJS)
	fmt.Printf("%s first %.0f (marker %.0f) %v\n", p.Name, ms, marked, ph)
	evalJS[bool](c, `navigator.serviceWorker.ready.then(() => true)`)
	time.Sleep(wait)
	for i := 0; i < 5; i++ {
		c.do(120*time.Second, chromedp.Reload())
		ms, marked, _ := waitInteractive(c, alvea)
		ph, _ := evalJS[map[string]float64](c, phasesJS)
		fmt.Printf("%s warm %.0f (marker %.0f) %v\n", p.Name, ms, marked, ph)
		time.Sleep(wait)
	}
	return nil
}
