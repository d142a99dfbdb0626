package logbook

import (
	"encoding/json"
	"strings"
	"testing"
	"time"
)

// TestAuditRefusesImplausibleBriefResult: a Brief snapshot's result is read
// from a bundle, so the audit must not take any JSON object for the plan.
// Fields left out decode as zero (a plan "needing 0 L" would make every
// transport look over plan), and numbers no engine could produce
// (negative litres, 1e400 litres, a calculated need that is not the sum of
// its legs) would be audited as if planned. Each is reported as not
// computable, naming the record, never used. A result the engine produced
// (the demo's rotor plan) is still read.
func TestAuditRefusesImplausibleBriefResult(t *testing.T) {
	at := time.Date(2031, 6, 1, 8, 0, 0, 0, time.UTC)
	good := demoBrief(t, demoRotorPlan)
	if p := decodeBrief(Timed[Brief]{Seq: 1, At: at, Value: *good}); p.result == nil {
		t.Fatalf("an engine result is refused: %s", p.err)
	}
	// At the plan's edges: a residual of 70 bar (the document's limit in
	// bar) is 1 015 psi in the result, above the 1 000 psi limit in psi.
	edge := demoBrief(t, strings.Replace(demoRotorPlan, `"residual_psi": 200`, `"residual_bar": 70`, 1))
	if p := decodeBrief(Timed[Brief]{Seq: 2, At: at, Value: *edge}); p.result == nil {
		t.Errorf("an engine result with a 70 bar residual is refused: %s", p.err)
	}
	var fields map[string]json.RawMessage
	if err := json.Unmarshal(good.Result, &fields); err != nil {
		t.Fatal(err)
	}
	with := func(key, value string) string {
		m := map[string]json.RawMessage{}
		for k, v := range fields {
			m[k] = v
		}
		if value == "" {
			delete(m, key)
		} else {
			m[key] = json.RawMessage(value)
		}
		b, err := json.Marshal(m)
		if err != nil {
			t.Fatal(err)
		}
		return string(b)
	}
	for name, result := range map[string]string{
		"empty object":              `{}`,
		"no engine version":         with("engine_version", ""),
		"no legs":                   with("legs", "[]"),
		"calculated need left out":  with("oxygen_calculated_l", ""),
		"calculated need negative":  with("oxygen_calculated_l", "-5"),
		"calculated need 1e400":     with("oxygen_calculated_l", "1e400"),
		"needed below calculated":   with("oxygen_needed_l", "1"),
		"usable negative":           with("oxygen_usable_l", "-1"),
		"residual negative":         with("residual_psi", "-200"),
		"SpO2 target above 100 %":   with("spo2_target_percent", "140"),
		"calculated need not legs'": with("oxygen_calculated_l", "100000"),
	} {
		b := *good
		b.Result = json.RawMessage(result)
		p := decodeBrief(Timed[Brief]{Seq: 7, At: at, Value: b})
		if p.result != nil || !strings.Contains(p.err, "R7") {
			t.Errorf("%s: result kept (%v), reason %q", name, p.result != nil, p.err)
		}
	}
}
