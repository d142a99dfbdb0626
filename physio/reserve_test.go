package physio

import (
	"math"
	"testing"
	"time"
)

func TestDefaultReservePolicy(t *testing.T) {
	// Common practice, REFERENCES §7 and §9 [practice]: 200 psi residual,
	// ×1.5 the need.
	p := DefaultReservePolicy
	if err := p.Validate(); err != nil {
		t.Fatal(err)
	}
	if !supplyClose(p.Residual.Psi(), 200, 1e-12) || p.Factor != 1.5 || p.AddedMinutes != 0 {
		t.Errorf("DefaultReservePolicy = %+v, want 200 psi, ×1.5, +0 min", p)
	}
}

func TestReserveRequired(t *testing.T) {
	// required = need·Factor + AddedMinutes·flow, REFERENCES §9 [practice];
	// values [calc] in scenarios of our own.
	tests := []struct {
		p          ReservePolicy
		need, flow float64
		want       float64
	}{
		{DefaultReservePolicy, 600, 4, 900},
		{ReservePolicy{Factor: 1, AddedMinutes: 30 * time.Minute}, 600, 4, 720},
		{ReservePolicy{Residual: Psi(200), Factor: 2, AddedMinutes: 30 * time.Minute}, 600, 4, 1320},
		{ReservePolicy{Factor: 1}, 600, 4, 600},
		{DefaultReservePolicy, 0, 0, 0},
	}
	for _, tc := range tests {
		got, err := tc.p.Required(Litres(tc.need), LitresPerMinute(tc.flow))
		if err != nil || !supplyClose(got.Litres(), tc.want, 1e-12) {
			t.Errorf("%+v Required(%v L, %v L/min) = %v, %v; want %v L", tc.p, tc.need, tc.flow, got, err, tc.want)
		}
		// Shown to a person: litres needed rounded UP, never below the value.
		shown, _ := Round(got.Litres(), 0, RoundUp)
		if f, _ := shown.Float64(); f < got.Litres() {
			t.Errorf("rounded need %v below %v", shown, got)
		}
	}
}

func TestReserveBadInput(t *testing.T) {
	inf, nan := math.Inf(1), math.NaN()
	// The residual's top is 70 bar (1 015.26 psi; `units -t '70 bar' psi`
	// → 1015.2642), the plan document's limit in bar.
	for _, r := range []Pressure{Psi(-1), Psi(1016), Bar(70.01), Bar(500), Pressure(nan), Pressure(inf)} {
		p := ReservePolicy{Residual: r, Factor: 1.5}
		supplyWantRange(t, p.Validate(), "reserve residual", "psi")
		_, err := p.Required(100, 2)
		supplyWantRange(t, err, "reserve residual", "psi")
	}
	// Factor 0 (an unset policy) is impossible: it would carry no oxygen.
	for _, f := range []float64{0, 0.9, -1.5, 3.5, 1e300, inf, nan} {
		p := ReservePolicy{Factor: f}
		supplyWantRange(t, p.Validate(), "reserve factor", "")
	}
	for _, m := range []time.Duration{-time.Minute, 241 * time.Minute, 1000 * time.Hour} {
		p := ReservePolicy{Factor: 1, AddedMinutes: m}
		supplyWantRange(t, p.Validate(), "reserve added time", "min")
	}
	for _, n := range []float64{-1, 2e8, inf, nan} {
		_, err := DefaultReservePolicy.Required(Litres(n), 2)
		supplyWantRange(t, err, "oxygen need", "L")
	}
	for _, f := range []float64{-1, 201, inf, nan} {
		_, err := DefaultReservePolicy.Required(100, LitresPerMinute(f))
		supplyWantRange(t, err, "final oxygen flow", "L/min")
	}
}
