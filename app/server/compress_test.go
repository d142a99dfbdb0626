package server

import (
	"bytes"
	"fmt"
	"io"
	"net/http"
	"net/http/httptest"
	"os"
	"os/exec"
	"path/filepath"
	"strconv"
	"strings"
	"testing"
	"time"
)

// wasmLike returns a stand-in app.wasm of about 200 kB: the wasm header
// (WebAssembly Core Specification §5.5.16: "\0asm", version 1) and text
// that compresses well, as a real module's data does.
func wasmLike() []byte {
	var b bytes.Buffer
	b.WriteString("\x00asm\x01\x00\x00\x00")
	for i := 0; b.Len() < 200_000; i++ {
		fmt.Fprintf(&b, "alvea.physio.leg %d cabin altitude %d ft; ", i, i*37%9000)
	}
	return b.Bytes()
}

// compressRoot is a fakeRoot whose app.wasm is wasmLike, with a cache
// directory of its own; it returns the root and the running handler's
// server, the compressed copies made.
func compressRoot(t *testing.T) (string, *httptest.Server, []byte) {
	t.Helper()
	old := CacheDir
	CacheDir = t.TempDir()
	t.Cleanup(func() { CacheDir = old })
	root := fakeRoot(t)
	wasm := wasmLike()
	if err := os.WriteFile(filepath.Join(root, "web", "app.wasm"), wasm, 0o644); err != nil {
		t.Fatal(err)
	}
	h, err := NewHandler(root)
	if err != nil {
		t.Fatal(err)
	}
	if err := h.Resources.(*Resources).Wait(); err != nil {
		t.Fatal(err)
	}
	srv := httptest.NewServer(h)
	t.Cleanup(srv.Close)
	return root, srv, wasm
}

// fetch sends method path with the Accept-Encoding given (none when
// empty), without the client's own decoding, and returns the response and
// the raw body bytes.
func fetch(t *testing.T, srv *httptest.Server, method, path, acceptEncoding string) (*http.Response, []byte) {
	t.Helper()
	req, err := http.NewRequest(method, srv.URL+path, nil)
	if err != nil {
		t.Fatal(err)
	}
	if acceptEncoding != "" {
		req.Header.Set("Accept-Encoding", acceptEncoding)
	}
	client := &http.Client{Transport: &http.Transport{DisableCompression: true}}
	res, err := client.Do(req)
	if err != nil {
		t.Fatal(err)
	}
	defer res.Body.Close()
	body, err := io.ReadAll(res.Body)
	if err != nil {
		t.Fatal(err)
	}
	return res, body
}

// decodeWithCLI decodes body with the reference command-line tools
// (Google's brotli, GNU gzip), not with the library that encoded it.
func decodeWithCLI(t *testing.T, encoding string, body []byte) []byte {
	t.Helper()
	var cmd *exec.Cmd
	switch encoding {
	case "br":
		cmd = exec.Command("brotli", "-d", "-c")
	case "gzip":
		cmd = exec.Command("gzip", "-d", "-c")
	case "":
		return body
	default:
		t.Fatalf("unexpected Content-Encoding %q", encoding)
	}
	cmd.Stdin = bytes.NewReader(body)
	out, err := cmd.Output()
	if err != nil {
		t.Fatalf("%s -d: %v (make deps installs brotli and gzip)", cmd.Path, err)
	}
	return out
}

// The encoding follows Accept-Encoding as RFC 9110 §12.5.3 reads it
// (weights, q=0 refusing, "*" for codings not named, x-gzip as gzip): brotli
// first, then gzip, then none. Each answer says it varies by
// Accept-Encoding, carries the length of the bytes sent, is typed
// application/wasm, and decodes (with the reference tools) to app.wasm.
func TestWasmNegotiation(t *testing.T) {
	_, srv, wasm := compressRoot(t)
	cases := []struct {
		accept, want string
	}{
		{"gzip, deflate, br, zstd", "br"}, // what Chromium sends
		{"br", "br"},
		{"gzip", "gzip"},
		{"x-gzip", "gzip"},
		{"", ""},
		{"identity", ""},
		{"deflate", ""},
		{"br;q=0, gzip", "gzip"},
		{"br;q=0.0, gzip;q=0.5", "gzip"},
		{"BR;Q=1", "br"},
		{"*", "br"},
		{"*;q=0", ""},
		{"gzip;q=0, *", "br"},
		{"br;q=0, *", "gzip"},
		{"br;q=0, gzip;q=0", ""},
		{"br;q=zero, gzip", "gzip"}, // an unreadable weight accepts nothing
	}
	for _, path := range []string{"/web/app.wasm", "/app.wasm"} {
		for _, c := range cases {
			res, body := fetch(t, srv, "GET", path, c.accept)
			name := fmt.Sprintf("GET %s Accept-Encoding %q", path, c.accept)
			if res.StatusCode != 200 {
				t.Errorf("%s: status %d", name, res.StatusCode)
				continue
			}
			if got := res.Header.Get("Content-Encoding"); got != c.want {
				t.Errorf("%s: Content-Encoding %q, want %q", name, got, c.want)
			}
			if got := res.Header.Values("Vary"); !containsFold(got, "Accept-Encoding") {
				t.Errorf("%s: Vary %q lacks Accept-Encoding", name, got)
			}
			if got := res.Header.Get("Content-Type"); got != "application/wasm" {
				t.Errorf("%s: Content-Type %q", name, got)
			}
			if got := res.Header.Get("Content-Length"); got != strconv.Itoa(len(body)) {
				t.Errorf("%s: Content-Length %s, body %d bytes", name, got, len(body))
			}
			if c.want != "" && len(body) >= len(wasm)/2 {
				t.Errorf("%s: %d bytes for %d: not compressed", name, len(body), len(wasm))
			}
			if got := decodeWithCLI(t, c.want, body); !bytes.Equal(got, wasm) {
				t.Errorf("%s: decodes to %d bytes unlike app.wasm (%d)", name, len(got), len(wasm))
			}
		}
	}
}

// HEAD answers the same headers as GET, with no body.
func TestWasmHead(t *testing.T) {
	_, srv, _ := compressRoot(t)
	for _, accept := range []string{"br", "gzip", ""} {
		get, body := fetch(t, srv, "GET", "/web/app.wasm", accept)
		head, empty := fetch(t, srv, "HEAD", "/web/app.wasm", accept)
		if head.StatusCode != 200 || len(empty) != 0 {
			t.Errorf("HEAD %q: status %d, %d body bytes", accept, head.StatusCode, len(empty))
		}
		for _, k := range []string{"Content-Encoding", "Content-Length", "Content-Type", "Vary"} {
			if g, h := get.Header.Get(k), head.Header.Get(k); g != h {
				t.Errorf("HEAD %q: %s %q, GET has %q", accept, k, h, g)
			}
		}
		if head.Header.Get("Content-Length") != strconv.Itoa(len(body)) {
			t.Errorf("HEAD %q: Content-Length %s, GET sends %d", accept, head.Header.Get("Content-Length"), len(body))
		}
	}
}

// go-app's loader counts decoded bytes against WasmContentLength: it is
// the size of app.wasm, not of a compressed copy.
func TestWasmContentLength(t *testing.T) {
	_, srv, wasm := compressRoot(t)
	_, js := fetch(t, srv, "GET", "/app.js", "")
	want := fmt.Sprintf(`const goappWasmContentLength = "%d";`, len(wasm))
	if !strings.Contains(string(js), want) {
		t.Errorf("app.js lacks %s", want)
	}
}

// Until a compressed copy is made, app.wasm goes out as it is (still
// marked as varying).
func TestWasmBeforeCopies(t *testing.T) {
	root := fakeRoot(t)
	wasm := filepath.Join(root, "web", "app.wasm")
	st, _ := os.Stat(wasm)
	r := &Resources{files: http.FileServer(http.Dir(root)), wasm: wasm, size: st.Size(), mod: st.ModTime(),
		copies: &wasmCopies{done: make(chan struct{}), bodies: map[string][]byte{}}}
	srv := httptest.NewServer(r)
	defer srv.Close()
	res, body := fetch(t, srv, "GET", "/web/app.wasm", "gzip, deflate, br")
	if res.Header.Get("Content-Encoding") != "" || string(body) != "\x00asm\x01\x00\x00\x00" {
		t.Errorf("Content-Encoding %q, body %q", res.Header.Get("Content-Encoding"), body)
	}
	if !containsFold(res.Header.Values("Vary"), "Accept-Encoding") {
		t.Error("no Vary: Accept-Encoding")
	}
}

// The copies are kept in CacheDir under the content hash and found again;
// a damaged cache file is not served.
func TestWasmCache(t *testing.T) {
	old := CacheDir
	CacheDir = t.TempDir()
	defer func() { CacheDir = old }()
	data := append(wasmLike(), "cache test"...) // a content no other test made
	sum := contentHash(data)
	c := copiesFor(sum, data)
	if err := c.wait(); err != nil {
		t.Fatal(err)
	}
	for _, enc := range Encodings {
		b, ok := readCached(sum, enc)
		if !ok {
			t.Fatalf("%s copy not cached", enc.Name)
		}
		if got, _ := c.get(enc.Name); !bytes.Equal(got, b) {
			t.Errorf("%s: cached copy differs from the one served", enc.Name)
		}
		p := cachePath(sum, enc)
		os.WriteFile(p, b[:len(b)/2], 0o644)
		if _, ok := readCached(sum, enc); ok {
			t.Errorf("%s: a truncated cache file was accepted", enc.Name)
		}
		// The same length of other valid data: decodes, to another content.
		other, _ := Compress(enc, []byte("other content"))
		os.WriteFile(p, other, 0o644)
		if _, ok := readCached(sum, enc); ok {
			t.Errorf("%s: a cache file of another content was accepted", enc.Name)
		}
	}
}

// A stale compressed copy left in web/ is neither served, nor hashed into
// the version, nor copied to the static site.
func TestStaleCopyInWeb(t *testing.T) {
	root, _, _ := compressRoot(t)
	v1, _ := Version(root)
	os.WriteFile(filepath.Join(root, "web", "app.wasm.br"), []byte("stale"), 0o644)
	os.WriteFile(filepath.Join(root, "web", "app.wasm.gz"), []byte("stale"), 0o644)
	if v2, _ := Version(root); v2 != v1 {
		t.Error("a copy in web/ changed the version")
	}
	out := t.TempDir()
	if _, err := WriteStatic(out, root); err != nil {
		t.Fatal(err)
	}
	for _, ext := range []string{".br", ".gz"} {
		b, _ := os.ReadFile(filepath.Join(out, "web", "app.wasm"+ext))
		if string(b) == "stale" {
			t.Errorf("the static site got the stale app.wasm%s", ext)
		}
	}
}

// The static site carries app.wasm.br and app.wasm.gz (decoding, with the
// reference tools, to its app.wasm) and the note for hosts.
func TestStaticCompressedCopies(t *testing.T) {
	root, _, wasm := compressRoot(t)
	out := t.TempDir()
	if _, err := WriteStatic(out, root); err != nil {
		t.Fatal(err)
	}
	plain, err := os.ReadFile(filepath.Join(out, "web", "app.wasm"))
	if err != nil || !bytes.Equal(plain, wasm) {
		t.Fatalf("static web/app.wasm: %v", err)
	}
	for _, enc := range Encodings {
		b, err := os.ReadFile(filepath.Join(out, "web", "app.wasm"+enc.Ext))
		if err != nil {
			t.Fatalf("static site lacks web/app.wasm%s: %v", enc.Ext, err)
		}
		if got := decodeWithCLI(t, enc.Name, b); !bytes.Equal(got, wasm) {
			t.Errorf("web/app.wasm%s does not decode to app.wasm", enc.Ext)
		}
	}
	note, err := os.ReadFile(filepath.Join(out, "HOSTING.txt"))
	if err != nil {
		t.Fatal(err)
	}
	for _, want := range []string{fmt.Sprintf("web/app.wasm is %d bytes", len(wasm)), "Content-Encoding: br", "Vary: Accept-Encoding", "application/wasm"} {
		if !strings.Contains(string(note), want) {
			t.Errorf("HOSTING.txt lacks %q", want)
		}
	}
	// The static app.js carries the size of app.wasm for the progress.
	js, _ := os.ReadFile(filepath.Join(out, "app.js"))
	if !strings.Contains(string(js), fmt.Sprintf(`goappWasmContentLength = "%d"`, len(wasm))) {
		t.Error("static app.js lacks the size of app.wasm")
	}
}

func containsFold(values []string, want string) bool {
	for _, v := range values {
		for _, part := range strings.Split(v, ",") {
			if strings.EqualFold(strings.TrimSpace(part), want) {
				return true
			}
		}
	}
	return false
}

// The worker's precache revalidates rather than reloads: the app.wasm the
// page has just downloaded is confirmed by its ETag (the version) and taken
// from the HTTP cache, not downloaded a second time.
func TestWorkerPrecacheRevalidates(t *testing.T) {
	_, srv, _ := compressRoot(t)
	_, worker := fetch(t, srv, "GET", "/app-worker.js", "")
	if !strings.Contains(string(worker), `cache: "no-cache"`) || strings.Contains(string(worker), `cache: "reload"`) {
		t.Error(`the precache should use cache: "no-cache", not "reload"`)
	}
	// A request carrying the served ETag gets 304 Not Modified.
	res, _ := fetch(t, srv, "GET", "/web/app.wasm", "br")
	etag := res.Header.Get("ETag")
	req, _ := http.NewRequest("GET", srv.URL+"/web/app.wasm", nil)
	req.Header.Set("If-None-Match", etag)
	req.Header.Set("Accept-Encoding", "br")
	again, err := (&http.Client{Transport: &http.Transport{DisableCompression: true}}).Do(req)
	if err != nil {
		t.Fatal(err)
	}
	again.Body.Close()
	if etag == "" || again.StatusCode != http.StatusNotModified {
		t.Errorf("ETag %q, revalidation answered %d, want 304", etag, again.StatusCode)
	}
}

// The cache keeps the most recently used files only.
func TestCachePrune(t *testing.T) {
	old := CacheDir
	CacheDir = t.TempDir()
	defer func() { CacheDir = old }()
	base := time.Now().Add(-time.Hour)
	for i := 0; i < 5; i++ {
		p := filepath.Join(CacheDir, fmt.Sprintf("f%d.br", i))
		os.WriteFile(p, []byte("x"), 0o644)
		at := base.Add(time.Duration(i) * time.Minute)
		os.Chtimes(p, at, at)
	}
	pruneCache(2)
	entries, _ := os.ReadDir(CacheDir)
	var names []string
	for _, e := range entries {
		names = append(names, e.Name())
	}
	if strings.Join(names, " ") != "f3.br f4.br" {
		t.Errorf("kept %v, want the two most recent (f3.br f4.br)", names)
	}
}
