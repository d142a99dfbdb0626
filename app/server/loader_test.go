package server

import (
	"net/http"
	"net/http/httptest"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"testing"

	"alvea/app/ui"
)

// The app.js Serve sends is go-app's with the app.wasm fetch replaced:
// the one call, and nothing else changed.
func TestServedLoaderPatched(t *testing.T) {
	h, err := NewHandler(fakeRoot(t))
	if err != nil {
		t.Fatal(err)
	}
	plain := httptest.NewServer(h)
	defer plain.Close()
	wrapped, err := WithLoader(h)
	if err != nil {
		t.Fatal(err)
	}
	patched := httptest.NewServer(wrapped)
	defer patched.Close()

	_, orig := fetch(t, plain, "GET", "/app.js", "")
	resp, js := fetch(t, patched, "GET", "/app.js", "")
	if got := resp.Header.Get("Content-Type"); !strings.Contains(got, "javascript") {
		t.Errorf("Content-Type %q", got)
	}
	if loaderCall.Match(js) {
		t.Error("the patched app.js still has go-app's app.wasm loading")
	}
	// The URL boot.js compiles early is the one go-app loads.
	call := `alveaInstantiate(instantiateStreaming, "/web/app.wasm", showProgress, go.importObject)`
	if !strings.Contains(string(js), call) {
		t.Errorf("the patched app.js lacks %s", call)
	}
	boot, err := os.ReadFile(filepath.Join("..", "..", "web", "boot.js"))
	if err != nil {
		t.Fatal(err)
	}
	if !strings.Contains(string(boot), `var url = "/web/app.wasm";`) {
		t.Error("web/boot.js does not compile /web/app.wasm")
	}
	// The worker is registered through alveaRegisterWorker, keyed on the
	// attribute the frame sets.
	if !strings.Contains(string(js), "\nalveaRegisterWorker(goappInitServiceWorker);\n") || strings.Contains(string(js), workerCall) {
		t.Error("the patched app.js registers the service worker at once")
	}
	if readyAttr != ui.ReadyAttr {
		t.Errorf("the loader waits for %q, the frame sets %q", readyAttr, ui.ReadyAttr)
	}
	// Nothing else changed.
	undo := strings.Replace(strings.TrimSuffix(string(js), loaderFunc), call, "@", 1)
	undo = strings.Replace(undo, "\nalveaRegisterWorker(goappInitServiceWorker);\n", workerCall, 1)
	o := loaderCall.ReplaceAllString(string(orig), "@")
	if undo != o {
		t.Error("the patch changed more than the one call")
	}
	// Other paths are go-app's.
	_, page := fetch(t, patched, "GET", "/", "")
	if !strings.Contains(string(page), "<html") {
		t.Error("the wrapped handler does not serve the page")
	}
}

func TestPatchLoaderRefusesUnknownLoader(t *testing.T) {
	for _, js := range []string{"", "const x = 1;", strings.Repeat(`instantiateStreaming(fetchWithProgress("/a", showProgress), go.importObject)`, 2)} {
		if _, err := PatchLoader([]byte(js)); err == nil {
			t.Errorf("PatchLoader(%q) accepted a loader it does not know", js)
		}
	}
}

func TestStaticLoaderPatched(t *testing.T) {
	out := t.TempDir()
	if _, err := WriteStatic(out, fakeRoot(t)); err != nil {
		t.Fatal(err)
	}
	js, err := os.ReadFile(filepath.Join(out, "app.js"))
	if err != nil {
		t.Fatal(err)
	}
	if loaderCall.Match(js) || !strings.Contains(string(js), "async function alveaInstantiate(") {
		t.Error("the static app.js is not patched")
	}
}

// Every page, served or static, runs web/boot.js first: right after the
// charset, before any style sheet (a script after a style sheet waits for
// it) and before go-app's own scripts.
func checkBootFirst(t *testing.T, name, page string) {
	t.Helper()
	boot := strings.Index(page, bootTag)
	if boot < 0 {
		t.Errorf("%s: no %s", name, bootTag)
		return
	}
	if strings.Count(page, "/web/boot.js") != 1 {
		t.Errorf("%s: boot.js appears %d times", name, strings.Count(page, "/web/boot.js"))
	}
	for _, later := range []string{`rel="stylesheet"`, `/app.js`, `/wasm_exec.js`} {
		if i := strings.Index(page, later); i < 0 || i < boot {
			t.Errorf("%s: %s is not after boot.js", name, later)
		}
	}
	if !strings.HasPrefix(page[strings.Index(page, charsetTag)+len(charsetTag):], "\n"+bootTag) {
		t.Errorf("%s: boot.js does not follow the charset", name)
	}
}

func TestPagesRunBootFirst(t *testing.T) {
	root := fakeRoot(t)
	h, err := NewHandler(root)
	if err != nil {
		t.Fatal(err)
	}
	wrapped, err := WithLoader(h)
	if err != nil {
		t.Fatal(err)
	}
	srv := httptest.NewServer(wrapped)
	defer srv.Close()
	// A path that is no screen is go-app's plain-text 404, passed on.
	if resp, body := fetch(t, srv, "GET", "/no-such-screen", ""); resp.StatusCode != 404 || strings.Contains(string(body), bootTag) {
		t.Errorf("/no-such-screen: status %d, body %q", resp.StatusCode, body)
	}
	for _, p := range []string{"/", "/supply", "/settings", "/logbook"} {
		resp, body := fetch(t, srv, "GET", p, "")
		if got := resp.Header.Get("Content-Length"); got != "" && got != strconv.Itoa(len(body)) {
			t.Errorf("%s: Content-Length %s, body %d bytes", p, got, len(body))
		}
		checkBootFirst(t, p, string(body))
	}
	// HEAD tells the patched page's length; a request with the version's
	// ETag gets go-app's 304, with no body and no length of its own.
	get, body := fetch(t, srv, "GET", "/supply", "")
	head, _ := fetch(t, srv, "HEAD", "/supply", "")
	if head.StatusCode != 200 || head.Header.Get("Content-Length") != strconv.Itoa(len(body)) {
		t.Errorf("HEAD /supply: status %d, Content-Length %q; GET sends %d bytes", head.StatusCode, head.Header.Get("Content-Length"), len(body))
	}
	req, _ := http.NewRequest("GET", srv.URL+"/supply", nil)
	req.Header.Set("If-None-Match", get.Header.Get("ETag"))
	res, err := http.DefaultClient.Do(req)
	if err != nil {
		t.Fatal(err)
	}
	res.Body.Close()
	if res.StatusCode != http.StatusNotModified || res.Header.Get("Content-Length") != "" {
		t.Errorf("GET /supply with its ETag: status %d, Content-Length %q; want 304 and none", res.StatusCode, res.Header.Get("Content-Length"))
	}

	out := t.TempDir()
	if _, err := WriteStatic(out, root); err != nil {
		t.Fatal(err)
	}
	pages, _ := filepath.Glob(filepath.Join(out, "*.html"))
	if len(pages) < 6 {
		t.Fatalf("static site has %d pages", len(pages))
	}
	for _, p := range pages {
		b, _ := os.ReadFile(p)
		checkBootFirst(t, "static "+filepath.Base(p), string(b))
	}
	if _, err := PatchPage([]byte("<html><head><title>x</title></head></html>")); err == nil {
		t.Error("PatchPage accepted a page without go-app's charset tag")
	}
}
