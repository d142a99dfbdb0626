package logbook

import (
	"fmt"

	"github.com/shopspring/decimal"

	"alvea/physio"
)

// Bounds of a plan result the audit will read. The plan engine refuses
// documents outside its own ranges (1–50 legs, 1–2 880 min each, residual
// 0–1 000 psi or 0–70 bar, SpO2 target 80–100 %), so a stored result
// outside them was not produced by it. maxResultLpm is a sanity bound well
// above any device's flow in the plan (the highest is a ventilator's
// total, 140 L/min), not a clinical limit.
const (
	maxResultLegs    = 50
	maxResultMinutes = 2880
	maxResultLpm     = 1000
)

// maxResultPsi is the highest residual a plan can give, in the result's
// psi: 70 bar (1 015.3 psi, above the 1 000 psi limit in psi), rounded up.
var maxResultPsi = decimal.NewFromFloat(physio.Bar(70).Psi()).Ceil()

// implausibleResult says why a decoded Brief result cannot be one the plan
// engine produced, or "" when it can. A bundle is read from outside: fields
// left out decode as zero and any number decodes, so the audit checks
// what it reads (the oxygen figures, legs, residual and SpO2 target) before
// using any of it.
func implausibleResult(r *physio.PlanResult) string {
	if r.EngineVersion == "" {
		return "no engine version"
	}
	if n := len(r.Legs); n < 1 || n > maxResultLegs {
		return fmt.Sprintf("%d legs (a plan has 1 to %d)", n, maxResultLegs)
	}
	zero := decimal.Zero
	outside := func(v, min, max decimal.Decimal) bool { return v.Cmp(min) < 0 || v.Cmp(max) > 0 }
	maxLitres := decimal.NewFromInt(maxResultLegs * maxResultMinutes * maxResultLpm)
	sum := zero
	for i, l := range r.Legs {
		switch {
		case outside(l.Minutes.Decimal, decimal.NewFromInt(1), decimal.NewFromInt(maxResultMinutes)):
			return fmt.Sprintf("leg %d lasts %s min (1 to %d min)", i+1, l.Minutes, maxResultMinutes)
		case l.StartMinute.Sign() < 0:
			return fmt.Sprintf("leg %d starts at minute %s", i+1, l.StartMinute)
		case outside(l.OxygenLpm.Decimal, zero, decimal.NewFromInt(maxResultLpm)):
			return fmt.Sprintf("leg %d flows %s L/min (0 to %d L/min)", i+1, l.OxygenLpm, maxResultLpm)
		case outside(l.OxygenL.Decimal, zero, maxLitres):
			return fmt.Sprintf("leg %d needs %s L", i+1, l.OxygenL)
		}
		sum = sum.Add(l.OxygenL.Decimal)
	}
	for _, x := range []struct {
		name string
		v    decimal.Decimal
	}{{"calculated need", r.OxygenCalculatedL.Decimal}, {"need with reserve", r.OxygenNeededL.Decimal}, {"usable oxygen", r.OxygenUsableL.Decimal}} {
		if outside(x.v, zero, maxLitres) {
			return fmt.Sprintf("%s %s L (0 to %s L)", x.name, x.v, maxLitres)
		}
	}
	// The calculated need is the legs' litres added up, each leg and the
	// total rounded up: the two sums differ by less than one litre per leg.
	if diff := sum.Sub(r.OxygenCalculatedL.Decimal).Abs(); diff.Cmp(decimal.NewFromInt(int64(len(r.Legs)))) > 0 {
		return fmt.Sprintf("calculated need %s L is not the legs' %s L", r.OxygenCalculatedL, sum)
	}
	if r.OxygenNeededL.Cmp(r.OxygenCalculatedL.Decimal) < 0 {
		return fmt.Sprintf("need with reserve %s L is below the calculated need %s L", r.OxygenNeededL, r.OxygenCalculatedL)
	}
	if outside(r.ResidualPsi.Decimal, zero, maxResultPsi) {
		return fmt.Sprintf("residual %s psi (0 to %s psi)", r.ResidualPsi, maxResultPsi)
	}
	if outside(r.SpO2TargetPercent.Decimal, decimal.NewFromInt(80), decimal.NewFromInt(100)) {
		return fmt.Sprintf("SpO2 target %s %% (80 to 100 %%)", r.SpO2TargetPercent)
	}
	for _, c := range r.Cylinders {
		if outside(c.UsableL.Decimal, zero, maxLitres) {
			return fmt.Sprintf("cylinder %q usable %s L", c.Name, c.UsableL)
		}
	}
	return ""
}
