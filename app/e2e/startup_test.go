//go:build !wasm

package e2e

import (
	"strings"
	"testing"
	"time"

	"github.com/chromedp/cdproto/page"
	"github.com/chromedp/chromedp"
)

// startProbe runs before every page's own scripts and counts how app.wasm
// is compiled: by web/boot.js (compileStreaming, early) or by go-app's own
// loading (instantiateStreaming); it keeps every text go-app's loading
// label showed, and when the service worker was registered and the app
// mounted.
const startProbe = `(() => {
	window.__start = {compiles: 0, streams: 0, labels: [], registered: -1, mounted: -1};
	if (navigator.serviceWorker) {
		const reg = navigator.serviceWorker.register.bind(navigator.serviceWorker);
		navigator.serviceWorker.register = function (...a) { if (window.__start.registered < 0) window.__start.registered = performance.now(); return reg(...a); };
	}
	const cs = WebAssembly.compileStreaming;
	WebAssembly.compileStreaming = function (r) { window.__start.compiles++; return cs.call(WebAssembly, r); };
	const is = WebAssembly.instantiateStreaming;
	WebAssembly.instantiateStreaming = function (r, i) { window.__start.streams++; return is.call(WebAssembly, r, i); };
	new MutationObserver(() => {
		const l = document.getElementById("app-wasm-loader-label");
		if (l && window.__start.labels[window.__start.labels.length - 1] !== l.textContent) window.__start.labels.push(l.textContent);
		if (window.__start.mounted < 0 && document.documentElement.getAttribute("data-alvea") === "wasm") window.__start.mounted = performance.now();
	}).observe(document, {childList: true, subtree: true, characterData: true, attributes: true});
})();`

type startSeen struct {
	Compiles, Streams, Fetches int
	Taken                      bool
	Labels                     []string
	Registered, Mounted        float64
}

const startSeenJS = `({compiles: window.__start.compiles, streams: window.__start.streams,
	fetches: performance.getEntriesByType("resource").filter(e => new URL(e.name).pathname === "/web/app.wasm").length,
	taken: window.alveaWasm === null, labels: window.__start.labels,
	registered: window.__start.registered, mounted: window.__start.mounted})`

// A start compiles app.wasm once, from web/boot.js, before go-app's loader
// runs; the loader takes that module (it compiles nothing itself): on a
// first visit (the download counted in the loading label) and on a warm
// start served by the service worker.
func TestStartCompilesEarlyOnce(t *testing.T) {
	srv := startApp(t, repoRoot)
	b := newBrowser(t, t.TempDir())
	if _, err := chromedp.Call(b.ctx, page.AddScriptToEvaluateOnNewDocument, page.AddScriptToEvaluateOnNewDocumentParams{Source: startProbe}); err != nil {
		t.Fatal(err)
	}
	check := func(when string) startSeen {
		t.Helper()
		s := eval[startSeen](b, startSeenJS)
		if s.Compiles != 1 || s.Streams != 0 || s.Fetches != 1 || !s.Taken {
			t.Errorf("%s: app.wasm fetched %d times, compiled early %d times and by go-app's loader %d times, taken by the loader %v; want 1, 1, 0, true",
				when, s.Fetches, s.Compiles, s.Streams, s.Taken)
		}
		return s
	}
	b.open(srv.URL("/"))
	first := check("first visit")
	counted := false
	for _, l := range first.Labels {
		if strings.HasPrefix(l, "Loading Alvea ") && strings.HasSuffix(l, "%") && l != "Loading Alvea 0%" {
			counted = true
		}
	}
	if !counted {
		t.Errorf("first visit: the loading label never counted the download (labels seen: %q)", first.Labels)
	}
	// The first visit registers the worker only once the app is up, so
	// its precache does not compete with the start.
	b.waitFor("the service worker registered", `window.__start.registered >= 0`, 30*time.Second)
	first = eval[startSeen](b, startSeenJS)
	if first.Mounted < 0 || first.Registered < first.Mounted {
		t.Errorf("first visit: service worker registered at %.0f ms, the app mounted at %.0f ms; want registered after mounted", first.Registered, first.Mounted)
	}
	b.waitControlled()
	b.reload()
	if !eval[bool](b, `navigator.serviceWorker.controller !== null`) {
		t.Fatal("the reload is not served by the service worker")
	}
	warm := check("warm start")
	// A page the worker serves registers at once (the update check at
	// every start), not after the app.
	if warm.Registered < 0 || warm.Mounted < 0 || warm.Registered > warm.Mounted {
		t.Errorf("warm start: service worker registered at %.0f ms, the app mounted at %.0f ms; want registered before mounted", warm.Registered, warm.Mounted)
	}
	if got := b.text("main h1"); got != "Brief" {
		t.Errorf("warm start: heading %q, want Brief", got)
	}
}
