package logbook

import (
	"errors"
	"testing"
	"time"

	"alvea/physio"
)

// AllowedRange says what Validate says: for each numeric field, a value
// just past its range is refused with that very Allowed text.
func TestAllowedRangeMatchesValidate(t *testing.T) {
	t0 := time.Date(2026, 6, 14, 9, 0, 0, 0, time.UTC)
	base := Entry{Transport: NewTransportID(t0), At: t0}
	entry := func(e Entry) *Entry {
		e.Transport, e.At = base.Transport, base.At
		return &e
	}
	over := func(field string) error {
		big := 1e12
		switch field {
		case "gauge.pressure_pa":
			return entry(Entry{Kind: KindGauge, Gauge: &GaugeReading{Cylinder: "A", Pressure: physio.Pascals(big)}}).Validate()
		case "observe.etco2_pa":
			p := physio.Pascals(big)
			return entry(Entry{Kind: KindObserve, Observe: &Observation{EtCO2: &p}}).Validate()
		case "observe.resp_rate":
			return entry(Entry{Kind: KindObserve, Observe: &Observation{RespRate: &big}}).Validate()
		case "observe.heart_rate":
			return entry(Entry{Kind: KindObserve, Observe: &Observation{HeartRate: &big}}).Validate()
		case "observe.flow_lpm":
			f := physio.LitresPerMinute(big)
			return entry(Entry{Kind: KindObserve, Observe: &Observation{Flow: &f}}).Validate()
		}
		return nil
	}
	for _, field := range []string{"gauge.pressure_pa", "observe.etco2_pa", "observe.resp_rate", "observe.heart_rate", "observe.flow_lpm"} {
		var fe *FieldError
		if err := over(field); !errors.As(err, &fe) || fe.Field != field || fe.Allowed != AllowedRange(field) {
			t.Errorf("%s: Validate says %v; AllowedRange says %q", field, err, AllowedRange(field))
		}
	}
	if AllowedRange("note.text") != "" {
		t.Error("a text field has a numeric range")
	}
}
