package server

import (
	"bytes"
	"fmt"
	"net/http"
	"net/http/httptest"
	"time"

	"github.com/maxence-charriere/go-app/v10/pkg/app"
)

// go-app's loader (its app.js) hands the compiler a Response it rebuilds
// from a stream, to count the bytes for its progress label. A rebuilt
// Response has no URL, so Chromium can neither keep the code it compiled
// for app.wasm nor reuse it: every start compiles the whole module again.
// When a service worker controls the page, app.wasm comes from the
// worker's cache, there is nothing to count, and Alvea hands the compiler
// the fetched Response itself; Chromium then keeps the compiled code beside
// the cached app.wasm and a warm start reuses it. A first visit (no worker
// yet) keeps go-app's progress.

// loaderCall is the call in go-app's app.js that the patch replaces, and
// loaderFunc the function the patch adds.
const (
	loaderCall = `fetchWithProgress("`
	loaderFunc = `
// Alvea: served by the service worker, app.wasm is passed to the compiler
// as fetched, so the browser can keep and reuse the compiled code.
function alveaFetchWasm(url, progress) {
  if (navigator.serviceWorker && navigator.serviceWorker.controller) {
    return fetch(url);
  }
  return fetchWithProgress(url, progress);
}
`
)

// PatchLoader returns go-app's app.js with its app.wasm fetch replaced as
// described above. It fails if go-app's app.js no longer has the one call
// it replaces (a go-app update must be looked at, not patched blindly).
func PatchLoader(js []byte) ([]byte, error) {
	if n := bytes.Count(js, []byte(loaderCall)); n != 1 {
		return nil, fmt.Errorf("server: go-app's app.js has %d calls %q where 1 was expected: its loader changed, review PatchLoader", n, loaderCall)
	}
	out := bytes.Replace(js, []byte(loaderCall), []byte(`alveaFetchWasm("`), 1)
	return append(out, loaderFunc...), nil
}

// withLoader serves h, with /app.js replaced by its patched copy.
func withLoader(h *app.Handler) (http.Handler, error) {
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
