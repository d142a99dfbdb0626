package server

import (
	"bytes"
	"compress/gzip"
	"errors"
	"fmt"
	"io"
	"net/http"
	"os"
	"path/filepath"
	"sort"
	"strconv"
	"strings"
	"sync"
	"time"

	"github.com/andybalholm/brotli"
)

// app.wasm is served compressed: brotli or gzip, chosen from the request's
// Accept-Encoding, with "Vary: Accept-Encoding" and the Content-Length of
// the bytes sent. The compressed copies are derived from app.wasm by this
// package (natively, never in the browser): they are made once per content
// and kept in a cache directory under the name of the content's SHA-256, so
// a restart of the same build finds them at once. A new build is served
// uncompressed (then gzip) until its brotli copy is ready: the first
// brotli encoding of a ~11 MB module at the highest quality takes about a
// minute, and the server must not wait that long to start.
//
// go-app's loader counts the decoded bytes it reads against
// Handler.WasmContentLength, which is therefore the size of app.wasm itself
// (the Content-Length of a compressed response is the compressed size).

// Encoding is one content coding of app.wasm.
type Encoding struct {
	Name string // the Content-Encoding token: "br" or "gzip"
	Ext  string // the file name suffix: ".br" or ".gz"
}

// Encodings lists the codings in the server's order of preference.
var Encodings = []Encoding{{"br", ".br"}, {"gzip", ".gz"}}

// Brotli and gzip settings: the highest quality of each (the encoding is
// done once per build). LGWin 24 is brotli's largest standard window
// (RFC 7932 §9.1: WBITS 10–24).
const (
	brotliQuality = 11
	brotliLGWin   = 24
	gzipLevel     = gzip.BestCompression
)

// Compress returns data encoded with enc.
func Compress(enc Encoding, data []byte) ([]byte, error) {
	var buf bytes.Buffer
	switch enc.Name {
	case "br":
		w := brotli.NewWriterOptions(&buf, brotli.WriterOptions{Quality: brotliQuality, LGWin: brotliLGWin})
		if _, err := w.Write(data); err != nil {
			return nil, err
		}
		if err := w.Close(); err != nil {
			return nil, err
		}
	case "gzip":
		// No name and no time in the header: the same input gives the
		// same bytes.
		w, err := gzip.NewWriterLevel(&buf, gzipLevel)
		if err != nil {
			return nil, err
		}
		if _, err := w.Write(data); err != nil {
			return nil, err
		}
		if err := w.Close(); err != nil {
			return nil, err
		}
	default:
		return nil, fmt.Errorf("server: unknown encoding %q", enc.Name)
	}
	return buf.Bytes(), nil
}

// Decompress decodes data encoded with enc (for checks).
func Decompress(enc Encoding, data []byte) ([]byte, error) {
	var r io.Reader
	switch enc.Name {
	case "br":
		r = brotli.NewReader(bytes.NewReader(data))
	case "gzip":
		zr, err := gzip.NewReader(bytes.NewReader(data))
		if err != nil {
			return nil, err
		}
		r = zr
	default:
		return nil, fmt.Errorf("server: unknown encoding %q", enc.Name)
	}
	return io.ReadAll(r)
}

// CacheDir is where compressed copies are kept, by content hash. Empty
// means none: every process compresses again. It defaults to the user's
// cache directory (alvea/wasm inside it).
var CacheDir = defaultCacheDir()

func defaultCacheDir() string {
	d, err := os.UserCacheDir()
	if err != nil {
		return ""
	}
	return filepath.Join(d, "alvea", "wasm")
}

// wasmCopies holds the compressed copies of one app.wasm content. Copies
// are filled in by one background job per content and process.
type wasmCopies struct {
	sum  string // hex SHA-256 of the content
	done chan struct{}

	mu     sync.RWMutex
	bodies map[string][]byte // encoding name → bytes
	err    error
}

var (
	copiesMu sync.Mutex
	copies   = map[string]*wasmCopies{}
)

// copiesFor returns the compressed copies of data (whose SHA-256 is sum),
// starting their making when this process has not yet.
func copiesFor(sum string, data []byte) *wasmCopies {
	copiesMu.Lock()
	defer copiesMu.Unlock()
	if c, ok := copies[sum]; ok {
		return c
	}
	c := &wasmCopies{sum: sum, done: make(chan struct{}), bodies: map[string][]byte{}}
	copies[sum] = c
	// The cached ones at once, so a restart serves them from its first
	// request; the missing ones in the background, cheapest first.
	var missing []Encoding
	for _, enc := range Encodings {
		if b, ok := readCached(sum, enc); ok {
			c.bodies[enc.Name] = b
		} else {
			missing = append(missing, enc)
		}
	}
	if len(missing) == 0 {
		close(c.done)
		return c
	}
	go func() {
		defer close(c.done)
		for i := len(missing) - 1; i >= 0; i-- { // gzip before brotli
			enc := missing[i]
			b, err := Compress(enc, data)
			if err != nil {
				c.mu.Lock()
				c.err = errors.Join(c.err, err)
				c.mu.Unlock()
				continue
			}
			writeCached(sum, enc, b) // a cache that cannot be written only costs time
			c.mu.Lock()
			c.bodies[enc.Name] = b
			c.mu.Unlock()
		}
	}()
	return c
}

// get returns the copy for the encoding, if made.
func (c *wasmCopies) get(name string) ([]byte, bool) {
	c.mu.RLock()
	defer c.mu.RUnlock()
	b, ok := c.bodies[name]
	return b, ok
}

// wait blocks until every copy is made and reports an encoding failure.
func (c *wasmCopies) wait() error {
	<-c.done
	c.mu.RLock()
	defer c.mu.RUnlock()
	return c.err
}

func cachePath(sum string, enc Encoding) string {
	return filepath.Join(CacheDir, fmt.Sprintf("%s-q%d%s", sum, qualityOf(enc), enc.Ext))
}

func qualityOf(enc Encoding) int {
	if enc.Name == "br" {
		return brotliQuality
	}
	return gzipLevel
}

// readCached returns a cached copy whose decoded content hashes to sum
// (checked: a damaged cache file is never served).
func readCached(sum string, enc Encoding) ([]byte, bool) {
	if CacheDir == "" {
		return nil, false
	}
	b, err := os.ReadFile(cachePath(sum, enc))
	if err != nil {
		return nil, false
	}
	plain, err := Decompress(enc, b)
	if err != nil {
		return nil, false
	}
	if contentHash(plain) != sum {
		return nil, false
	}
	now := time.Now()
	os.Chtimes(cachePath(sum, enc), now, now) // used: kept by pruneCache
	return b, true
}

// writeCached stores a copy through a temporary file and a rename, so a
// reader never sees half a file.
func writeCached(sum string, enc Encoding, b []byte) {
	if CacheDir == "" {
		return
	}
	if err := os.MkdirAll(CacheDir, 0o755); err != nil {
		return
	}
	f, err := os.CreateTemp(CacheDir, ".tmp-*")
	if err != nil {
		return
	}
	_, werr := f.Write(b)
	cerr := f.Close()
	if werr != nil || cerr != nil {
		os.Remove(f.Name())
		return
	}
	if err := os.Rename(f.Name(), cachePath(sum, enc)); err != nil {
		os.Remove(f.Name())
	}
	pruneCache(cacheKeep)
}

// cacheKeep is how many files the cache keeps: the copies of the last few
// builds (two per build).
const cacheKeep = 12

// pruneCache removes all but the keep most recently used files of the
// cache (readCached marks a file used).
func pruneCache(keep int) {
	entries, err := os.ReadDir(CacheDir)
	if err != nil {
		return
	}
	type file struct {
		path string
		used time.Time
	}
	var files []file
	for _, e := range entries {
		info, err := e.Info()
		if err != nil || !info.Mode().IsRegular() {
			continue
		}
		files = append(files, file{filepath.Join(CacheDir, e.Name()), info.ModTime()})
	}
	if len(files) <= keep {
		return
	}
	sort.Slice(files, func(i, j int) bool { return files[i].used.After(files[j].used) })
	for _, f := range files[keep:] {
		os.Remove(f.path)
	}
}

// Resources serves root/web under /web/ for go-app's Handler (it is the
// Handler's Resources), with app.wasm negotiated as above. Other files are
// served as they are.
type Resources struct {
	files  http.Handler
	wasm   string // path of app.wasm
	size   int64  // its size
	mod    time.Time
	copies *wasmCopies
}

// NewResources reads root/web/app.wasm and starts making its compressed
// copies (or finds them in CacheDir).
func NewResources(root string) (*Resources, error) {
	wasm := filepath.Join(root, "web", "app.wasm")
	data, err := os.ReadFile(wasm)
	if err != nil {
		return nil, fmt.Errorf("server: %s is missing; build it first (make wasm): %w", wasm, err)
	}
	st, err := os.Stat(wasm)
	if err != nil {
		return nil, fmt.Errorf("server: %w", err)
	}
	return &Resources{
		files:  http.FileServer(http.Dir(root)),
		wasm:   wasm,
		size:   int64(len(data)),
		mod:    st.ModTime(),
		copies: copiesFor(contentHash(data), data),
	}, nil
}

// WasmContentLength is the size of app.wasm in bytes, as go-app's
// Handler.WasmContentLength wants it.
func (r *Resources) WasmContentLength() string { return strconv.FormatInt(r.size, 10) }

// Wait blocks until every compressed copy is made.
func (r *Resources) Wait() error { return r.copies.wait() }

// Copy returns the compressed copy of app.wasm for the encoding, once made.
func (r *Resources) Copy(enc Encoding) ([]byte, bool) { return r.copies.get(enc.Name) }

// Resolve leaves every URL as the page sees it (/web/x). go-app's LocalDir
// puts its directory into the URLs, which only works for the working
// directory.
func (*Resources) Resolve(location string) string {
	switch {
	case location == "" || location == "/":
		return "/"
	case strings.HasPrefix(location, "http://") || strings.HasPrefix(location, "https://"):
		return location
	case strings.HasPrefix(location, "/web/") || strings.HasPrefix(location, "web/"):
		return "/" + strings.Trim(location, "/")
	default:
		return location
	}
}

func (r *Resources) ServeHTTP(w http.ResponseWriter, req *http.Request) {
	if req.URL.Path != "/web/app.wasm" {
		r.files.ServeHTTP(w, req)
		return
	}
	w.Header().Add("Vary", "Accept-Encoding")
	w.Header().Set("Content-Type", "application/wasm")
	accepted := acceptedEncodings(req.Header.Get("Accept-Encoding"))
	for _, enc := range Encodings {
		if !accepted[enc.Name] {
			continue
		}
		if b, ok := r.copies.get(enc.Name); ok {
			// Written here rather than by http.ServeContent, which drops
			// Content-Length when Content-Encoding is set. A Range is
			// not honoured (RFC 9110 §14.2 lets a server ignore it).
			w.Header().Set("Content-Encoding", enc.Name)
			w.Header().Set("Content-Length", strconv.Itoa(len(b)))
			w.WriteHeader(http.StatusOK)
			if req.Method != http.MethodHead {
				w.Write(b)
			}
			return
		}
	}
	f, err := os.Open(r.wasm)
	if err != nil {
		http.Error(w, "app.wasm is missing", http.StatusNotFound)
		return
	}
	defer f.Close()
	http.ServeContent(w, req, "app.wasm", r.mod, f)
}

// acceptedEncodings reads an Accept-Encoding header (RFC 9110 §12.5.3):
// codings with a weight above zero are accepted; "*" accepts every coding
// not named.
func acceptedEncodings(header string) map[string]bool {
	named := map[string]bool{}
	out := map[string]bool{}
	star, starOK := false, false
	for _, part := range strings.Split(header, ",") {
		token, params, _ := strings.Cut(strings.TrimSpace(part), ";")
		token = strings.ToLower(strings.TrimSpace(token))
		if token == "" {
			continue
		}
		ok := true
		for _, p := range strings.Split(params, ";") {
			k, v, found := strings.Cut(strings.TrimSpace(p), "=")
			if found && strings.EqualFold(strings.TrimSpace(k), "q") {
				q, err := strconv.ParseFloat(strings.TrimSpace(v), 64)
				ok = err == nil && q > 0
			}
		}
		if token == "*" {
			star, starOK = true, ok
			continue
		}
		if token == "x-gzip" { // RFC 9110 §8.4.1.3: equivalent to gzip
			token = "gzip"
		}
		named[token] = true
		out[token] = ok
	}
	if star {
		for _, enc := range Encodings {
			if !named[enc.Name] {
				out[enc.Name] = starOK
			}
		}
	}
	return out
}
