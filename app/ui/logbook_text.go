package ui

import (
	"errors"
	"fmt"
	"strings"
	"time"

	"github.com/maxence-charriere/go-app/v10/pkg/app"

	"alvea/app/logbook"
	"alvea/app/logbook/idb"
	"alvea/physio"
)

// User sentences for the Logbook screen. The vault's errors never carry
// patient text in these sentences (field values of free text are not
// repeated), and nothing here is written to the console.

// vaultMessage turns a vault error into what the crew reads.
func vaultMessage(err error) string {
	var pe *logbook.PassphraseError
	var fe *logbook.FieldError
	var de *logbook.DamageError
	switch {
	case err == nil:
		return ""
	case errors.Is(err, logbook.ErrUnlock):
		return "Wrong passphrase, or the vault is damaged. Nothing was changed."
	case errors.As(err, &pe):
		return lbPassphraseMessage(pe)
	case errors.Is(err, logbook.ErrQuota):
		return "The device's storage is full: this entry was NOT saved and is still on screen. Free some space on the device, then save again."
	case errors.Is(err, logbook.ErrLocked):
		return "The logbook is locked. Unlock it, then save again; the entry is still on screen."
	case errors.As(err, &fe):
		return lbFieldMessage(fe)
	case errors.Is(err, logbook.ErrBundle):
		// The vault says why after its sentinel ("…: the file is empty").
		why := ""
		if _, after, ok := strings.Cut(err.Error(), logbook.ErrBundle.Error()+": "); ok {
			why = " (" + after + ")"
		}
		return "This file is not a logbook bundle this version can read" + why + ". Nothing was written."
	case errors.As(err, &de):
		first := ""
		if len(de.Problems) > 0 {
			first = " First: " + de.Problems[0].String() + "."
		}
		problems := "1 problem"
		if n := len(de.Problems); n != 1 {
			problems = fmt.Sprintf("%d problems", n)
		}
		return fmt.Sprintf("The bundle failed its check (%s): it was changed or damaged. Nothing was written.%s", problems, first)
	case errors.Is(err, logbook.ErrVaultExists):
		return "A vault already exists on this device. A bundle is imported into an empty logbook only."
	case errors.Is(err, logbook.ErrNoVault):
		return "There is no vault on this device yet."
	}
	return lbCouldNot(err) + " If this was a new entry, it was NOT saved and is still on screen."
}

func lbCouldNot(err error) string { return "The logbook could not do this: " + err.Error() + "." }

// vaultActionMessage is vaultMessage for what is not an entry (reading the
// logbook, creating it, unlocking, importing, exporting, checking,
// changing the passphrase): a refusal there leaves no entry on screen to
// save again, so it says what to do instead.
func vaultActionMessage(err error) string {
	switch {
	case errors.Is(err, logbook.ErrQuota):
		return "The device's storage is full: this was NOT done. Free some space on the device, then try again."
	case errors.Is(err, logbook.ErrLocked):
		return "The logbook is locked. Unlock it, then try again."
	}
	if msg := vaultMessage(err); msg != lbCouldNot(err)+" If this was a new entry, it was NOT saved and is still on screen." {
		return msg
	}
	return lbCouldNot(err)
}

// lbPassphraseMessage explains why a new passphrase was refused.
func lbPassphraseMessage(pe *logbook.PassphraseError) string {
	switch {
	case pe.Min > 0:
		return fmt.Sprintf("The passphrase is too short: use at least %d characters (a few unrelated words work well).", pe.Min)
	case strings.Contains(pe.Reason, "common"):
		return "This passphrase is among the commonest passwords. Choose another: a few unrelated words work well."
	case strings.Contains(pe.Reason, "repeat"):
		return "The passphrase repeats one character or one short word. Choose another."
	case strings.Contains(pe.Reason, "sequence") || strings.Contains(pe.Reason, "run"):
		return "The passphrase is a keyboard or alphabet run. Choose another."
	case strings.Contains(pe.Reason, "digit") || strings.Contains(pe.Reason, "punctuation"):
		return "The passphrase has only digits or punctuation. Add words."
	}
	return "This passphrase is refused (" + pe.Reason + "). Choose another."
}

// lbFieldLabels names the vault's entry fields as the screen labels them.
var lbFieldLabels = map[string]string{
	"open.vehicle":                 "Vehicle or aircraft",
	"open.crew":                    "Crew initials",
	"open.origin.name":             "Origin",
	"open.origin.elevation_m":      "Origin elevation",
	"open.destination.name":        "Destination",
	"open.destination.elevation_m": "Destination elevation",
	"open.patient.weight_kg":       "Weight",
	"open.patient.identifying":     "Identifying text",
	"gauge.cylinder":               "Cylinder",
	"gauge.pressure_pa":            "Gauge reading",
	"observe":                      "Observations",
	"observe.spo2":                 "SpO2",
	"observe.fio2":                 "FiO2",
	"observe.flow_lpm":             "O2 flow",
	"observe.resp_rate":            "Respiratory rate",
	"observe.heart_rate":           "Heart rate",
	"observe.etco2_pa":             "EtCO2",
	"observe.device":               "Device",
	"note.text":                    "Note",
	"event.text":                   "Event description",
	"close.outcome":                "Outcome",
	"reason":                       "Reason for the correction",
}

func lbFieldMessage(fe *logbook.FieldError) string {
	label := lbFieldLabels[fe.Field]
	if label == "" {
		if i := strings.IndexByte(fe.Field, '['); i > 0 {
			label = lbFieldLabels[fe.Field[:i]]
		}
	}
	if label == "" {
		label = fe.Field
	}
	return fmt.Sprintf("%s: not saved. Allowed: %s.", label, lbAllowedShown(fe.Field, fe.Allowed))
}

// lbAllowedShown gives what the vault allows for a field in the units
// the crew types the field in (allowed is the vault's own wording, kept
// for a field with no numeric range). The vault checks SI units (Pa, m, a
// fraction); the forms take psi or bar, mmHg or kPa, ft or m, and SpO2 in
// %. Both units of a pair are given, since the message does not know which
// one the crew uses. The bounds are rounded inward (the low one up, the
// high one down), so every value in the range shown is accepted.
func lbAllowedShown(field, allowed string) string {
	lo, hi, unit, ok := logbook.NumericRange(field)
	if !ok {
		return allowed
	}
	in := func(conv func(float64) float64, places int32, u string) string {
		l, ok1 := physio.Round(conv(lo), places, physio.RoundUp)
		h, ok2 := physio.Round(conv(hi), places, physio.RoundDown)
		if !ok1 || !ok2 {
			return allowed
		}
		return l.String() + " to " + h.String() + " " + u
	}
	pa := func(f func(physio.Pressure) float64) func(float64) float64 {
		return func(v float64) float64 { return f(physio.Pascals(v)) }
	}
	switch {
	case unit == "Pa" && strings.HasPrefix(field, "gauge."):
		return in(pa(physio.Pressure.Psi), 0, "psi") + " (" + in(pa(physio.Pressure.Bar), 1, "bar") + ")"
	case unit == "Pa":
		return in(pa(physio.Pressure.MmHg), 0, "mmHg") + " (" + in(pa(physio.Pressure.Kilopascals), 1, "kPa") + ")"
	case unit == "m":
		return in(func(v float64) float64 { return physio.Metres(v).Feet() }, 0, "ft") + " (" + in(func(v float64) float64 { return v }, 0, "m") + ")"
	case unit == "fraction" && field == "observe.spo2":
		return in(func(v float64) float64 { return v * 100 }, 0, "%")
	}
	return allowed
}

// lbParseRefusal words a value a form could not read (err from physio's
// parser): the field, the text as typed, and what is allowed in the crew's
// units, never the parser's own wording.
func lbParseRefusal(label, field, text string, err error) error {
	allowed := lbAllowedShown(field, logbook.AllowedRange(field))
	t := strings.TrimSpace(text)
	switch {
	case errors.Is(err, physio.ErrUnit):
		return fmt.Errorf("%s: %q is not in a unit this field takes. Allowed: %s.", label, t, allowed)
	case errors.Is(err, physio.ErrOutOfRange):
		return fmt.Errorf("%s: %q is outside what is allowed: %s.", label, t, allowed)
	}
	return errors.New(lbNotANumber(label, field, text))
}

// lbNotANumber is the message for a field whose text could not be read as
// a number: the field, the text as typed, and what is allowed in the
// crew's units.
func lbNotANumber(label, field, text string) string {
	msg := fmt.Sprintf("%s: %q is not a number.", label, strings.TrimSpace(text))
	if allowed := logbook.AllowedRange(field); allowed != "" {
		msg += " Allowed: " + lbAllowedShown(field, allowed) + "."
	}
	return msg
}

func unavailableMessage(err error) string {
	if errors.Is(err, idb.ErrUnavailable) {
		return "This browser offers no IndexedDB storage here (a private window, or storage turned off). Use a normal window to keep a logbook."
	}
	if err == nil {
		return "Storage could not be opened."
	}
	return "Storage could not be opened: " + err.Error() + "."
}

// lbClock formats a time for the timeline: local time with its zone.
func lbClock(t time.Time) string { return t.Local().Format("15:04:05") }

// lbDayAndClock formats a time for the list.
func lbDayAndClock(t time.Time) string {
	if t.IsZero() {
		return "—"
	}
	return t.Local().Format("2006-01-02 15:04")
}

// lbBytesText gives a byte count in MB or GB with one decimal (decimal
// units, 1 MB = 10^6 bytes, as browsers report storage).
func lbBytesText(n int64) string {
	if n >= 1e9 {
		return fmt.Sprintf("%.1f GB", float64(n)/1e9)
	}
	return fmt.Sprintf("%.1f MB", float64(n)/1e6)
}

// lbWithUnit appends unit to a bare number, so "1800" typed under a psi
// display is read as "1800 psi"; a text with its own unit keeps it.
func lbWithUnit(text, unit string) string {
	t := strings.TrimSpace(text)
	if t == "" {
		return t
	}
	for _, r := range t {
		if r == '%' || r >= 'A' && r <= 'Z' || r >= 'a' && r <= 'z' || r == '°' {
			return t
		}
	}
	return t + " " + unit
}

// lbPressureText formats a pressure in the display unit.
func lbPressureText(p physio.Pressure, unit string) string {
	if unit == UnitBar {
		return fmt.Sprintf("%.1f bar", p.Bar())
	}
	return fmt.Sprintf("%.0f psi", p.Psi())
}

// lbGasText formats a gas partial pressure in the display unit.
func lbGasText(p physio.Pressure, unit string) string {
	if unit == UnitKPa {
		return fmt.Sprintf("%.1f kPa", p.Kilopascals())
	}
	return fmt.Sprintf("%.0f mmHg", p.MmHg())
}

// lbAltitudeText formats an altitude in the display unit.
func lbAltitudeText(a physio.Altitude, unit string) string {
	if unit == UnitM {
		return fmt.Sprintf("%.0f m", a.Metres())
	}
	return fmt.Sprintf("%.0f ft", a.Feet())
}

// lbErrNoFile: no file was chosen in a file input.
var lbErrNoFile = errors.New("ui: no file chosen")

// lbClearInputs empties the inputs with these ids in the page. go-app does
// not clear a field whose value goes back to "" once the person has typed
// in it (an empty value attribute is dropped, not set), so a saved entry's
// form is emptied here, and a passphrase field after each attempt.
func lbClearInputs(ids ...string) {
	for _, id := range ids {
		if el := app.Window().GetElementByID(id); el.Truthy() {
			el.Set("value", "")
		}
	}
}
