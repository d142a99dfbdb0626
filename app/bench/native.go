//go:build !wasm

package main

import (
	"fmt"
	"os/exec"
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
	}{
		{"app/logbook benchmarks, native: the vault and the audit", "./app/logbook", "."},
		{"app/ui benchmarks, native", "./app/ui", "."},
		{"physio and plan benchmarks, native", "./physio", "."},
	}
	for _, g := range groups {
		progress("go test -bench %s %s", g.pattern, g.pkg)
		cmd := exec.Command("go", "test", "-run", "^$", "-bench", g.pattern, "-benchmem", "-count", "1", g.pkg)
		cmd.Dir = repo
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
