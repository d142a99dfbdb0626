package ui

import (
	"context"
	"errors"
	"strings"
	"testing"
	"time"

	"alvea/app/logbook"
	"alvea/physio"
)

// The Logbook's refusals give the allowed range in the units the crew
// types, not the vault's SI units. Check values from the exact unit
// definitions (REFERENCES, Units): the vault's 31e6 Pa gauge limit is
// 31e6 / 6894.757293168 = 4496.2 psi → 4496 psi (rounded inward) and
// 310 bar; its 20 000 Pa EtCO2 limit is 20000 / 133.322387415 = 150.01
// mmHg → 150 mmHg, and 20 kPa; its −500 to 6000 m elevations are
// −1640.4 → −1640 ft and 19685.04 → 19685 ft (0.3048 m per ft); SpO2
// 0.3 to 1 is 30 to 100 %.
func TestLogbookRefusalsInCrewUnits(t *testing.T) {
	t0 := time.Date(2026, 6, 14, 9, 0, 0, 0, time.UTC)
	id := logbook.NewTransportID(t0)
	over := &logbook.Entry{Transport: id, At: t0, Kind: logbook.KindGauge, Gauge: &logbook.GaugeReading{Cylinder: "A", Pressure: physio.Psi(4600)}}
	var fe *logbook.FieldError
	if err := over.Validate(); !errors.As(err, &fe) {
		t.Fatalf("4600 psi: %v, want a FieldError", err)
	}
	if got, want := vaultMessage(fe), "Gauge reading: not saved. Allowed: 0 to 4496 psi (0 to 310 bar)."; got != want {
		t.Errorf("4600 psi: %q, want %q", got, want)
	}
	for _, c := range []struct {
		err  error
		want []string
	}{
		{func() error { _, err := lbGaugeEntry("A", "1e999", UnitPsi); return err }(),
			[]string{`Gauge reading: "1e999" is not a number.`, "Allowed: 0 to 4496 psi (0 to 310 bar)."}},
		{func() error { _, err := lbGaugeEntry("A", "12 kg", UnitPsi); return err }(),
			[]string{`Gauge reading: "12 kg" is not in a unit this field takes.`, "0 to 4496 psi"}},
		{func() error { _, err := lbReadObservation(lbObsForm{etco2: "abc"}, UnitMmHg); return err }(),
			[]string{`EtCO2: "abc" is not a number.`, "Allowed: 0 to 150 mmHg (0 to 20 kPa)."}},
		{func() error { _, err := lbReadObservation(lbObsForm{spo2: "x"}, UnitMmHg); return err }(),
			[]string{`SpO2: "x" is not a number.`, "Allowed: 30 to 100 %."}},
		{func() error { _, msg := lbReadPlace("origin", "Field", "NaN", UnitFeet); return errors.New(msg) }(),
			[]string{`Origin elevation: "NaN" is not a number.`, "Allowed: -1640 to 19685 ft (-500 to 6000 m)."}},
	} {
		if c.err == nil {
			t.Errorf("accepted, want %q", c.want)
			continue
		}
		for _, w := range c.want {
			if !strings.Contains(c.err.Error(), w) {
				t.Errorf("%q lacks %q", c.err, w)
			}
		}
		if strings.Contains(c.err.Error(), "physio") || strings.Contains(c.err.Error(), " Pa") {
			t.Errorf("%q shows the parser's wording or the vault's unit", c.err)
		}
	}
}

// A damaged bundle's count reads "1 problem", "2 problems" (as the
// command line's audit says it), never "problem(s)".
func TestLogbookDamageCount(t *testing.T) {
	one := &logbook.DamageError{Problems: []logbook.Problem{{Seq: 3, Detail: "body hash does not match index"}}}
	two := &logbook.DamageError{Problems: append(one.Problems, logbook.Problem{Seq: 4, Detail: "missing"})}
	for err, want := range map[error]string{one: "(1 problem)", two: "(2 problems)"} {
		if got := vaultMessage(err); !strings.Contains(got, want) || strings.Contains(got, "(s)") {
			t.Errorf("%d problems: %q, want %q", len(err.(*logbook.DamageError).Problems), got, want)
		}
	}
}

// The Brief's refusals end in one full stop and name a unit once: the
// cylinder count's "cyl." lost its own full stop inside the sentence
// ("20 cyl.."), and a flow said "6 L/min (L/min)".
func TestBriefRefusalWording(t *testing.T) {
	for _, c := range []struct {
		spec fieldSpec
		text string
		disp string
	}{
		{specCount, "25", "cyl."},
		{specCount, "x", "cyl."},
		{flowSpec(physio.NasalCannula), "x", "L/min"},
		{flowSpec(physio.NasalCannula), "9", "L/min"},
	} {
		msg := readEntry(c.spec, Entry{T: c.text}, c.disp, true).Msg
		if msg == "" || strings.Contains(msg, "..") || strings.Contains(msg, "L/min (L/min)") || !strings.HasSuffix(msg, ".") {
			t.Errorf("%s %q: %q", c.spec.Label, c.text, msg)
		}
	}
}

// A file that is not a bundle is refused saying why, as the vault found it
// (logbook.OpenBundle's reasons), and that nothing was written.
func TestLogbookImportSaysWhy(t *testing.T) {
	for data, want := range map[string]string{"": "(the file is empty)", "hello, not a bundle": "(not a logbook bundle"} {
		_, err := logbook.OpenBundle(context.Background(), []byte(data), "any passphrase at all")
		if got := vaultMessage(err); !strings.Contains(got, want) || !strings.HasSuffix(got, "Nothing was written.") {
			t.Errorf("%q: %q, want it to contain %q", data, got, want)
		}
	}
}
