package ui

import (
	"strconv"
	"strings"

	"alvea/physio"
)

// inUnits returns a sentence from physio (a warning of the plan) in the
// Brief's display units (inDisplayUnits).
func (s *briefState) inUnits(msg string) string { return inDisplayUnits(s.settings, msg) }

// inDisplayUnits returns a sentence from physio (a warning of the plan, a
// problem the plan reports) with its altitudes and gas pressures also
// given in the crew's display units.
// physio writes its sentences in feet and mmHg, the units of the plan
// document; a crew reading metres or kPa gets the converted value first
// and physio's own in brackets: "above 2438 m (8000 ft)". The original
// stays, so the sentence still matches the figures of the plan and any
// limit quoted from a rule in feet. A converted value is rounded to the
// nearest (to the metre, to 0.1 kPa): it stands beside the exact one.
func inDisplayUnits(settings Settings, msg string) string {
	toM := settings.AltitudeUnit == UnitM
	toKPa := settings.GasUnit == UnitKPa
	if !toM && !toKPa {
		return msg
	}
	var b strings.Builder
	done := 0 // msg[:done] is written to b
	for j := 0; j < len(msg); {
		start, end := numberAt(msg, j)
		if end == start {
			j++
			continue
		}
		rest := msg[end:]
		var conv string
		switch {
		case toM && unitAt(rest, " ft"):
			if x, err := strconv.ParseFloat(msg[start:end], 64); err == nil {
				if d, ok := physio.Round(physio.Feet(x).Metres(), 0, physio.RoundNearest); ok {
					conv = d.String() + " m (" + msg[start:end] + " ft)"
				}
			}
			rest = " ft"
		case toKPa && unitAt(rest, " mmHg"):
			if x, err := strconv.ParseFloat(msg[start:end], 64); err == nil {
				if d, ok := physio.Round(physio.MmHg(x).Kilopascals(), 1, physio.RoundNearest); ok {
					conv = d.String() + " kPa (" + msg[start:end] + " mmHg)"
				}
			}
			rest = " mmHg"
		}
		if conv == "" {
			j = end
			continue
		}
		b.WriteString(msg[done:start])
		b.WriteString(conv)
		done = end + len(rest)
		j = done
	}
	if done == 0 {
		return msg
	}
	b.WriteString(msg[done:])
	return b.String()
}

// numberAt returns the bounds of a decimal number (an optional minus, digits,
// an optional fraction) starting at msg[i], or i, i when none starts there.
// A number must not continue a word or another number ("A320", "25.841").
func numberAt(msg string, i int) (start, end int) {
	if i > 0 {
		if c := msg[i-1]; isDigit(c) || c == '.' || c == '-' || isLetter(c) {
			return i, i
		}
	}
	k := i
	if k < len(msg) && msg[k] == '-' {
		k++
	}
	d := k
	for k < len(msg) && isDigit(msg[k]) {
		k++
	}
	if k == d {
		return i, i
	}
	if k+1 < len(msg) && msg[k] == '.' && isDigit(msg[k+1]) {
		k++
		for k < len(msg) && isDigit(msg[k]) {
			k++
		}
	}
	return i, k
}

// unitAt reports whether rest starts with unit as a whole word.
func unitAt(rest, unit string) bool {
	return strings.HasPrefix(rest, unit) && (len(rest) == len(unit) || !isLetter(rest[len(unit)]) && !isDigit(rest[len(unit)]))
}

func isDigit(c byte) bool  { return c >= '0' && c <= '9' }
func isLetter(c byte) bool { return c >= 'a' && c <= 'z' || c >= 'A' && c <= 'Z' }
