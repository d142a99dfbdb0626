//go:build !wasm

package main

import (
	"fmt"
	"os"
	"os/exec"
	"path/filepath"
	"regexp"
	"strconv"
	"strings"
)

// nativeFigures runs the packages' own benchmarks (go test -bench) and
// puts their ns/op in the table: the vault's (unlock at the default key
// derivation, append one record, open and list 10 000 records), the
// Brief's recompute, physio's and the plan's.
func nativeFigures(repo string, r *report) error {
	groups := []struct {
		title, pkg, pattern string
		wasm                bool
	}{
		{"app/logbook benchmarks, native: the vault and the audit", "./app/logbook", ".", false},
		{"app/ui benchmarks, native", "./app/ui", ".", false},
		{"physio and plan benchmarks, native", "./physio", ".", false},
		// The same Go code compiled to wasm and run by Node's V8 (the
		// engine Chromium uses), without the browser and its throttle: a
		// steadier figure for the Brief's own work per keystroke than the
		// browser's latency, which also holds go-app's event handling, the
		// page's write and V8's tier-up. (BriefKeystroke needs go-app's
		// test engine, which in wasm wants a page: it stays native.)
		{"the Brief and the plan in wasm (Node's V8, no throttle)", "./app/ui", "Brief(Read|Pack|KeystrokeDirect|Recompute)$", true},
		{"the plan in wasm (Node's V8, no throttle)", "./physio", "ComputePlan$", true},
	}
	for _, g := range groups {
		progress("go test -bench %s %s (wasm: %v)", g.pattern, g.pkg, g.wasm)
		cmd := exec.Command("go", "test", "-run", "^$", "-bench", g.pattern, "-benchmem", "-count", "1", g.pkg)
		cmd.Dir = repo
		if g.wasm {
			env, err := wasmTestEnv()
			if err != nil {
				return err
			}
			cmd.Env = env
		}
		out, err := cmd.CombinedOutput()
		if err != nil {
			return fmt.Errorf("go test -bench %s: %v\n%s", g.pkg, err, out)
		}
		results := parseBench(string(out))
		if len(results) == 0 {
			return fmt.Errorf("go test -bench %s: no benchmark results\n%s", g.pkg, out)
		}
		r.add(section(g.title))
		for _, b := range results {
			x := row{Name: b.name, Unit: "ns/op", A: one(b.nsPerOp)}
			switch b.name {
			case "Unlock":
				x.Note = "Argon2id, default strength"
			case "OpenAndList10000":
				x.Note = "10 000 records"
			}
			r.add(x)
		}
	}
	return nil
}

// wasmTestEnv is the environment that runs go test's wasm binaries under
// Node, with the Go toolchain's own runner (GOROOT/lib/wasm).
func wasmTestEnv() ([]string, error) {
	if _, err := exec.LookPath("node"); err != nil {
		return nil, fmt.Errorf("node is required for the wasm benchmarks (make bench installs it): %w", err)
	}
	out, err := exec.Command("go", "env", "GOROOT").Output()
	if err != nil {
		return nil, fmt.Errorf("go env GOROOT: %w", err)
	}
	runner := filepath.Join(strings.TrimSpace(string(out)), "lib", "wasm")
	return append(os.Environ(), "GOOS=js", "GOARCH=wasm", "PATH="+runner+string(os.PathListSeparator)+os.Getenv("PATH")), nil
}

type benchResult struct {
	name    string
	nsPerOp float64
}

var benchLine = regexp.MustCompile(`^Benchmark(\S+?)(?:-\d+)?\s+\d+\s+([0-9.]+) ns/op`)

func parseBench(out string) []benchResult {
	var res []benchResult
	for _, line := range strings.Split(out, "\n") {
		m := benchLine.FindStringSubmatch(strings.TrimSpace(line))
		if m == nil {
			continue
		}
		v, err := strconv.ParseFloat(m[2], 64)
		if err != nil {
			continue
		}
		res = append(res, benchResult{name: m[1], nsPerOp: v})
	}
	return res
}
