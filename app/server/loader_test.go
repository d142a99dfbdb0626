package server

import (
	"net/http/httptest"
	"os"
	"path/filepath"
	"strings"
	"testing"
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
	wrapped, err := withLoader(h)
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
	if strings.Contains(string(js), loaderCall) {
		t.Error("the patched app.js still calls go-app's fetchWithProgress for app.wasm")
	}
	if !strings.Contains(string(js), `alveaFetchWasm("/web/app.wasm", showProgress)`) {
		t.Error("the patched app.js does not fetch app.wasm through alveaFetchWasm")
	}
	undo := strings.Replace(strings.TrimSuffix(string(js), loaderFunc), `alveaFetchWasm("`, loaderCall, 1)
	if undo != string(orig) {
		t.Error("the patch changed more than the one call")
	}
	// Other paths are go-app's.
	_, page := fetch(t, patched, "GET", "/", "")
	if !strings.Contains(string(page), "<html") {
		t.Error("the wrapped handler does not serve the page")
	}
}

func TestPatchLoaderRefusesUnknownLoader(t *testing.T) {
	for _, js := range []string{"", "const x = 1;", loaderCall + "a\", p);\n" + loaderCall + "b\", p);"} {
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
	if strings.Contains(string(js), loaderCall) || !strings.Contains(string(js), "function alveaFetchWasm(") {
		t.Error("the static app.js is not patched")
	}
}
