//go:build !wasm

// Command bench measures Alvea against the go-app floor (testdata/floor: a
// program with one heading and nothing else) and checks the budgets of the
// speed and size issue. It builds both with the flags make uses, in one
// run, then measures:
//
//   - app.wasm raw, gzip and brotli (the copies the server sends), and the
//     brotli size of testdata/engine, the floor with Alvea's engine (physio,
//     the vault, bundles, the audit) linked in and no screen: what the
//     computation alone weighs against the floor;
//   - the bytes a first visit transfers (counted on the wire, the service
//     worker's precache included);
//   - first visit and warm start (a reload served by the service worker) to
//     interactive, in headless Chromium at 1x and 4x CPU throttle;
//   - the Brief's recompute latency while typing, at 4x;
//   - the vault in Chromium (unlock, append one record, open and list
//     10 000 records) and natively (go test -bench in app/logbook);
//   - the physio and plan benchmarks (go test -bench), and the Brief's and
//     the plan's also compiled to wasm and run by Node's V8 (no browser).
//
// It prints a markdown table with each figure for both programs and the
// ratio Alvea / floor, and writes it to dist/bench.md. Timings are
// medians with their min and max; nothing here is a pass/fail test. Run it
// with make bench (go run ./app/bench).
package main

import (
	"errors"
	"flag"
	"fmt"
	"os"
	"path/filepath"
	"strings"
	"time"

	"alvea/app/internal/chromium"
)

var (
	runs      = flag.Int("runs", 5, "runs of each start-up timing (at least 5 for the report)")
	out       = flag.String("out", "dist/bench.md", "markdown file to write")
	samples   = flag.Int("samples", 60, "keystrokes timed in the Brief")
	records   = flag.Int("records", 10000, "records in the vault listed in Chromium")
	skipNat   = flag.Bool("skip-native", false, "leave out the go test -bench figures")
	skipWeb   = flag.Bool("skip-browser", false, "leave out the Chromium figures")
	keepWork  = flag.Bool("keep", false, "keep the build directory (its path is printed)")
	probeWait = flag.Int("probe", -1, "print the phases of warm starts, reloads this many seconds apart, and stop (-1: off)")
	briefProf = flag.String("brief-profile", "", "write a CPU profile of the Brief's timed keystrokes to this file (.cpuprofile, for DevTools; the profiler slows the page, so its timings are not reported then)")
	only      = flag.String("only", "", "measure only these parts, comma-separated: sizes, start, brief, vault, native (all when empty; the report then covers only those)")
)

// parts is the set named by -only; wants reports whether part is measured.
var parts = map[string]bool{}

func wants(part string) bool { return len(parts) == 0 || parts[part] }

func parseOnly() error {
	if *only == "" {
		return nil
	}
	for _, p := range strings.Split(*only, ",") {
		switch p = strings.TrimSpace(p); p {
		case "sizes", "start", "brief", "vault", "native":
			parts[p] = true
		default:
			return fmt.Errorf("-only: unknown part %q (allowed: sizes, start, brief, vault, native)", p)
		}
	}
	return nil
}

func main() {
	flag.Parse()
	if err := run(); err != nil {
		fmt.Fprintln(os.Stderr, "bench:", err)
		os.Exit(1)
	}
}

func run() error {
	if *runs < 1 {
		return errors.New("-runs must be at least 1")
	}
	if err := parseOnly(); err != nil {
		return err
	}
	repo, err := chromium.RepoRoot()
	if err != nil {
		return err
	}
	work, err := os.MkdirTemp("", "alvea-bench-")
	if err != nil {
		return err
	}
	if *keepWork {
		fmt.Fprintln(os.Stderr, "bench: work directory", work)
	} else {
		defer os.RemoveAll(work)
	}

	r := &report{Started: time.Now(), Runs: *runs}
	progress("building Alvea and the floor (%s)", buildFlagsText)
	alvea, floor, err := buildBoth(repo, work)
	if err != nil {
		return err
	}
	r.Toolchain = toolchain()
	if *probeWait >= 0 {
		for _, p := range []*program{alvea, floor} {
			if err := probePhases(p, 1, time.Duration(*probeWait)*time.Second); err != nil {
				return err
			}
		}
		return nil
	}
	if wants("sizes") {
		progress("compressing app.wasm (cached by content after the first time)")
		if err := sizes(alvea, floor, r); err != nil {
			return err
		}
		progress("building the floor with Alvea's engine and no screen")
		if err := engineSize(repo, work, alvea, floor, r); err != nil {
			return err
		}
		progress("reading where the size goes (builds keeping names)")
		if err := codeSizes(repo, work, r); err != nil {
			return err
		}
	}

	if !*skipWeb && (wants("start") || wants("brief") || wants("vault")) {
		if err := browserFigures(alvea, floor, r); err != nil {
			return err
		}
	}
	if !*skipNat && wants("native") {
		if err := nativeFigures(repo, r); err != nil {
			return err
		}
	}

	r.note("Budgets are read as: sizes on the one build; first-visit transfer and the 10 000-record list on the slowest run (max); start-up on the ratio of the medians; the Brief on the 95th percentile (nearest rank) of its keystrokes, timed to the result panel settled; unlock on the median, \"about 1 s\" taken as at most 1.5 s, at the default key derivation (never lowered for the bench).")
	md := r.markdown()
	fmt.Print(md)
	path := *out
	if !filepath.IsAbs(path) {
		path = filepath.Join(repo, path)
	}
	if err := os.MkdirAll(filepath.Dir(path), 0o755); err != nil {
		return err
	}
	if err := os.WriteFile(path, []byte(md), 0o644); err != nil {
		return err
	}
	fmt.Fprintln(os.Stderr, "bench: wrote", path)
	return nil
}

func progress(format string, args ...any) {
	fmt.Fprintf(os.Stderr, "bench: "+format+"\n", args...)
}
