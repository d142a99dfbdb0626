package physio

import (
	"bytes"
	"encoding/json"
	"testing"

	"github.com/shopspring/decimal"
)

// An Explanation writes the same JSON as a map of the same figures
// (encoding/json's own encoding is the reference: keys in byte order,
// HTML characters escaped or not as the encoder is set), a zero one null
// and an empty one {}; it reads back what it wrote.
func TestExplanationJSONIsTheMaps(t *testing.T) {
	figs := map[string]Figure{
		"b_second": {Value: Number{decimal.New(125, -1)}, Unit: "mL", Formula: "V2 = V1·P1/P2 <for P2 < P1 & sealed>", Rounding: "up"},
		"a_first":  {Value: Number{decimal.New(3, 0)}, Formula: "FiO2 · (PB − PH2O)", Inputs: []FigureInput{{Name: "PB", Value: 760, Unit: "mmHg"}}, Source: "ICAO Doc 7488", Rounding: "down"},
		"Z_upper":  {Value: Number{decimal.New(-1, 2)}, Rounding: "nearest"},
	}
	a := newExplainArena(1, 2) // fewer rooms than figures: it must grow
	e := a.newExplanation(2)
	for _, k := range []string{"b_second", "Z_upper", "a_first"} {
		e.set(k, figs[k])
	}
	type holder struct {
		E Explanation `json:"explain"`
	}
	type mapHolder struct {
		E map[string]Figure `json:"explain"`
	}
	encode := func(v any, escape bool) string {
		var buf bytes.Buffer
		enc := json.NewEncoder(&buf)
		enc.SetEscapeHTML(escape)
		if err := enc.Encode(v); err != nil {
			t.Fatal(err)
		}
		return buf.String()
	}
	for _, escape := range []bool{true, false} {
		if got, want := encode(holder{e}, escape), encode(mapHolder{figs}, escape); got != want {
			t.Errorf("escape %v:\n got %s\nwant %s", escape, got, want)
		}
		if got, want := encode(holder{}, escape), encode(mapHolder{}, escape); got != want {
			t.Errorf("zero: got %s, want %s", got, want)
		}
		empty := a.newExplanation(1)
		if got, want := encode(holder{empty}, escape), encode(mapHolder{map[string]Figure{}}, escape); got != want {
			t.Errorf("empty: got %s, want %s", got, want)
		}
	}
	var back holder
	if err := json.Unmarshal([]byte(encode(holder{e}, true)), &back); err != nil {
		t.Fatal(err)
	}
	if got, want := encode(back, true), encode(holder{e}, true); got != want {
		t.Errorf("round trip:\n got %s\nwant %s", got, want)
	}
	if back.E.Len() != 3 || back.E.Keys()[0] != "Z_upper" {
		t.Errorf("read back %d figures, keys %v", back.E.Len(), back.E.Keys())
	}
	var null holder
	if err := json.Unmarshal([]byte(`{"explain":null}`), &null); err != nil || null.E.Len() != 0 || encode(null, true) != "{\"explain\":null}\n" {
		t.Errorf("null read as %+v (%v)", null, err)
	}
	if err := json.Unmarshal([]byte(`{"explain":[1]}`), &null); err == nil {
		t.Error("an explain that is not an object was read")
	}
}

// Explanations carved from one arena keep to their own room: a figure past
// an Explanation's room never lands in the next one's, set replaces a key
// it has, and a copy sees the figures set through the original.
func TestExplanationArenaRooms(t *testing.T) {
	a := newExplainArena(2, 3)
	first, second := a.newExplanation(1), a.newExplanation(2)
	copyOfFirst := first
	second.set("s1", Figure{Formula: "second one"})
	first.set("f1", Figure{Formula: "first one"})
	first.set("f2", Figure{Formula: "past the room"})
	first.set("f1", Figure{Formula: "first again"})
	if f, ok := second.Get("s1"); !ok || f.Formula != "second one" || second.Len() != 1 {
		t.Errorf("the second Explanation holds %v (%d figures) after the first outgrew its room", f, second.Len())
	}
	if f, _ := copyOfFirst.Get("f1"); f.Formula != "first again" || copyOfFirst.Len() != 2 {
		t.Errorf("the copy holds %q and %d figures", f.Formula, copyOfFirst.Len())
	}
	if _, ok := first.Get("missing"); ok {
		t.Error("a key never set was found")
	}
	if (Explanation{}).Len() != 0 {
		t.Error("a zero Explanation has figures")
	}
}

// An explain object read from anywhere (a bundle's Brief snapshot comes
// from another tablet) either is refused or reads back to the same JSON it
// writes, as a map of the same figures would.
func FuzzExplanationJSON(f *testing.F) {
	f.Add([]byte(`{"a":{"value":1.5,"unit":"L","formula":"x < y & z","rounding":"up"},"B":{"value":-2,"inputs":[{"name":"PB","value":760,"unit":"mmHg"}]}}`))
	f.Add([]byte(`null`))
	f.Add([]byte(`{}`))
	f.Add([]byte(`{"a":1}`))
	f.Add([]byte(`[]`))
	f.Fuzz(func(t *testing.T, b []byte) {
		var e Explanation
		if err := json.Unmarshal(b, &e); err != nil {
			return
		}
		var m map[string]Figure
		if err := json.Unmarshal(b, &m); err != nil {
			t.Fatalf("read as an Explanation but not as a map: %v", err)
		}
		got, err := json.Marshal(e)
		if err != nil {
			t.Fatal(err)
		}
		want, err := json.Marshal(m)
		if err != nil {
			t.Fatal(err)
		}
		if !bytes.Equal(got, want) {
			t.Fatalf("written as\n%s\nbut a map writes\n%s", got, want)
		}
		var again Explanation
		if err := json.Unmarshal(got, &again); err != nil {
			t.Fatal(err)
		}
		if back, _ := json.Marshal(again); !bytes.Equal(back, got) {
			t.Fatalf("not stable: %s then %s", got, back)
		}
	})
}
