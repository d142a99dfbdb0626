package server

import (
	"bytes"
	"fmt"
	"net/http"
	"net/http/httptest"
	"regexp"
	"time"

	"github.com/maxence-charriere/go-app/v10/pkg/app"
)

// Start-up: go-app's loader (its app.js, a deferred script) starts
// fetching and compiling app.wasm only once the whole page is parsed and
// its style sheets loaded, and it hands the compiler a Response rebuilt
// from a stream (to count bytes for its progress label). A rebuilt
// Response has no URL, so Chromium can neither keep the code it compiled
// nor reuse it: every start compiles the whole module again.
//
// Alvea serves app.js with one call replaced. web/boot.js (an async
// script, run as soon as it arrives) starts the compile early and leaves
// its promise in window.alveaWasm; the patched loader instantiates that
// module. When boot.js has not run first, the loader compiles itself:
// served by the service worker, from the fetched Response as it is (so the
// compiled code can be kept); on a first visit, through go-app's counting
// fetch, for its progress label. Whatever fails early falls back to
// loading app.wasm again the go-app way, which reports its own errors.

// loaderCall matches the call in go-app's app.js that the patch replaces;
// its group is the URL of app.wasm.
var loaderCall = regexp.MustCompile(`instantiateStreaming\(\s*fetchWithProgress\("([^"]+)", showProgress\),\s*go\.importObject\s*\)`)

// loaderFunc is the function the patch adds.
const loaderFunc = `
// Alvea: instantiates the module web/boot.js started compiling, or
// compiles now (see app/server/loader.go).
async function alveaInstantiate(instantiateStreaming, url, progress, importObject) {
  const early = window.alveaWasm;
  window.alveaWasm = null; // taken: boot.js, if it runs later, starts nothing
  if (early) {
    try {
      const module = await early;
      return { module: module, instance: await WebAssembly.instantiate(module, importObject) };
    } catch (err) {
      console.warn("Alvea: early compile of app.wasm failed, loading it again:", err);
    }
  }
  const controlled = navigator.serviceWorker && navigator.serviceWorker.controller;
  return instantiateStreaming(controlled ? fetch(url) : fetchWithProgress(url, progress), importObject);
}
`

// PatchLoader returns go-app's app.js with its app.wasm loading replaced as
// described above. It fails if go-app's app.js no longer has the one call
// it replaces (a go-app update must be looked at, not patched blindly).
func PatchLoader(js []byte) ([]byte, error) {
	if n := len(loaderCall.FindAllIndex(js, -1)); n != 1 {
		return nil, fmt.Errorf("server: go-app's app.js has %d calls matching %q where 1 was expected: its loader changed, review PatchLoader", n, loaderCall)
	}
	out := loaderCall.ReplaceAll(js, []byte(`alveaInstantiate(instantiateStreaming, "$1", showProgress, go.importObject)`))
	return append(out, loaderFunc...), nil
}

// WithLoader serves h, with /app.js replaced by its patched copy: the
// handler Serve uses.
func WithLoader(h *app.Handler) (http.Handler, error) {
	rec := httptest.NewRecorder()
	h.ServeHTTP(rec, httptest.NewRequest(http.MethodGet, "/app.js", nil))
	if rec.Code != http.StatusOK {
		return nil, fmt.Errorf("server: go-app's app.js: status %d", rec.Code)
	}
	js, err := PatchLoader(rec.Body.Bytes())
	if err != nil {
		return nil, err
	}
	header := rec.Header()
	return http.HandlerFunc(func(w http.ResponseWriter, r *http.Request) {
		if r.URL.Path != "/app.js" {
			h.ServeHTTP(w, r)
			return
		}
		for _, k := range []string{"Content-Type", "Cache-Control", "ETag"} {
			if v := header.Get(k); v != "" {
				w.Header().Set(k, v)
			}
		}
		http.ServeContent(w, r, "app.js", time.Time{}, bytes.NewReader(js))
	}), nil
}
