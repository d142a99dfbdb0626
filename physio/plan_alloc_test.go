package physio

import (
	"bytes"
	"encoding/json"
	"os"
	"path/filepath"
	"reflect"
	"strconv"
	"strings"
	"sync"
	"testing"

	"github.com/shopspring/decimal"
)

// ComputePlan keeps a plan's figure inputs and the targets of its *Number
// and *int fields in arrays shared within the plan, and shares a few
// decimals (zeros, the worked volumes) between plans. These tests hold
// that sharing to what it must be: invisible.

// planAllocDocs is every plan document under testdata/plans, parsed.
func planAllocDocs(t *testing.T) map[string]*PlanDocument {
	t.Helper()
	files, _ := filepath.Glob(filepath.Join(planDir, "*.json"))
	docs := map[string]*PlanDocument{}
	for _, f := range files {
		if strings.HasSuffix(f, ".result.json") {
			continue
		}
		data, err := os.ReadFile(f)
		if err != nil {
			t.Fatal(err)
		}
		doc, err := ParsePlan(data)
		if err != nil {
			t.Fatalf("%s: %v", f, err)
		}
		docs[filepath.Base(f)] = doc
	}
	if len(docs) < 3 {
		t.Fatalf("found %d plan documents; want the examples under %s", len(docs), planDir)
	}
	return docs
}

func planAllocJSON(t *testing.T, doc *PlanDocument) []byte {
	t.Helper()
	r, err := ComputePlan(doc)
	if err != nil {
		t.Fatal(err)
	}
	out, err := json.Marshal(r)
	if err != nil {
		t.Fatal(err)
	}
	return out
}

// Plans computed in turn, and after a plan whose result was then
// changed by its caller, give the same JSON as each computed first.
func TestPlanResultsIndependent(t *testing.T) {
	docs := planAllocDocs(t)
	alone := map[string][]byte{}
	for name, doc := range docs {
		alone[name] = planAllocJSON(t, doc)
	}
	for round := 0; round < 2; round++ {
		for name, doc := range docs {
			// A caller that scribbles on a result it was given must not
			// reach any other result.
			r, err := ComputePlan(doc)
			if err != nil {
				t.Fatal(err)
			}
			scribble(r)
			if got := planAllocJSON(t, doc); !bytes.Equal(got, alone[name]) {
				t.Errorf("%s computed after other plans differs from computed alone", name)
			}
		}
	}
}

// scribble changes every value a caller can reach through the result's
// pointers and slices.
func scribble(r *PlanResult) {
	zero := Number{planZeros[0]}
	for _, p := range []**Number{&r.CabinAltitudeFt, &r.MaxCruiseAltitudeFt, &r.SupplyExhaustedMin,
		&r.Ground.ExpectedAaGradient, &r.Ground.ContentMLPerDL} {
		if *p != nil {
			**p = zero
		}
	}
	for i := range r.Cylinders {
		if r.Cylinders[i].StartMinute != nil {
			*r.Cylinders[i].StartMinute = zero
		}
		if r.Cylinders[i].ChangeMinute != nil {
			*r.Cylinders[i].ChangeMinute = zero
		}
		if r.Cylinders[i].ChangeLeg != nil {
			*r.Cylinders[i].ChangeLeg = -7
		}
	}
	for i := range r.Warnings {
		if r.Warnings[i].Leg != nil {
			*r.Warnings[i].Leg = -7
		}
	}
	for _, ex := range planExplains(r) {
		for i := range ex.list.figs {
			f := &ex.list.figs[i].fig
			for j := range f.Inputs {
				f.Inputs[j] = FigureInput{Name: "scribbled"}
			}
		}
	}
}

func planExplains(r *PlanResult) []Explanation {
	all := []Explanation{r.Explain, r.Ground.Explain, r.TrappedGas.Explain}
	for _, l := range r.Legs {
		all = append(all, l.Explain)
	}
	for _, c := range r.Cylinders {
		all = append(all, c.Explain)
	}
	return all
}

// No two pointer fields of a result share their target, and an append to
// one figure's inputs never changes another figure's: a caller may treat
// each as its own, as before they were carved from shared arrays.
func TestPlanResultNoAliasing(t *testing.T) {
	for name, doc := range planAllocDocs(t) {
		r, err := ComputePlan(doc)
		if err != nil {
			t.Fatal(err)
		}
		numbers := map[*Number]string{}
		ints := map[*int]string{}
		addNumber := func(what string, p *Number) {
			if p == nil {
				return
			}
			if other, ok := numbers[p]; ok {
				t.Errorf("%s: %s and %s point to the same number", name, what, other)
			}
			numbers[p] = what
		}
		addInt := func(what string, p *int) {
			if p == nil {
				return
			}
			if other, ok := ints[p]; ok {
				t.Errorf("%s: %s and %s point to the same int", name, what, other)
			}
			ints[p] = what
		}
		addNumber("cabin_altitude_ft", r.CabinAltitudeFt)
		addNumber("max_cruise_altitude_ft", r.MaxCruiseAltitudeFt)
		addNumber("supply_exhausted_minute", r.SupplyExhaustedMin)
		addNumber("ground.expected_aa_gradient_mmhg", r.Ground.ExpectedAaGradient)
		addNumber("ground.cao2_ml_dl", r.Ground.ContentMLPerDL)
		for i, l := range r.Legs {
			addNumber("legs["+strconv.Itoa(i)+"].cao2", l.ContentMLPerDL)
		}
		for i, c := range r.Cylinders {
			addNumber("cylinder start "+strconv.Itoa(i), c.StartMinute)
			addNumber("cylinder change "+strconv.Itoa(i), c.ChangeMinute)
			addInt("cylinder change leg "+strconv.Itoa(i), c.ChangeLeg)
		}
		for i, w := range r.Warnings {
			addInt("warning leg "+strconv.Itoa(i), w.Leg)
		}
		if len(numbers) == 0 {
			t.Errorf("%s: no optional numbers to check", name)
		}

		before, _ := json.Marshal(r)
		for _, ex := range planExplains(r) {
			for _, kf := range ex.list.figs {
				f := kf.fig
				if len(f.Inputs) > 0 && cap(f.Inputs) != len(f.Inputs) {
					t.Errorf("%s: a figure's inputs have room for %d more: an append would write past them", name, cap(f.Inputs)-len(f.Inputs))
				}
				_ = append(f.Inputs, FigureInput{Name: "appended"})
			}
		}
		if after, _ := json.Marshal(r); !bytes.Equal(before, after) {
			t.Errorf("%s: appending to one figure's inputs changed the result", name)
		}
	}
}

// Concurrent plans (the shared decimals, the package's tables) give each
// the result it gives alone. Run with -race.
func TestPlanConcurrent(t *testing.T) {
	docs := planAllocDocs(t)
	want := map[string][]byte{}
	for name, doc := range docs {
		want[name] = planAllocJSON(t, doc)
	}
	var wg sync.WaitGroup
	for g := 0; g < 4; g++ {
		for name, doc := range docs {
			wg.Add(1)
			go func() {
				defer wg.Done()
				for i := 0; i < 5; i++ {
					r, err := ComputePlan(doc)
					if err != nil {
						t.Error(err)
						return
					}
					got, _ := json.Marshal(r)
					if !bytes.Equal(got, want[name]) {
						t.Errorf("%s: a concurrent plan differs from the plan alone", name)
						return
					}
				}
			}()
		}
	}
	wg.Wait()
}

// The decimals shared between plans stay what planRound makes.
func TestPlanSharedDecimals(t *testing.T) {
	for places := range planZeros {
		for _, x := range []float64{0, -0.0000001, 0.0000001} {
			d, ok := planRound(x, int32(places), RoundNearest)
			if !ok || !reflect.DeepEqual(d, decimal.New(0, int32(-places))) {
				t.Errorf("%v at %d places: %v (exponent %d); want decimal.New(0, %d)", x, places, d, d.Exponent(), -places)
			}
		}
	}
	if !reflect.DeepEqual(planCuffNumber, num(planCuffMl, 0, RoundNearest)) ||
		!reflect.DeepEqual(planPneumothoraxNumber, num(planPneumothoraxMl, 0, RoundNearest)) {
		t.Error("a shared worked volume differs from the one planRound makes")
	}
}
