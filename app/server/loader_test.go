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
	// Nothing else changed.
	undo := strings.Replace(strings.TrimSuffix(string(js), loaderFunc), call, "@", 1)
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
