//go:build !wasm

package e2e

import (
	"strings"
	"testing"

	"github.com/chromedp/cdproto/page"
	"github.com/chromedp/chromedp"
)

// startProbe runs before every page's own scripts and counts how app.wasm
// is compiled: by web/boot.js (compileStreaming, early) or by go-app's own
// loading (instantiateStreaming), and keeps every text go-app's loading
// label showed.
const startProbe = `(() => {
	window.__start = {compiles: 0, streams: 0, labels: []};
	const cs = WebAssembly.compileStreaming;
	WebAssembly.compileStreaming = function (r) { window.__start.compiles++; return cs.call(WebAssembly, r); };
	const is = WebAssembly.instantiateStreaming;
	WebAssembly.instantiateStreaming = function (r, i) { window.__start.streams++; return is.call(WebAssembly, r, i); };
	new MutationObserver(() => {
		const l = document.getElementById("app-wasm-loader-label");
		if (l && window.__start.labels[window.__start.labels.length - 1] !== l.textContent) window.__start.labels.push(l.textContent);
	}).observe(document, {childList: true, subtree: true, characterData: true});
})();`

type startSeen struct {
	Compiles, Streams, Fetches int
	Taken                      bool
	Labels                     []string
}

const startSeenJS = `({compiles: window.__start.compiles, streams: window.__start.streams,
	fetches: performance.getEntriesByType("resource").filter(e => new URL(e.name).pathname === "/web/app.wasm").length,
	taken: window.alveaWasm === null, labels: window.__start.labels})`

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
	b.waitControlled()
	b.reload()
	if !eval[bool](b, `navigator.serviceWorker.controller !== null`) {
		t.Fatal("the reload is not served by the service worker")
	}
	check("warm start")
	if got := b.text("main h1"); got != "Brief" {
		t.Errorf("warm start: heading %q, want Brief", got)
	}
}
