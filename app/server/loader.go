package server

import (
	"bytes"
	"fmt"
	"net/http"
	"net/http/httptest"
	"path"
	"regexp"
	"strconv"
	"strings"
	"time"

	"github.com/maxence-charriere/go-app/v10/pkg/app"
)

// Start-up: go-app's loader (its app.js, a deferred script) starts
// fetching and compiling app.wasm only once the whole page is parsed and
// its style sheets loaded (about 100 ms into a warm start on the bench
// machine), and it hands the compiler a Response rebuilt from a stream (to
// count bytes for its progress label); a rebuilt Response has no URL, so
// the browser cannot keep the code it compiles for it. (Passing the
// worker's own Response gained about 30 ms of a warm start here; whether
// Chromium then keeps compiled code depends on its own tiering.)
//
// Alvea serves every page with web/boot.js as the first script of its
// head, before the style sheets (a script after them would wait for them),
// and app.js with one call replaced. boot.js starts the compile at once and
// leaves its promise in window.alveaWasm; the patched loader instantiates that
// module. When boot.js has not run first, the loader compiles itself:
// served by the service worker, from the fetched Response as it is (so the
// compiled code can be kept); on a first visit, through go-app's counting
// fetch, for its progress label. Whatever fails early falls back to
// loading app.wasm again the go-app way, which reports its own errors.
//
// On a first visit, app.js also waits for the app to start before it
// registers the service worker (alveaRegisterWorker), so the worker's
// precache does not compete with the first start.

// loaderCall matches the call in go-app's app.js that the patch replaces;
// its group is the URL of app.wasm.
var loaderCall = regexp.MustCompile(`instantiateStreaming\(\s*fetchWithProgress\("([^"]+)", showProgress\),\s*go\.importObject\s*\)`)

// workerCall is go-app's registration of the service worker, called as
// app.js starts; the patch makes it wait for the app on a first visit.
const workerCall = "\ngoappInitServiceWorker();\n"

// loaderFunc holds the functions the patch adds.
const loaderFunc = `
// Alvea: on a first visit (no worker yet), registers the service worker
// only once the app has started (the frame sets ` + readyAttr + ` on
// <html>), so that its precache (every file of the app, app.wasm stored
// once more) does not compete with the first start. A page the worker
// already serves registers at once, as go-app does, and so checks for a
// new version at every start. If the app has not started after 10 s the
// worker is registered anyway, so the offline copy still comes.
function alveaRegisterWorker(register) {
  if (!("serviceWorker" in navigator) || navigator.serviceWorker.controller) {
    register();
    return;
  }
  let done = false;
  const observer = new MutationObserver(() => {
    if (document.documentElement.getAttribute("` + readyAttr + `") === "wasm") {
      go();
    }
  });
  const go = () => {
    if (!done) {
      done = true;
      observer.disconnect();
      register();
    }
  };
  observer.observe(document.documentElement, { attributes: true, attributeFilter: ["` + readyAttr + `"] });
  setTimeout(go, 10000);
}

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

// readyAttr is the attribute the frame sets on <html> once the app has
// started (ui.ReadyAttr; a test keeps them equal).
const readyAttr = "data-alvea"

// PatchLoader returns go-app's app.js with its app.wasm loading replaced as
// described above, and its service worker registered by alveaRegisterWorker. It fails if go-app's app.js no longer has the one call
// it replaces (a go-app update must be looked at, not patched blindly).
func PatchLoader(js []byte) ([]byte, error) {
	if n := len(loaderCall.FindAllIndex(js, -1)); n != 1 {
		return nil, fmt.Errorf("server: go-app's app.js has %d calls matching %q where 1 was expected: its loader changed, review PatchLoader", n, loaderCall)
	}
	if n := bytes.Count(js, []byte(workerCall)); n != 1 {
		return nil, fmt.Errorf("server: go-app's app.js has %d calls %q where 1 was expected: its loader changed, review PatchLoader", n, workerCall)
	}
	out := loaderCall.ReplaceAll(js, []byte(`alveaInstantiate(instantiateStreaming, "$1", showProgress, go.importObject)`))
	out = bytes.Replace(out, []byte(workerCall), []byte("\nalveaRegisterWorker(goappInitServiceWorker);\n"), 1)
	return append(out, loaderFunc...), nil
}

// bootTag is the script tag PatchPage puts first in the head, and
// charsetTag the tag it goes after (the charset must stay first).
const (
	bootTag    = `<script src="/web/boot.js"></script>`
	charsetTag = `<meta charset="UTF-8">`
)

// PatchPage returns a page go-app rendered with web/boot.js as the first
// script of its head. It fails on a page without go-app's charset tag.
func PatchPage(html []byte) ([]byte, error) {
	i := bytes.Index(html, []byte(charsetTag))
	if i < 0 {
		return nil, fmt.Errorf("server: the page has no %s to put boot.js after: go-app's page changed, review PatchPage", charsetTag)
	}
	i += len(charsetTag)
	out := make([]byte, 0, len(html)+len(bootTag)+1)
	out = append(out, html[:i]...)
	out = append(out, '\n')
	out = append(out, bootTag...)
	return append(out, html[i:]...), nil
}

// WithLoader serves h, with /app.js replaced by its patched copy and
// every page patched by PatchPage: the handler Serve uses.
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
		switch {
		case r.URL.Path == "/app.js":
			for _, k := range []string{"Content-Type", "Cache-Control", "ETag"} {
				if v := header.Get(k); v != "" {
					w.Header().Set(k, v)
				}
			}
			http.ServeContent(w, r, "app.js", time.Time{}, bytes.NewReader(js))
		case isPage(r.URL.Path):
			servePage(w, r, h)
		default:
			h.ServeHTTP(w, r)
		}
	}), nil
}

// isPage reports whether go-app answers path with a page: any path that
// names no file (routes such as / and /supply, and unknown ones, which get
// go-app's not-found page), or an .html file.
func isPage(p string) bool {
	ext := path.Ext(p)
	return ext == "" || ext == ".html"
}

// servePage serves go-app's answer for a page, patched when it is HTML.
// A HEAD gets the headers of the patched GET (its Content-Length above
// all); a 304 (go-app's answer to a matching ETag: the version, which the
// patched page follows) passes through as it is.
func servePage(w http.ResponseWriter, r *http.Request, h http.Handler) {
	if r.Method != http.MethodGet && r.Method != http.MethodHead {
		h.ServeHTTP(w, r)
		return
	}
	get := r.Clone(r.Context())
	get.Method = http.MethodGet
	rec := httptest.NewRecorder()
	h.ServeHTTP(rec, get)
	body := rec.Body.Bytes()
	if rec.Code == http.StatusOK && strings.HasPrefix(rec.Header().Get("Content-Type"), "text/html") {
		patched, err := PatchPage(body)
		if err != nil {
			http.Error(w, err.Error(), http.StatusInternalServerError)
			return
		}
		body = patched
	}
	for k, v := range rec.Header() {
		w.Header()[k] = v
	}
	if rec.Code != http.StatusNotModified {
		w.Header().Set("Content-Length", strconv.Itoa(len(body)))
	}
	w.WriteHeader(rec.Code)
	if r.Method == http.MethodGet && rec.Code != http.StatusNotModified {
		w.Write(body)
	}
}
