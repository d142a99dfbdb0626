//go:build !wasm

package main

import (
	"encoding/binary"
	"errors"
	"fmt"
	"os"
	"os/exec"
	"path/filepath"
	"strings"
)

// Where the size goes: app.wasm built once more without -s (so it keeps
// its "name" section), its function bodies summed by Go package. `go tool
// nm` does not read wasm, so the module is read here: the import section
// (imported functions come first in the function index space), the code
// section (one body per defined function) and the name section's function
// names (WebAssembly Core Specification §5.5 and Appendix 7.4).

// codeGroups maps a prefix of the mangled function name (the Go linker
// writes "alvea/app/ui.(*brief).Render" as "alvea_app_ui.__brief_.Render")
// to a row of the table. The first match wins.
var codeGroups = []struct{ prefix, name string }{
	{"alvea_app_ui.", "alvea/app/ui"},
	{"alvea_app_logbook_idb.", "alvea/app/logbook/idb"},
	{"alvea_app_logbook.", "alvea/app/logbook"},
	{"alvea_physio.", "alvea/physio"},
	{"github.com_maxence_charriere_go_app", "go-app"},
	{"github.com_shopspring_decimal", "shopspring/decimal"},
	{"golang.org_x_crypto", "golang.org/x/crypto"},
	{"runtime.", "Go runtime"},
	{"internal_runtime", "Go runtime"},
}

const otherGroup = "the rest (standard library, main, generated)"

// codeByGroup builds pkg for js/wasm keeping names and returns the bytes
// of function bodies per group, and the size of the data section.
func codeByGroup(repo, work, pkg string) (map[string]int, int, error) {
	out := filepath.Join(work, "named-"+filepath.Base(pkg)+".wasm")
	cmd := exec.Command("go", "build", "-trimpath", "-o", out, pkg)
	cmd.Dir = repo
	cmd.Env = append(os.Environ(), "GOOS=js", "GOARCH=wasm")
	if b, err := cmd.CombinedOutput(); err != nil {
		return nil, 0, fmt.Errorf("go build %s: %v\n%s", pkg, err, b)
	}
	mod, err := os.ReadFile(out)
	if err != nil {
		return nil, 0, err
	}
	bodies, names, imported, data, err := readWasm(mod)
	if err != nil {
		return nil, 0, fmt.Errorf("%s: %w", out, err)
	}
	groups := map[string]int{}
	for i, size := range bodies {
		name := names[imported+i]
		g := otherGroup
		for _, c := range codeGroups {
			if strings.HasPrefix(name, c.prefix) {
				g = c.name
				break
			}
		}
		groups[g] += size
	}
	return groups, data, nil
}

// readWasm returns the body size of each defined function, the function
// names by index, the number of imported functions and the size of the
// data section.
func readWasm(b []byte) (bodies []int, names map[int]string, imported, data int, err error) {
	if len(b) < 8 || string(b[:4]) != "\x00asm" {
		return nil, nil, 0, 0, errors.New("not a wasm module")
	}
	b = b[:len(b):len(b)] // reading past the end panics (and is reported)
	names = map[int]string{}
	bad := errors.New("malformed wasm module")
	i := 8
	uleb := func(at *int) int {
		v, n := binary.Uvarint(b[*at:])
		if n <= 0 {
			panic(bad)
		}
		*at += n
		return int(v)
	}
	defer func() {
		if r := recover(); r != nil {
			err = bad
		}
	}()
	for i < len(b) {
		id := b[i]
		i++
		size := uleb(&i)
		end := i + size
		if end > len(b) {
			return nil, nil, 0, 0, bad
		}
		j := i
		switch id {
		case 2: // imports: module name, field name, kind, description
			for n := uleb(&j); n > 0; n-- {
				j += uleb(&j)
				j += uleb(&j)
				kind := b[j]
				j++
				switch kind {
				case 0: // function: type index
					uleb(&j)
					imported++
				case 1: // table: element type, limits
					j++
					flags := b[j]
					j++
					uleb(&j)
					if flags&1 == 1 {
						uleb(&j)
					}
				case 2: // memory: limits
					flags := b[j]
					j++
					uleb(&j)
					if flags&1 == 1 {
						uleb(&j)
					}
				case 3: // global: value type, mutability
					j += 2
				}
			}
		case 10: // code
			for n := uleb(&j); n > 0; n-- {
				l := uleb(&j)
				bodies = append(bodies, l)
				j += l
			}
		case 11:
			data = size
		case 0: // custom
			l := uleb(&j)
			custom := string(b[j : j+l])
			j += l
			if custom != "name" {
				break
			}
			for j < end {
				sub := b[j]
				j++
				sz := uleb(&j)
				if sub == 1 { // function names
					k := j
					for n := uleb(&k); n > 0; n-- {
						idx := uleb(&k)
						l := uleb(&k)
						names[idx] = string(b[k : k+l])
						k += l
					}
				}
				j += sz
			}
		}
		i = end
	}
	return bodies, names, imported, data, nil
}

// codeSizes adds the table of code by package for both programs.
func codeSizes(repo, work string, r *report) error {
	a, aData, err := codeByGroup(repo, work, "./app")
	if err != nil {
		return err
	}
	f, fData, err := codeByGroup(repo, work, "./testdata/floor")
	if err != nil {
		return err
	}
	r.add(section("where app.wasm's size goes: function code by package, bytes (a build keeping names)"))
	seen := map[string]bool{}
	for _, g := range codeGroups {
		if seen[g.name] {
			continue
		}
		seen[g.name] = true
		x := row{Name: g.name, Unit: "B", A: one(float64(a[g.name]))}
		if f[g.name] > 0 {
			x.F = one(float64(f[g.name]))
		}
		r.add(x)
	}
	r.add(row{Name: otherGroup, Unit: "B", A: one(float64(a[otherGroup])), F: one(float64(f[otherGroup]))})
	r.add(row{Name: "data section (strings, type and function tables)", Unit: "B", A: one(float64(aData)), F: one(float64(fData))})
	return nil
}
