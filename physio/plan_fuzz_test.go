package physio

import (
	"encoding/json"
	"errors"
	"math"
	"os"
	"path/filepath"
	"reflect"
	"strings"
	"testing"
)

// FuzzParsePlan: any input either is refused with PlanErrors, or parses
// to a document that computes (or is refused with PlanErrors) without a
// panic and without NaN or Inf anywhere in the result.
func FuzzParsePlan(f *testing.F) {
	for _, dir := range []string{planDir, filepath.Join(planDir, "bad")} {
		files, _ := filepath.Glob(filepath.Join(dir, "*.json"))
		for _, p := range files {
			if strings.HasSuffix(p, ".result.json") {
				continue
			}
			if data, err := os.ReadFile(p); err == nil {
				f.Add(data)
			}
		}
	}
	f.Add([]byte(planSeaLevelTo8000))
	f.Add([]byte(`[]`))
	f.Add([]byte(`{"version": 1e400}`))
	f.Fuzz(func(t *testing.T, data []byte) {
		doc, err := ParsePlan(data)
		if err != nil {
			var pe PlanErrors
			if !errors.As(err, &pe) || len(pe) == 0 {
				t.Fatalf("ParsePlan error is not PlanErrors: %v", err)
			}
			return
		}
		r, err := ComputePlan(doc)
		if err != nil {
			var pe PlanErrors
			if !errors.As(err, &pe) {
				t.Fatalf("a parsed document failed to compute: %v", err)
			}
			return
		}
		out, err := json.Marshal(r)
		if err != nil {
			t.Fatalf("marshal: %v", err)
		}
		if strings.Contains(string(out), "NaN") || strings.Contains(string(out), "Inf") {
			t.Fatalf("non-number in result: %s", out)
		}
		checkFinite(t, reflect.ValueOf(r))
		// Safe side: the margin is exactly usable − needed.
		if r.OxygenMarginL.Cmp(r.OxygenUsableL.Sub(r.OxygenNeededL.Decimal)) != 0 {
			t.Fatalf("margin %s ≠ %s − %s", r.OxygenMarginL, r.OxygenUsableL, r.OxygenNeededL)
		}
		if r.OxygenNeededL.Cmp(r.OxygenCalculatedL.Decimal) < 0 {
			t.Fatalf("needed with reserve %s below calculated %s", r.OxygenNeededL, r.OxygenCalculatedL)
		}
	})
}

func checkFinite(t *testing.T, v reflect.Value) {
	switch v.Kind() {
	case reflect.Pointer, reflect.Interface:
		if !v.IsNil() {
			checkFinite(t, v.Elem())
		}
	case reflect.Struct:
		for i := 0; i < v.NumField(); i++ {
			if v.Type().Field(i).IsExported() {
				checkFinite(t, v.Field(i))
			}
		}
	case reflect.Slice:
		for i := 0; i < v.Len(); i++ {
			checkFinite(t, v.Index(i))
		}
	case reflect.Map:
		for _, k := range v.MapKeys() {
			checkFinite(t, v.MapIndex(k))
		}
	case reflect.Float64:
		if math.IsNaN(v.Float()) || math.IsInf(v.Float(), 0) {
			t.Fatalf("non-finite float in result")
		}
	}
}

// BenchmarkComputePlan: the whole chain on the pressurised long-leg example
// (parse excluded). Target well under 50 µs/op.
func BenchmarkComputePlan(b *testing.B) {
	data, err := os.ReadFile(filepath.Join(planDir, "fixed-wing-long.json"))
	if err != nil {
		b.Fatal(err)
	}
	doc, err := ParsePlan(data)
	if err != nil {
		b.Fatal(err)
	}
	b.ReportAllocs()
	for b.Loop() {
		if _, err := ComputePlan(doc); err != nil {
			b.Fatal(err)
		}
	}
}

// BenchmarkParseAndComputePlan: document bytes to result.
func BenchmarkParseAndComputePlan(b *testing.B) {
	data, err := os.ReadFile(filepath.Join(planDir, "ventilated.json"))
	if err != nil {
		b.Fatal(err)
	}
	b.ReportAllocs()
	for b.Loop() {
		doc, err := ParsePlan(data)
		if err != nil {
			b.Fatal(err)
		}
		if _, err := ComputePlan(doc); err != nil {
			b.Fatal(err)
		}
	}
}
