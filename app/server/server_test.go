package server

import (
	"encoding/json"
	"io"
	"net/http"
	"net/http/httptest"
	"os"
	"path/filepath"
	"regexp"
	"strings"
	"testing"
	"time"

	"alvea/app/ui"
)

func init() { ui.Register() } // the handler prerenders routed pages only

// fakeRoot makes a root whose web/ holds a stand-in app.wasm and copies of
// the committed assets: enough for the handler, which never runs the wasm.
func fakeRoot(t *testing.T) string {
	t.Helper()
	root := t.TempDir()
	web := filepath.Join(root, "web")
	if err := os.MkdirAll(web, 0o755); err != nil {
		t.Fatal(err)
	}
	for _, name := range []string{"alvea.css", "alvea.js", "boot.js", "icon.svg", "icon-192.png", "icon-512.png", "icon-maskable-512.png"} {
		b, err := os.ReadFile(filepath.Join("..", "..", "web", name))
		if err != nil {
			t.Fatal(err)
		}
		if err := os.WriteFile(filepath.Join(web, name), b, 0o644); err != nil {
			t.Fatal(err)
		}
	}
	// "\0asm" and version 1: a wasm header (WebAssembly Core Specification §5.5.16).
	if err := os.WriteFile(filepath.Join(web, "app.wasm"), []byte("\x00asm\x01\x00\x00\x00"), 0o644); err != nil {
		t.Fatal(err)
	}
	return root
}

func get(t *testing.T, srv *httptest.Server, path string) (int, string, http.Header) {
	t.Helper()
	res, err := http.Get(srv.URL + path)
	if err != nil {
		t.Fatal(err)
	}
	defer res.Body.Close()
	b, err := io.ReadAll(res.Body)
	if err != nil {
		t.Fatal(err)
	}
	return res.StatusCode, string(b), res.Header
}

// The version is a content hash: the same files give the same version
// whatever their timestamps; any change of content or name gives another.
func TestVersionIsContentHash(t *testing.T) {
	root := fakeRoot(t)
	v1, err := Version(root)
	if err != nil {
		t.Fatal(err)
	}
	if !regexp.MustCompile(`^[0-9a-f]{20}$`).MatchString(v1) {
		t.Fatalf("version %q is not 20 hex digits", v1)
	}
	css := filepath.Join(root, "web", "alvea.css")
	if err := os.Chtimes(css, timeZero, timeZero); err != nil {
		t.Fatal(err)
	}
	if v, _ := Version(root); v != v1 {
		t.Errorf("touching a file changed the version: %s → %s", v1, v)
	}
	b, _ := os.ReadFile(css)
	os.WriteFile(css, append(b, '\n'), 0o644)
	v2, _ := Version(root)
	if v2 == v1 {
		t.Error("changing alvea.css kept the version")
	}
	os.WriteFile(filepath.Join(root, "web", "app.wasm"), []byte("\x00asm\x01\x00\x00\x00\x00"), 0o644)
	if v3, _ := Version(root); v3 == v2 {
		t.Error("changing app.wasm kept the version")
	}
	// Dot files (.keep) are not assets.
	v4, _ := Version(root)
	os.WriteFile(filepath.Join(root, "web", ".keep"), nil, 0o644)
	if v5, _ := Version(root); v5 != v4 {
		t.Error(".keep changed the version")
	}
}

func TestNewHandlerNeedsWasm(t *testing.T) {
	root := fakeRoot(t)
	os.Remove(filepath.Join(root, "web", "app.wasm"))
	if _, err := NewHandler(root); err == nil || !strings.Contains(err.Error(), "app.wasm") {
		t.Errorf("err = %v, want one naming app.wasm", err)
	}
}

// The page, the worker and the manifest: every resource local, every web
// file precached, the install waiting on the precache, query strings
// ignored, navigations falling back to "/", and no activation by itself.
func TestHandlerOffline(t *testing.T) {
	root := fakeRoot(t)
	h, err := NewHandler(root)
	if err != nil {
		t.Fatal(err)
	}
	srv := httptest.NewServer(h)
	defer srv.Close()

	code, page, _ := get(t, srv, "/settings")
	if code != 200 || !strings.Contains(page, ">Settings</h1>") {
		t.Fatalf("/settings: %d, prerendered Settings missing", code)
	}
	if !strings.Contains(page, `http-equiv="Content-Security-Policy"`) || !strings.Contains(page, "connect-src 'self'") {
		t.Error("page lacks the same-origin content security policy")
	}
	for _, attr := range regexp.MustCompile(`(?:src|href)="([^"]*)"`).FindAllStringSubmatch(page, -1) {
		if u := attr[1]; strings.Contains(u, "://") {
			t.Errorf("page refers to another origin: %s", u)
		}
	}
	if code, _, _ := get(t, srv, "/no-such-screen"); code != 404 {
		t.Errorf("/no-such-screen: %d, want 404", code)
	}

	_, worker, _ := get(t, srv, "/app-worker.js")
	m := regexp.MustCompile(`const resourcesToCache = (\[.*\]);`).FindStringSubmatch(worker)
	if m == nil {
		t.Fatal("worker has no resource list")
	}
	var list []string
	if err := json.Unmarshal([]byte(m[1]), &list); err != nil {
		t.Fatal(err)
	}
	want := []string{"/", "/app.js", "/app.css", "/wasm_exec.js", "/manifest.webmanifest",
		"/web/app.wasm", "/web/alvea.css", "/web/alvea.js", "/web/boot.js", "/web/icon.svg", "/web/icon-192.png", "/web/icon-512.png", "/web/icon-maskable-512.png"}
	for _, w := range want {
		if !contains(list, w) {
			t.Errorf("precache lacks %s", w)
		}
	}
	for _, u := range list {
		if strings.Contains(u, "://") {
			t.Errorf("precache holds a remote URL %s", u)
		}
		if code, _, _ := get(t, srv, u); code != 200 {
			t.Errorf("precached %s answers %d", u, code)
		}
	}
	for _, want := range []string{
		"event.waitUntil(precache())", "ignoreSearch: true", `request.mode === "navigate"`, `cache.match("/")`,
		`"alvea-` + h.Version + `"`,
	} {
		if !strings.Contains(worker, want) {
			t.Errorf("worker lacks %q", want)
		}
	}
	// skipWaiting only in answer to the page's message.
	if n := strings.Count(worker, "skipWaiting()"); n != 1 || !strings.Contains(worker, `event.data.type === "alvea:activate"`) {
		t.Errorf("skipWaiting appears %d times; want once, behind the alvea:activate message", n)
	}

	_, manifest, _ := get(t, srv, "/manifest.webmanifest")
	var mf struct {
		Name     string `json:"name"`
		StartURL string `json:"start_url"`
		Display  string `json:"display"`
		Icons    []struct {
			Src, Sizes, Type, Purpose string
		} `json:"icons"`
	}
	if err := json.Unmarshal([]byte(manifest), &mf); err != nil {
		t.Fatal(err)
	}
	if mf.Name != "Alvea" || mf.StartURL != "/" || mf.Display != "standalone" {
		t.Errorf("manifest = %+v", mf)
	}
	has := map[string]bool{}
	for _, ic := range mf.Icons {
		if !strings.HasPrefix(ic.Src, "/web/") {
			t.Errorf("manifest icon %s is not local", ic.Src)
		}
		has[ic.Sizes+" "+ic.Purpose] = true
	}
	for _, w := range []string{"192x192 ", "512x512 ", "512x512 maskable"} {
		if !has[w] {
			t.Errorf("manifest lacks icon %q", w)
		}
	}
}

// The static site holds go-app's pages and files plus a copy of web/.
func TestWriteStatic(t *testing.T) {
	root := fakeRoot(t)
	out := t.TempDir()
	version, err := WriteStatic(out, root)
	if err != nil {
		t.Fatal(err)
	}
	want, _ := Version(root)
	if version != want {
		t.Errorf("version %s, want %s", version, want)
	}
	for _, f := range []string{"index.html", "supply.html", "settings.html", "app.js", "app-worker.js", "manifest.webmanifest", "app.css", "wasm_exec.js",
		"web/app.wasm", "web/alvea.css", "web/alvea.js", "web/icon.svg", "web/icon-192.png"} {
		if _, err := os.Stat(filepath.Join(out, f)); err != nil {
			t.Errorf("missing %s", f)
		}
	}
	worker, _ := os.ReadFile(filepath.Join(out, "app-worker.js"))
	if !strings.Contains(string(worker), version) {
		t.Error("the static worker does not carry the version")
	}
}

var timeZero = time.Unix(0, 0)

func contains(list []string, s string) bool {
	for _, v := range list {
		if v == s {
			return true
		}
	}
	return false
}
