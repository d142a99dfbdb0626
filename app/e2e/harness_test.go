//go:build !wasm

package e2e

import (
	"context"
	"encoding/json"
	"flag"
	"fmt"
	"io/fs"
	"net"
	"net/http"
	"os"
	"os/exec"
	"path/filepath"
	"strings"
	"sync"
	"testing"
	"time"

	"github.com/chromedp/cdproto/network"
	"github.com/chromedp/chromedp"

	"alvea/app/internal/chromium"
	"alvea/app/server"
	"alvea/app/ui"
)

// repoRoot is the module root (it holds go.mod and web/).
var repoRoot string

func TestMain(m *testing.M) {
	root, err := chromium.RepoRoot()
	if err != nil {
		fmt.Fprintln(os.Stderr, "e2e:", err)
		os.Exit(1)
	}
	repoRoot = root
	// The server prerenders routed pages only.
	ui.Register()
	flag.Parse()
	if f := flag.Lookup("test.list"); f != nil && f.Value.String() != "" {
		os.Exit(m.Run()) // listing tests (make fuzz) needs no build
	}
	// Rebuild app.wasm with the flags make uses (incremental when nothing
	// changed), so a test never runs against a stale build.
	args := append(append([]string{"build"}, chromium.WasmBuildFlags...), "-o", filepath.Join(root, "web", "app.wasm"), "./app")
	cmd := exec.Command("go", args...)
	cmd.Dir = root
	cmd.Env = append(os.Environ(), "GOOS=js", "GOARCH=wasm")
	if out, err := cmd.CombinedOutput(); err != nil {
		fmt.Fprintf(os.Stderr, "e2e: building app.wasm: %v\n%s", err, out)
		os.Exit(1)
	}
	os.Exit(m.Run())
}

// ---------------------------------------------------------------------------
// Servers

// testServer serves the app (or any handler) on 127.0.0.1. Stop and Start
// again keep the same address, so the browser sees the same origin (and the
// same service worker registration).
type testServer struct {
	t       *testing.T
	addr    string
	handler http.Handler
	srv     *http.Server
	done    chan struct{}
	Version string // the app version served ("" for a plain file server)
}

// startApp serves the app for the assets in root/web (see copyWeb) on a new
// loopback port.
func startApp(t *testing.T, root string) *testServer {
	t.Helper()
	return startAppAt(t, "127.0.0.1:0", root)
}

// startAppAt serves the app for root on addr (reuse a stopped server's Addr
// to serve a new version on the same origin).
func startAppAt(t *testing.T, addr, root string) *testServer {
	t.Helper()
	h, err := server.NewHandler(root)
	if err != nil {
		t.Fatalf("app handler: %v", err)
	}
	handler, err := server.WithLoader(h)
	if err != nil {
		t.Fatalf("app handler: %v", err)
	}
	s := &testServer{t: t, handler: handler, Version: h.Version}
	s.listen(addr)
	return s
}

// startFiles serves dir with a plain file server (as any static host would).
func startFiles(t *testing.T, dir string) *testServer {
	t.Helper()
	s := &testServer{t: t, handler: http.FileServer(http.Dir(dir))}
	s.listen("127.0.0.1:0")
	return s
}

func (s *testServer) listen(addr string) {
	s.t.Helper()
	var ln net.Listener
	var err error
	// A port just closed can take a moment to be free again.
	for i := 0; i < 50; i++ {
		if ln, err = net.Listen("tcp", addr); err == nil {
			break
		}
		time.Sleep(100 * time.Millisecond)
	}
	if err != nil {
		s.t.Fatalf("listen %s: %v", addr, err)
	}
	s.addr = ln.Addr().String()
	s.srv = &http.Server{Handler: s.handler, ReadHeaderTimeout: 10 * time.Second}
	s.done = make(chan struct{})
	go func() {
		defer close(s.done)
		s.srv.Serve(ln)
	}()
	s.t.Cleanup(s.Stop)
}

// URL returns the origin plus path, e.g. s.URL("/settings").
func (s *testServer) URL(path string) string { return "http://" + s.addr + path }

// Origin returns "http://127.0.0.1:PORT".
func (s *testServer) Origin() string { return "http://" + s.addr }

// Addr returns "127.0.0.1:PORT".
func (s *testServer) Addr() string { return s.addr }

// Stop closes the server and every open connection.
func (s *testServer) Stop() {
	if s.srv == nil {
		return
	}
	s.srv.Close()
	<-s.done
	s.srv = nil
}

// copyWeb returns a new root whose web/ is a copy of the repository's web/
// (with the built app.wasm) plus the extra files given (name → content),
// for example to make a second version.
func copyWeb(t *testing.T, extra map[string]string) string {
	t.Helper()
	root := t.TempDir()
	src := filepath.Join(repoRoot, "web")
	err := filepath.WalkDir(src, func(p string, d fs.DirEntry, err error) error {
		if err != nil {
			return err
		}
		rel, _ := filepath.Rel(src, p)
		dst := filepath.Join(root, "web", rel)
		if d.IsDir() {
			return os.MkdirAll(dst, 0o755)
		}
		b, err := os.ReadFile(p)
		if err != nil {
			return err
		}
		return os.WriteFile(dst, b, 0o644)
	})
	if err != nil {
		t.Fatalf("copy web: %v", err)
	}
	for name, content := range extra {
		if err := os.WriteFile(filepath.Join(root, "web", name), []byte(content), 0o644); err != nil {
			t.Fatal(err)
		}
	}
	return root
}

// ---------------------------------------------------------------------------
// Browser

// browser is one headless Chromium with one tab, a user-data-dir of its own
// (so a second browser on the same dir is a browser restart), and a record
// of every request the page sends.
type browser struct {
	t       *testing.T
	dataDir string
	ctx     context.Context
	cancel  func()

	mu       sync.Mutex
	requests []string
}

// newBrowser starts Chromium on dataDir (use t.TempDir() for a fresh
// profile). The browser fails the test, never skips it, when Chromium is
// missing.
func newBrowser(t *testing.T, dataDir string) *browser {
	t.Helper()
	if err := chromium.Installed(); err != nil {
		t.Fatal(err) // a missing browser fails the tests, never skips them
	}
	allocCtx, cancelAlloc := chromedp.NewExecAllocator(context.Background(), chromium.Options(dataDir)...)
	ctx, cancelCtx := chromedp.NewContext(allocCtx)
	b := &browser{t: t, dataDir: dataDir, ctx: ctx}
	b.cancel = func() { cancelCtx(); cancelAlloc() }
	t.Cleanup(b.Close)
	if err := chromedp.Do(ctx); err != nil { // starts the browser and the tab
		t.Fatalf("starting chromium: %v", err)
	}
	b.listen(ctx)
	b.viewport(1024, 768)
	return b
}

// listen records the URL of every request the tab of ctx sends.
func (b *browser) listen(ctx context.Context) {
	b.t.Helper()
	if err := chromedp.Listen(ctx, func(ev any) {
		if e, ok := ev.(*network.EventRequestWillBeSent); ok && e.Request != nil {
			b.mu.Lock()
			b.requests = append(b.requests, e.Request.URL)
			b.mu.Unlock()
		}
	}); err != nil {
		b.t.Fatalf("listen: %v", err)
	}
	if _, err := chromedp.Call(ctx, network.Enable, network.EnableParams{}); err != nil {
		b.t.Fatalf("network.enable: %v", err)
	}
}

// Close stops the browser (its profile stays on disk).
func (b *browser) Close() {
	if b.cancel != nil {
		b.cancel()
		b.cancel = nil
	}
}

// run runs actions on the tab with a time limit.
func (b *browser) run(timeout time.Duration, actions ...chromedp.Action[chromedp.Void]) error {
	ctx, cancel := context.WithTimeout(b.ctx, timeout)
	defer cancel()
	return chromedp.Do(ctx, actions...)
}

// must runs actions and fails the test on error.
func (b *browser) must(what string, actions ...chromedp.Action[chromedp.Void]) {
	b.t.Helper()
	if err := b.run(60*time.Second, actions...); err != nil {
		b.t.Fatalf("%s: %v", what, err)
	}
}

// viewport sets the page size in CSS pixels.
func (b *browser) viewport(w, h int64) {
	b.t.Helper()
	b.must(fmt.Sprintf("viewport %dx%d", w, h), chromedp.EmulateViewport(w, h))
}

// open navigates to url and waits for the wasm app to mount.
func (b *browser) open(url string) {
	b.t.Helper()
	b.must("navigate "+url, chromedp.Navigate(url))
	b.waitReady()
}

// reload reloads the page and waits for the wasm app to mount.
func (b *browser) reload() {
	b.t.Helper()
	b.must("reload", chromedp.Reload())
	b.waitReady()
}

// waitReady waits for the marker the frame sets in OnMount: the prerendered
// page already holds the text, so only the marker proves app.wasm runs.
func (b *browser) waitReady() {
	b.t.Helper()
	// waitFor polls again when a navigation replaces the page's JavaScript
	// context in the middle of a poll (the service worker's first install
	// and go-app's loader can both do that).
	b.waitFor("the wasm app", fmt.Sprintf(`document.documentElement.getAttribute(%q) === "wasm"`, ui.ReadyAttr), 60*time.Second)
}

// waitFor waits until the JavaScript expression is truthy. It keeps
// waiting across page loads (a reload in between starts a new poll).
func (b *browser) waitFor(what, expr string, timeout time.Duration) {
	b.t.Helper()
	deadline := time.Now().Add(timeout)
	for {
		left := time.Until(deadline)
		if left <= 0 {
			left = time.Millisecond
		}
		err := b.run(left+5*time.Second, chromedp.Poll[chromedp.Void](expr, chromedp.WithPollingTimeout(left), chromedp.WithPollingInterval(100*time.Millisecond)))
		if err == nil {
			return
		}
		if time.Now().After(deadline) {
			b.t.Fatalf("waiting for %s (%s): %v", what, expr, err)
		}
		time.Sleep(100 * time.Millisecond)
	}
}

// waitControlled waits until the service worker controls the page (after the
// first visit it has precached every resource).
func (b *browser) waitControlled() {
	b.t.Helper()
	b.waitFor("the service worker to control the page", `navigator.serviceWorker.controller !== null`, 60*time.Second)
}

// eval evaluates expr and decodes its JSON value into T.
func eval[T any](b *browser, expr string) T {
	b.t.Helper()
	for attempt := 0; ; attempt++ {
		ctx, cancel := context.WithTimeout(b.ctx, 60*time.Second)
		v, err := chromedp.Run(ctx, chromedp.Evaluate[T](expr, chromedp.EvalAwaitPromise))
		cancel()
		if err == nil {
			return v
		}
		// A page load that replaces the JavaScript context between two
		// steps is not a failure of what is being checked: evaluate again
		// in the new page, a few times at most.
		if attempt < 5 && contextReplaced(err) {
			time.Sleep(100 * time.Millisecond)
			continue
		}
		b.t.Fatalf("eval %s: %v", expr, err)
	}
}

// contextReplaced tells whether err says the page's JavaScript context
// went away under an evaluation (a navigation or reload in between).
func contextReplaced(err error) bool {
	msg := err.Error()
	return strings.Contains(msg, "Cannot find context with specified id") ||
		strings.Contains(msg, "Execution context was destroyed") ||
		strings.Contains(msg, "Inspected target navigated or closed")
}

// text returns the trimmed textContent of the element with the CSS
// selector, or "" when there is none.
func (b *browser) text(sel string) string {
	b.t.Helper()
	return eval[string](b, fmt.Sprintf(`(document.querySelector(%q)?.textContent ?? "").trim()`, sel))
}

// value returns the value of the input with the CSS selector.
func (b *browser) value(sel string) string {
	b.t.Helper()
	return eval[string](b, fmt.Sprintf(`document.querySelector(%q)?.value ?? ""`, sel))
}

// exists reports whether an element matches the CSS selector.
func (b *browser) exists(sel string) bool {
	b.t.Helper()
	return eval[bool](b, fmt.Sprintf(`document.querySelector(%q) !== null`, sel))
}

// typeInto replaces the content of the input with the CSS selector by
// typing text as a person would (one key event per character).
func (b *browser) typeInto(sel, text string) {
	b.t.Helper()
	b.must("tap "+sel, chromedp.Click(chromedp.CSS(sel)))
	// Select what is there so the first key replaces it, as a person would.
	eval[bool](b, fmt.Sprintf(`(() => { const e = document.querySelector(%q); e.focus(); e.select(); return true })()`, sel))
	if text == "" {
		b.must("clear "+sel, chromedp.SendKeys(chromedp.CSS(sel), "\b"))
		return
	}
	b.must("type into "+sel, chromedp.SendKeys(chromedp.CSS(sel), text))
}

// tap clicks the element with the CSS selector.
func (b *browser) tap(sel string) {
	b.t.Helper()
	b.must("tap "+sel, chromedp.Click(chromedp.CSS(sel)))
}

// setOffline cuts (or restores) the network for the page and its service
// worker, as the device losing its connection.
func (b *browser) setOffline(offline bool) {
	b.t.Helper()
	conditions := []*network.Conditions{{Offline: offline, DownloadThroughput: -1, UploadThroughput: -1}}
	if _, err := chromedp.Call(b.ctx, network.EmulateNetworkConditionsByRule, network.EmulateNetworkConditionsByRuleParams{
		EmulateOfflineServiceWorker: &offline,
		MatchedNetworkConditions:    conditions,
	}); err != nil {
		b.t.Fatalf("network conditions: %v", err)
	}
	if _, err := chromedp.Call(b.ctx, network.OverrideNetworkState, network.OverrideNetworkStateParams{
		Offline: offline, DownloadThroughput: -1, UploadThroughput: -1,
	}); err != nil {
		b.t.Fatalf("network state: %v", err)
	}
}

// requestsNotFrom returns every recorded request URL that is not on origin
// (data: and blob: URLs are local and allowed).
func (b *browser) requestsNotFrom(origin string) []string {
	b.mu.Lock()
	defer b.mu.Unlock()
	var out []string
	for _, u := range b.requests {
		if strings.HasPrefix(u, origin+"/") || u == origin || strings.HasPrefix(u, "data:") || strings.HasPrefix(u, "blob:") {
			continue
		}
		out = append(out, u)
	}
	return out
}

// requestCount returns how many requests the page has sent so far.
func (b *browser) requestCount() int {
	b.mu.Lock()
	defer b.mu.Unlock()
	return len(b.requests)
}

// screenshot writes a full-page PNG to testoutput/screenshots/NAME-WxH.png
// at the given viewport size, and restores 1024×768.
func (b *browser) screenshot(name string, w, h int64) string {
	b.t.Helper()
	b.viewport(w, h)
	defer b.viewport(1024, 768)
	// Let layout settle after the resize.
	eval[chromedp.Void](b, `new Promise(r => requestAnimationFrame(() => requestAnimationFrame(() => r())))`)
	ctx, cancel := context.WithTimeout(b.ctx, 60*time.Second)
	defer cancel()
	png, err := chromedp.Run(ctx, chromedp.FullScreenshot(100))
	if err != nil {
		b.t.Fatalf("screenshot %s: %v", name, err)
	}
	dir := filepath.Join(repoRoot, "testoutput", "screenshots")
	if err := os.MkdirAll(dir, 0o755); err != nil {
		b.t.Fatal(err)
	}
	path := filepath.Join(dir, fmt.Sprintf("%s-%dx%d.png", name, w, h))
	if err := os.WriteFile(path, png, 0o644); err != nil {
		b.t.Fatal(err)
	}
	return path
}

// axeViolation is one serious or critical finding of axe-core.
type axeViolation struct {
	ID     string   `json:"id"`
	Impact string   `json:"impact"`
	Help   string   `json:"help"`
	Nodes  []string `json:"nodes"`
}

// axeJS is axe-core's script, installed by make test (pinned in the
// Makefile) into .tools/.
func axeJS(t *testing.T) string {
	t.Helper()
	path := filepath.Join(repoRoot, ".tools", "node_modules", "axe-core", "axe.min.js")
	b, err := os.ReadFile(path)
	if err != nil {
		t.Fatalf("axe-core is required (make test installs it): %v", err)
	}
	return string(b)
}

// axe injects axe-core into the page (no network request) and returns the
// serious and critical violations of the WCAG 2.1 A and AA rules.
func (b *browser) axe() []axeViolation {
	b.t.Helper()
	src := axeJS(b.t)
	if !eval[bool](b, `typeof window.axe === "object"`) {
		eval[chromedp.Void](b, src+"\n;void 0")
	}
	raw := eval[string](b, `axe.run(document, {runOnly: {type: "tag", values: ["wcag2a", "wcag2aa", "wcag21a", "wcag21aa"]}}).then(r => JSON.stringify(
		r.violations
			.filter(v => v.impact === "serious" || v.impact === "critical")
			.map(v => ({id: v.id, impact: v.impact, help: v.help, nodes: v.nodes.map(n => n.target.join(" "))}))))`)
	var out []axeViolation
	if err := json.Unmarshal([]byte(raw), &out); err != nil {
		b.t.Fatalf("axe result: %v", err)
	}
	return out
}

// unitsConvert asks GNU units (an external oracle) to convert "250 psi" to
// "bar" and returns the number it prints.
func unitsConvert(t *testing.T, from, to string) string {
	t.Helper()
	out, err := exec.Command("units", "-t", from, to).Output()
	if err != nil {
		t.Fatalf("GNU units %q → %q: %v (make test installs units)", from, to, err)
	}
	return strings.TrimSpace(string(out))
}
