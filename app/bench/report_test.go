//go:build !wasm

package main

import (
	"strings"
	"testing"
)

// The nearest-rank percentile, checked against the worked example of the
// nearest-rank method in Wikipedia's "Percentile" article (ordered list
// 15, 20, 35, 40, 50: the 5th, 30th, 40th, 50th and 100th percentiles are
// 15, 20, 20, 35 and 50; recalled from memory of the article).
func TestPercentileNearestRank(t *testing.T) {
	list := []float64{50, 15, 40, 20, 35} // unordered on purpose
	for _, c := range []struct{ p, want float64 }{{5, 15}, {30, 20}, {40, 20}, {50, 35}, {100, 50}} {
		if got := percentile(list, c.p); got != c.want {
			t.Errorf("P%g = %g, want %g", c.p, got, c.want)
		}
	}
}

// The median of an even count is the mean of the middle two (the usual
// definition, e.g. NIST/SEMATECH e-Handbook §1.3.5.1, from memory); min and max as
// given.
func TestSummary(t *testing.T) {
	s := summary([]float64{4, 1, 3, 2})
	if s.Median != 2.5 || s.Min != 1 || s.Max != 4 || s.N != 4 {
		t.Errorf("summary = %+v", s)
	}
	if s := summary([]float64{7, 1, 5}); s.Median != 5 {
		t.Errorf("odd median = %g, want 5", s.Median)
	}
	if s := summary(nil); s.Set {
		t.Error("an empty summary is set")
	}
}

// go test -bench lines as the testing package prints them (name, -GOMAXPROCS
// suffix, iterations, ns/op, then -benchmem columns).
func TestParseBench(t *testing.T) {
	out := `goos: linux
goarch: amd64
pkg: alvea/physio
cpu: AMD EPYC
BenchmarkComputePlan-2   	   14082	     85467 ns/op	   31720 B/op	     612 allocs/op
BenchmarkSaturation-2    	201216552	         5.946 ns/op	       0 B/op	       0 allocs/op
BenchmarkUnlock          	       2	 526597165 ns/op
PASS
ok  	alvea/physio	12.1s`
	got := parseBench(out)
	want := []benchResult{{"ComputePlan", 85467}, {"Saturation", 5.946}, {"Unlock", 526597165}}
	if len(got) != len(want) {
		t.Fatalf("parsed %v, want %v", got, want)
	}
	for i := range want {
		if got[i] != want[i] {
			t.Errorf("line %d: %+v, want %+v", i, got[i], want[i])
		}
	}
}

// The table marks each budget met or not met and gives the ratio of the
// medians.
func TestMarkdownBudgets(t *testing.T) {
	r := &report{Toolchain: "go", Runs: 5}
	r.add(section("sizes"))
	r.add(row{Name: "brotli", Unit: "B", A: one(2300), F: one(2000), Budget: &budget{Text: "≤ 1.15 × floor", Met: true}})
	r.add(row{Name: "p95", Unit: "ms", A: summary([]float64{9, 10, 11}), Budget: &budget{Text: "≤ 8 ms", Met: false}})
	md := r.markdown()
	for _, want := range []string{
		"| brotli | 2 300 B | 2 000 B | 1.15 | ≤ 1.15 × floor: **met** |",
		"| p95 | 10.0 ms [9.0–11.0] n=3 | — |  | ≤ 8 ms: **not met** |",
		"| **sizes** |",
	} {
		if !strings.Contains(md, want) {
			t.Errorf("table lacks %q:\n%s", want, md)
		}
	}
}

// A module written by hand in the binary format of the WebAssembly Core
// Specification (§5.5): one imported function, two defined ones with
// bodies of 2 and 4 bytes, a data section of 3 bytes and a name section
// naming functions 1 and 2.
func TestReadWasm(t *testing.T) {
	mod := []byte("\x00asm\x01\x00\x00\x00")
	section := func(id byte, payload ...byte) {
		mod = append(mod, id, byte(len(payload)))
		mod = append(mod, payload...)
	}
	section(1, 1, 0x60, 0, 0)           // type: () -> ()
	section(2, 1, 1, 'm', 1, 'f', 0, 0) // import m.f, function of type 0
	section(3, 2, 0, 0)                 // two functions of type 0
	section(10, 2, 2, 0, 0x0b, 4, 0, 0x01, 0x01, 0x0b)
	section(11, 0, 0, 0)
	names := []byte{1, 11, 2, 1, 3, 'a', '.', 'x', 2, 3, 'b', '.', 'y'}
	section(0, append([]byte{4, 'n', 'a', 'm', 'e'}, names...)...)
	bodies, got, imported, data, err := readWasm(mod)
	if err != nil {
		t.Fatal(err)
	}
	if imported != 1 || len(bodies) != 2 || bodies[0] != 2 || bodies[1] != 4 || data != 3 {
		t.Errorf("imported %d, bodies %v, data %d", imported, bodies, data)
	}
	if got[1] != "a.x" || got[2] != "b.y" {
		t.Errorf("names %v", got)
	}
	if _, _, _, _, err := readWasm(mod[:len(mod)-3]); err == nil {
		t.Error("a truncated module was read")
	}
}
