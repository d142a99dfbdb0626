//go:build !wasm

package main

import (
	"bufio"
	"fmt"
	"io"
	"net"
	"os"
	"os/exec"
	"path/filepath"
	"regexp"
	"strconv"
	"strings"
	"sync/atomic"
	"time"

	"alvea/app/internal/chromium"
	"alvea/app/server"
)

// The flags of the Makefile's builds: the same for Alvea and the floor.
var buildFlags = chromium.WasmBuildFlags

const buildFlagsText = `-trimpath -ldflags="-s -w"`

// program is one of the two programs measured: its root (web/ with
// app.wasm) and its native binary, which serves root.
type program struct {
	Name  string
	Root  string
	Bin   string
	Serve func(addr string) []string // the binary's arguments to serve on addr

	wasmRaw      int64
	res          *server.Resources
	proc         *exec.Cmd
	backend      string // address the binary listens on
	proxy        net.Listener
	bytesWritten atomic.Int64 // bytes sent to the browser through the proxy
	origin       string       // the proxy's origin, which the browser visits
}

func buildBoth(repo, work string) (*program, *program, error) {
	alvea := &program{Name: "Alvea", Root: filepath.Join(work, "alvea"), Bin: filepath.Join(work, "alvea", "alvea"),
		Serve: func(addr string) []string {
			return []string{"serve", "-addr", addr, "-root", filepath.Join(work, "alvea")}
		}}
	floor := &program{Name: "floor", Root: filepath.Join(work, "floor"), Bin: filepath.Join(work, "floor", "floor"),
		Serve: func(addr string) []string { return []string{"-addr", addr, "-root", filepath.Join(work, "floor")} }}
	for _, p := range []*program{alvea, floor} {
		if err := os.MkdirAll(filepath.Join(p.Root, "web"), 0o755); err != nil {
			return nil, nil, err
		}
	}
	builds := []struct {
		out, pkg string
		wasm     bool
	}{
		{filepath.Join(alvea.Root, "web", "app.wasm"), "./app", true},
		{alvea.Bin, "./app", false},
		{filepath.Join(floor.Root, "web", "app.wasm"), "./testdata/floor", true},
		{floor.Bin, "./testdata/floor", false},
	}
	for _, b := range builds {
		args := append([]string{"build"}, buildFlags...)
		if b.wasm && *briefProf != "" {
			// Keep the names of functions, for the profile.
			args = []string{"build", "-trimpath"}
		}
		args = append(args, "-o", b.out, b.pkg)
		cmd := exec.Command("go", args...)
		cmd.Dir = repo
		cmd.Env = os.Environ()
		if b.wasm {
			cmd.Env = append(cmd.Env, "GOOS=js", "GOARCH=wasm")
		}
		if out, err := cmd.CombinedOutput(); err != nil {
			return nil, nil, fmt.Errorf("go %s: %v\n%s", strings.Join(args, " "), err, out)
		}
	}
	// Alvea's web assets (styles, scripts, icons) beside its app.wasm; the
	// floor gets the icons only (go-app's worker precaches them).
	entries, err := os.ReadDir(filepath.Join(repo, "web"))
	if err != nil {
		return nil, nil, err
	}
	for _, e := range entries {
		name := e.Name()
		if e.IsDir() || strings.HasPrefix(name, ".") || strings.HasPrefix(name, "app.wasm") {
			continue
		}
		if err := copyFile(filepath.Join(alvea.Root, "web", name), filepath.Join(repo, "web", name)); err != nil {
			return nil, nil, err
		}
		if strings.HasPrefix(name, "icon-") && strings.HasSuffix(name, ".png") {
			if err := copyFile(filepath.Join(floor.Root, "web", name), filepath.Join(repo, "web", name)); err != nil {
				return nil, nil, err
			}
		}
	}
	return alvea, floor, nil
}

func copyFile(dst, src string) error {
	b, err := os.ReadFile(src)
	if err != nil {
		return err
	}
	return os.WriteFile(dst, b, 0o644)
}

func toolchain() string {
	out, err := exec.Command("go", "version").Output()
	if err != nil {
		return "go (version unknown)"
	}
	return strings.TrimSpace(string(out))
}

// sizes reads app.wasm and its compressed copies for both programs (the
// copies the server sends: brotli quality 11, gzip level 9).
func sizes(alvea, floor *program, r *report) error {
	for _, p := range []*program{alvea, floor} {
		res, err := server.NewResources(p.Root)
		if err != nil {
			return err
		}
		if err := res.Wait(); err != nil {
			return err
		}
		p.res = res
		st, err := os.Stat(filepath.Join(p.Root, "web", "app.wasm"))
		if err != nil {
			return err
		}
		p.wasmRaw = st.Size()
	}
	size := func(p *program, enc string) float64 {
		for _, e := range server.Encodings {
			if e.Name == enc {
				b, _ := p.res.Copy(e)
				return float64(len(b))
			}
		}
		return 0
	}
	r.add(section("app.wasm size (bytes)"))
	r.add(row{Name: "raw", Unit: "B", A: one(float64(alvea.wasmRaw)), F: one(float64(floor.wasmRaw))})
	r.add(row{Name: "gzip (level 9)", Unit: "B", A: one(size(alvea, "gzip")), F: one(size(floor, "gzip"))})
	br := row{Name: "brotli (quality 11)", Unit: "B", A: one(size(alvea, "br")), F: one(size(floor, "br"))}
	br.Budget = &budget{Text: "≤ 1.15 × floor", Met: br.A.Median <= 1.15*br.F.Median}
	r.add(br)
	return nil
}

var servingRE = regexp.MustCompile(`serving on http://(\S+)`)

// start runs the program's server on a free loopback port and puts a
// counting proxy in front of it: every byte the browser receives is
// counted there, compressed or not, from the page or its service worker.
func (p *program) start() error {
	cmd := exec.Command(p.Bin, p.Serve("127.0.0.1:0")...)
	stdout, err := cmd.StdoutPipe()
	if err != nil {
		return err
	}
	cmd.Stderr = os.Stderr
	if err := cmd.Start(); err != nil {
		return err
	}
	p.proc = cmd
	found := make(chan string, 1)
	go func() {
		sc := bufio.NewScanner(stdout)
		for sc.Scan() {
			if m := servingRE.FindStringSubmatch(sc.Text()); m != nil {
				select {
				case found <- m[1]:
				default:
				}
			}
		}
	}()
	select {
	case p.backend = <-found:
	case <-time.After(60 * time.Second):
		p.stop()
		return fmt.Errorf("%s: the server did not start", p.Name)
	}
	ln, err := net.Listen("tcp", "127.0.0.1:0")
	if err != nil {
		p.stop()
		return err
	}
	p.proxy = ln
	p.origin = "http://" + ln.Addr().String()
	go p.forward()
	return nil
}

func (p *program) forward() {
	for {
		c, err := p.proxy.Accept()
		if err != nil {
			return
		}
		go func() {
			defer c.Close()
			b, err := net.Dial("tcp", p.backend)
			if err != nil {
				return
			}
			defer b.Close()
			go func() {
				io.Copy(b, c)
				b.(*net.TCPConn).CloseWrite()
			}()
			n, _ := io.Copy(countingWriter{c, &p.bytesWritten}, b)
			_ = n
		}()
	}
}

type countingWriter struct {
	w io.Writer
	n *atomic.Int64
}

func (c countingWriter) Write(b []byte) (int, error) {
	n, err := c.w.Write(b)
	c.n.Add(int64(n))
	return n, err
}

func (p *program) stop() {
	if p.proxy != nil {
		p.proxy.Close()
		p.proxy = nil
	}
	if p.proc != nil && p.proc.Process != nil {
		p.proc.Process.Kill()
		p.proc.Wait()
		p.proc = nil
	}
}

// engineSize builds testdata/engine (the floor with Alvea's engine linked
// in: physio, the vault in IndexedDB, bundles and the audit; no screen)
// with the same flags, and adds its app.wasm brotli size beside the
// floor's: what the computation alone weighs, against the size budget.
func engineSize(repo, work string, alvea, floor *program, r *report) error {
	root := filepath.Join(work, "engine")
	if err := os.MkdirAll(filepath.Join(root, "web"), 0o755); err != nil {
		return err
	}
	args := append([]string{"build"}, buildFlags...)
	args = append(args, "-o", filepath.Join(root, "web", "app.wasm"), "./testdata/engine")
	cmd := exec.Command("go", args...)
	cmd.Dir = repo
	cmd.Env = append(os.Environ(), "GOOS=js", "GOARCH=wasm")
	if out, err := cmd.CombinedOutput(); err != nil {
		return fmt.Errorf("go %s: %v\n%s", strings.Join(args, " "), err, out)
	}
	res, err := server.NewResources(root)
	if err != nil {
		return err
	}
	if err := res.Wait(); err != nil {
		return err
	}
	var engine, fl, al []byte
	for _, e := range server.Encodings {
		if e.Name == "br" {
			engine, _ = res.Copy(e)
			fl, _ = floor.res.Copy(e)
			al, _ = alvea.res.Copy(e)
		}
	}
	if len(engine) == 0 || len(fl) == 0 || len(al) == 0 {
		return fmt.Errorf("no brotli copy of app.wasm for the engine, the floor or Alvea")
	}
	r.add(row{Name: "brotli: the floor with Alvea's engine and no screen (testdata/engine)", Unit: "B", A: one(float64(len(engine))), F: one(float64(len(fl)))})
	ratio := float64(len(engine)) / float64(len(fl))
	room := "leaving " + strconv.Itoa(int(1.15*float64(len(fl)))-len(engine)) + " B brotli for the six screens"
	if ratio > 1.15 {
		room = "so the size budget (1.15 × the floor) is below what the engine alone weighs, before any screen"
	}
	r.note("Size: testdata/engine is the floor with Alvea's engine linked in (physio's plan, the vault in IndexedDB, bundles, the audit) and none of its screens. Its app.wasm is %.2f × the floor's in brotli, %s. Alvea adds %d B brotli over the floor, %d B of it over the engine alone (the screens).",
		ratio, room, len(al)-len(fl), len(al)-len(engine))
	return nil
}
