package physio

import (
	"errors"
	"strings"
	"testing"
)

// planMinimal is a valid plan of our own: one room-air leg at sea level.
const planMinimal = `"route": {"origin_elevation_ft": 0, "destination_elevation_ft": 0},
 "legs": [{"where": "origin", "minutes": 10, "oxygen": {"device": "room_air"}}],
 "patient": {"fio2": 0.21, "pao2_mmhg": 90}, "supply": []`

// Nasty documents: each is refused with PlanErrors whose first problem
// names the path and says what is wrong (and, for numbers, the allowed
// limit and unit). The limits are the plan document's own (plan_validate.go).
func TestParsePlanNastyDocuments(t *testing.T) {
	tests := []struct {
		name, doc string
		path      string   // path of the first problem
		contains  []string // in its message
		sentinel  error
	}{
		{"duplicate top-level key", `{"version": 1, "version": 1, ` + planMinimal + `}`,
			"version", []string{"duplicate key"}, ErrSyntax},
		{"duplicate nested key", `{"version": 1, ` + planMinimal + `, "policy": {"reserve_factor": 1, "reserve_factor": 2}}`,
			"policy.reserve_factor", []string{"duplicate key"}, ErrSyntax},
		{"duplicate key in a list item", `{"version": 1, "route": {"origin_elevation_ft": 0, "destination_elevation_ft": 0},
 "legs": [{"where": "origin", "minutes": 10, "oxygen": {"device": "room_air"}}, {"where": "origin", "where": "cabin"}],
 "patient": {"fio2": 0.21, "pao2_mmhg": 90}, "supply": []}`,
			"legs[1].where", []string{"duplicate key"}, ErrSyntax},
		{"null version", `{"version": null, ` + planMinimal + `}`,
			"version", []string{"got null", "want a number"}, ErrSyntax},
		{"null policy", `{"version": 1, ` + planMinimal + `, "policy": null}`,
			"policy", []string{"got null", "want an object"}, ErrSyntax},
		{"null number", `{"version": 1, "route": {"origin_elevation_ft": null, "destination_elevation_ft": 0},
 "legs": [{"where": "origin", "minutes": 10, "oxygen": {"device": "room_air"}}],
 "patient": {"fio2": 0.21, "pao2_mmhg": 90}, "supply": []}`,
			"route.origin_elevation_ft", []string{"got null", "want a number in ft"}, ErrSyntax},
		{"number too large for float64", `{"version": 1, "route": {"origin_elevation_ft": 1e400, "destination_elevation_ft": 0},
 "legs": [{"where": "origin", "minutes": 10, "oxygen": {"device": "room_air"}}],
 "patient": {"fio2": 0.21, "pao2_mmhg": 90}, "supply": []}`,
			"route.origin_elevation_ft", []string{"1e400 is above the 18000 ft limit"}, ErrOutOfRange},
		{"negative number too large for float64", `{"version": 1, "route": {"origin_elevation_ft": 0, "destination_elevation_ft": -1e999},
 "legs": [{"where": "origin", "minutes": 10, "oxygen": {"device": "room_air"}}],
 "patient": {"fio2": 0.21, "pao2_mmhg": 90}, "supply": []}`,
			"route.destination_elevation_ft", []string{"-1e999 is below the -2000 ft minimum"}, ErrOutOfRange},
		{"huge count", `{"version": 1, ` + strings.Replace(planMinimal, `"supply": []`, `"supply": [{"size": "E", "pressure_psi": 2000, "count": 1e30}]`, 1) + `}`,
			"supply[0].count", []string{"1e30 is above the 20 limit"}, ErrOutOfRange},
		{"fractional count", `{"version": 1, ` + strings.Replace(planMinimal, `"supply": []`, `"supply": [{"size": "E", "pressure_psi": 2000, "count": 1.5}]`, 1) + `}`,
			"supply[0].count", []string{"1.5 is not a whole number", "1 to 20"}, ErrOutOfRange},
		{"huge version", `{"version": 1e30, ` + planMinimal + `}`,
			"version", []string{"1e30 is not supported", "version 1"}, ErrUnit},
		{"NaN as a string", `{"version": 1, "route": {"origin_elevation_ft": "NaN", "destination_elevation_ft": 0},
 "legs": [{"where": "origin", "minutes": 10, "oxygen": {"device": "room_air"}}],
 "patient": {"fio2": 0.21, "pao2_mmhg": 90}, "supply": []}`,
			"route.origin_elevation_ft", []string{`got a string "NaN"`, "want a number in ft"}, ErrSyntax},
		{"NaN as a bare word (not JSON)", "{\"version\": 1,\n \"route\": {\"origin_elevation_ft\": NaN}}",
			"document", []string{"invalid JSON at line 2, column 35"}, ErrSyntax},
		{"deeply nested junk", `{"version": 1, ` + planMinimal + `, "title": ` + strings.Repeat("[", 200) + strings.Repeat("]", 200) + `}`,
			"title[0][0]", []string{"nested more than 32 levels deep"}, ErrSyntax},
		{"deeply nested junk at the root", strings.Repeat("[", 100000) + strings.Repeat("]", 100000),
			"document", []string{"nested more than 32 levels deep"}, ErrSyntax},
		{"trailing object", `{"version": 1, ` + planMinimal + `} {}`,
			"document", []string{"extra data after the document", "line 3"}, ErrSyntax},
		{"trailing junk", `{"version": 1, ` + planMinimal + `}x`,
			"document", []string{"extra data after the document"}, ErrSyntax},
		{"empty legs", `{"version": 1, "route": {"origin_elevation_ft": 0, "destination_elevation_ft": 0}, "legs": [],
 "patient": {"fio2": 0.21, "pao2_mmhg": 90}, "supply": []}`,
			"legs", []string{"no legs", "1 to 50"}, ErrSyntax},
		{"null legs", `{"version": 1, "route": {"origin_elevation_ft": 0, "destination_elevation_ft": 0}, "legs": null,
 "patient": {"fio2": 0.21, "pao2_mmhg": 90}, "supply": []}`,
			"legs", []string{"got null", "want a list"}, ErrSyntax},
		{"zero minutes", `{"version": 1, ` + strings.Replace(planMinimal, `"minutes": 10`, `"minutes": 0`, 1) + `}`,
			"legs[0].minutes", []string{"0 is below the 1 min minimum"}, ErrOutOfRange},
		{"negative minutes", `{"version": 1, ` + strings.Replace(planMinimal, `"minutes": 10`, `"minutes": -5`, 1) + `}`,
			"legs[0].minutes", []string{"-5 is below the 1 min minimum"}, ErrOutOfRange},
		{"empty document", ``, "document", []string{"ends too early"}, ErrSyntax},
		{"not UTF-8", "{\"version\": 1, \"title\": \"a\xffb\", " + planMinimal + `}`,
			"document", []string{"not UTF-8", "line 1, column 27"}, ErrSyntax},
		{"a list, not an object", `[]`, "document", []string{"got a list; want an object"}, ErrSyntax},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			doc, err := ParsePlan([]byte(tc.doc))
			if err == nil {
				t.Fatalf("accepted: %+v", doc)
			}
			var pe PlanErrors
			if !errors.As(err, &pe) || len(pe) == 0 {
				t.Fatalf("want PlanErrors, got %T %v", err, err)
			}
			first := pe[0]
			if first.Path != tc.path {
				t.Errorf("path %q, want %q (all: %v)", first.Path, tc.path, err)
			}
			for _, c := range tc.contains {
				if !strings.Contains(first.Message, c) {
					t.Errorf("message %q lacks %q", first.Message, c)
				}
			}
			if !errors.Is(first, tc.sentinel) {
				t.Errorf("error %v does not unwrap to %v", first, tc.sentinel)
			}
		})
	}
}

// Accepted edge cases: a UTF-8 byte order mark (RFC 8259 §8.1 lets a reader
// ignore it), minus zero, and a number that underflows to 0 are read as the
// numbers they are.
func TestParsePlanAcceptedEdges(t *testing.T) {
	for _, doc := range []string{
		"\xef\xbb\xbf{\"version\": 1, " + planMinimal + "}",
		`{"version": 1, ` + planMinimal + `, "policy": {"reserve_minutes": -0}}`,
		`{"version": 1, ` + planMinimal + `, "policy": {"reserve_minutes": 1e-400}}`,
		`{"version": 1.0, ` + planMinimal + `}`,
	} {
		d, err := ParsePlan([]byte(doc))
		if err != nil {
			t.Errorf("refused %q: %v", doc[:20], err)
			continue
		}
		if _, err := ComputePlan(d); err != nil {
			t.Errorf("ComputePlan: %v", err)
		}
	}
}

// A refused number far outside its range is written with an exponent, as
// the document may give it, not in 309 digits (1e308 is JSON's largest
// order of magnitude; both limits are the document's own).
func TestPlanRefusalWritesHugeNumbersShort(t *testing.T) {
	doc := `{"version": 1,
 "route": {"origin_elevation_ft": 1e308, "destination_elevation_ft": 0, "cruise_altitude_ft": 1000},
 "legs": [{"where": "cabin", "minutes": 1e-9, "oxygen": {"device": "nasal_cannula", "flow_lpm": 2}}],
 "patient": {"fio2": 0.21, "pao2_mmhg": 80}, "supply": []}`
	_, err := ParsePlan([]byte(doc))
	if err == nil {
		t.Fatal("accepted")
	}
	for _, want := range []string{"route.origin_elevation_ft: 1e+308 is above the 18000 ft limit", "legs[0].minutes: 1e-09 is below the 1 min minimum"} {
		if !strings.Contains(err.Error(), want) {
			t.Errorf("error %q lacks %q", err, want)
		}
	}
	// Too small for float64: read as 0, named as written.
	_, err = ParsePlan([]byte(strings.Replace(doc, `"minutes": 1e-9`, `"minutes": 1e-400`, 1)))
	for _, want := range []string{"legs[0].minutes: 1e-400 is below the 1 min minimum"} {
		if !strings.Contains(err.Error(), want) {
			t.Errorf("error %q lacks %q", err, want)
		}
	}
}
