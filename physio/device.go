package physio

import (
	"math"
	"sort"
	"strconv"
)

// Device is an oxygen delivery device.
type Device string

// Delivery devices.
const (
	NasalCannula  Device = "nasal_cannula"
	SimpleMask    Device = "simple_mask"
	NonRebreather Device = "non_rebreather"
	Venturi       Device = "venturi"
	Blender       Device = "blender"
	HighFlow      Device = "high_flow"
	Ventilator    Device = "ventilator"
)

// deviceList names the accepted devices for error messages.
const deviceList = "nasal_cannula, simple_mask, non_rebreather, venturi, blender, high_flow, ventilator"

// FiO2Range is the span of inspired oxygen fraction a device is expected to
// deliver. Low-flow devices are shown as a range, never as one
// false-precise number: what the patient breathes depends on how they
// breathe.
type FiO2Range struct{ Low, High Fraction }

// Air's oxygen fraction, as used in entrainment and mixing formulas.
const deviceAirO2 = 0.21

// deviceLowFlow describes a low-flow device by its published flow and FiO2
// ranges (BTS guideline for oxygen use in adults, Thorax 2017;72(Suppl 1)).
type deviceLowFlow struct {
	minFlow, maxFlow  float64 // L/min
	lowFiO2, highFiO2 float64
	flowQuantity      string // names the device's flow in errors
}

var deviceLowFlowTable = map[Device]deviceLowFlow{
	NasalCannula:  {1, 6, 0.24, 0.44, "nasal cannula oxygen flow"},    // BTS 2017: 1–6 L/min ≈ 24–44 %
	SimpleMask:    {5, 10, 0.40, 0.60, "simple mask oxygen flow"},     // BTS 2017: 5–10 L/min 40–60 %; below 5, CO2 rebreathing
	NonRebreather: {10, 15, 0.60, 0.90, "non-rebreather oxygen flow"}, // BTS 2017: 10–15 L/min 60–90 %
}

// DeviceFiO2Band is the half-width of the FiO2 range shown for a low-flow
// device around its estimate at a given flow: ±0.04, one step of the
// cannula's +0.04 per L/min rule. It stands for the patient-to-patient
// variation (minute volume, mouth breathing, mask fit). This band is
// Alvea's convention on top of common practice, not a published figure.
const DeviceFiO2Band = 0.04

// Ranges of set-ups other than the low-flow devices.
const (
	// HighFlowMinTotal and HighFlowMaxTotal bound the total flow of a
	// high-flow nasal cannula for adults (common practice: 10–60 L/min).
	HighFlowMinTotal Flow = 10
	HighFlowMaxTotal Flow = 60

	deviceMinFlow = 0.01  // L/min, any flow meter
	deviceMaxFlow = 200.0 // L/min, beyond any single oxygen outlet
)

// VenturiSettings are the fixed FiO2 values of common Venturi adapters
// (BTS 2017: 24, 28, 31, 35, 40 and 60 %).
// It is a copy: changing it changes nothing in this package.
var VenturiSettings = append([]Fraction(nil), deviceVenturiSettings[:]...)

var deviceVenturiSettings = [...]Fraction{0.24, 0.28, 0.31, 0.35, 0.40, 0.60}

// deviceVenturiMinFlow is the minimum oxygen flow printed for each setting
// on common adapters (common practice, recalled and not confirmed against a
// published table; the adapter's own label wins).
var deviceVenturiMinFlow = [len(deviceVenturiSettings)]float64{2, 4, 6, 8, 10, 15}

// VenturiMinimumFlow returns the minimum oxygen flow commonly printed for a
// standard Venturi setting (0.24 → 2, 0.28 → 4, 0.31 → 6, 0.35 → 8,
// 0.40 → 10, 0.60 → 15 L/min; common practice — the adapter's own label
// wins). A setting not in VenturiSettings returns a *ParseError that unwraps
// to ErrOutOfRange.
func VenturiMinimumFlow(setting Fraction) (Flow, error) {
	i := deviceVenturiIndex(setting)
	if i < 0 {
		return 0, &ParseError{Quantity: "Venturi setting", Input: strconv.FormatFloat(float64(setting), 'g', 6, 64),
			Want: "0.24, 0.28, 0.31, 0.35, 0.40, 0.60", Err: ErrOutOfRange}
	}
	return Flow(deviceVenturiMinFlow[i]), nil
}

func deviceVenturiIndex(setting Fraction) int {
	for i, s := range deviceVenturiSettings {
		if math.Abs(float64(setting-s)) < 1e-9 {
			return i
		}
	}
	return -1
}

// DeviceFlowRange returns the oxygen flow range a device is used at, in
// L/min: nasal cannula 1–6, simple mask 5–10, non-rebreather 10–15 (BTS
// 2017), Venturi 2–15 (the minimum flows of its settings), high-flow
// 10–60 total (adults, common practice). ok is false for a blender and a
// ventilator (their flow is set by what they feed) and for an unknown device.
func DeviceFlowRange(d Device) (min, max Flow, ok bool) {
	if lf, found := deviceLowFlowTable[d]; found {
		return Flow(lf.minFlow), Flow(lf.maxFlow), true
	}
	switch d {
	case Venturi:
		return Flow(deviceVenturiMinFlow[0]), Flow(deviceVenturiMinFlow[len(deviceVenturiMinFlow)-1]), true
	case HighFlow:
		return HighFlowMinTotal, HighFlowMaxTotal, true
	}
	return 0, 0, false
}

// DeviceFiO2 returns the FiO2 range a device delivers at an oxygen flow.
//
// Low-flow devices (BTS guideline for oxygen use in adults, Thorax
// 2017;72(Suppl 1)): nasal cannula 1–6 L/min ≈ 0.24–0.44, simple mask
// 5–10 L/min 0.40–0.60, non-rebreather 10–15 L/min 0.60–0.90. The estimate
// at a flow is the linear interpolation across the published range — for
// the cannula exactly the common-practice 0.24 at 1 L/min plus 0.04 per
// L/min — shown as estimate ± DeviceFiO2Band, not below air (0.21) nor above
// the device's published maximum.
//
// Venturi: the FiO2 is set by the adapter, not the flow; the range runs from
// 0.24 to the highest setting whose minimum flow (VenturiMinimumFlow) the
// flow reaches. Blender (any flow 0.01–200 L/min) and high-flow (10–60 L/min
// total): the FiO2 is set on the device, 0.21–1.0.
//
// Flow outside the device's range: a *RangeError naming the device, range
// and L/min. Unknown device: a *ParseError. Ventilator: an *ImpossibleError
// (its FiO2 is set on it; see VentilatorOxygen). Unrounded: show Low rounded
// down and High rounded up so that the range never looks narrower.
func DeviceFiO2(d Device, flow Flow) (FiO2Range, error) {
	if lf, ok := deviceLowFlowTable[d]; ok {
		if err := checkRange(lf.flowQuantity, flow.LitresPerMinute(), lf.minFlow, lf.maxFlow, "L/min"); err != nil {
			return FiO2Range{}, err
		}
		est := deviceLowFlowEstimate(lf, flow.LitresPerMinute())
		return FiO2Range{
			Low:  Fraction(math.Max(deviceAirO2, est-DeviceFiO2Band)),
			High: Fraction(math.Min(lf.highFiO2, est+DeviceFiO2Band)),
		}, nil
	}
	switch d {
	case Venturi:
		min, max, _ := DeviceFlowRange(d)
		if err := checkRange("Venturi oxygen flow", flow.LitresPerMinute(), min.LitresPerMinute(), max.LitresPerMinute(), "L/min"); err != nil {
			return FiO2Range{}, err
		}
		high := deviceVenturiSettings[0]
		for i, s := range deviceVenturiSettings {
			if flow.LitresPerMinute() >= deviceVenturiMinFlow[i] {
				high = s
			}
		}
		return FiO2Range{Low: deviceVenturiSettings[0], High: high}, nil
	case Blender:
		if err := checkRange("blender flow", flow.LitresPerMinute(), deviceMinFlow, deviceMaxFlow, "L/min"); err != nil {
			return FiO2Range{}, err
		}
		return FiO2Range{Low: deviceAirO2, High: 1}, nil
	case HighFlow:
		if err := checkRange("high-flow total flow", flow.LitresPerMinute(), float64(HighFlowMinTotal), float64(HighFlowMaxTotal), "L/min"); err != nil {
			return FiO2Range{}, err
		}
		return FiO2Range{Low: deviceAirO2, High: 1}, nil
	case Ventilator:
		return FiO2Range{}, &ImpossibleError{What: "device FiO2 for a ventilator", Reason: "the FiO2 is set on the ventilator; use VentilatorOxygen for its oxygen use"}
	}
	return FiO2Range{}, &ParseError{Quantity: "device", Input: string(d), Want: deviceList, Err: ErrSyntax}
}

// deviceLowFlowEstimate interpolates the published FiO2 range linearly over
// the published flow range.
func deviceLowFlowEstimate(lf deviceLowFlow, flow float64) float64 {
	return lf.lowFiO2 + (lf.highFiO2-lf.lowFiO2)*(flow-lf.minFlow)/(lf.maxFlow-lf.minFlow)
}

// VenturiEntrainmentRatio returns the air-to-oxygen entrainment ratio of a
// Venturi (air-entrainment) device set to fio2:
//
//	air:O2 = (1 − FiO2) / (FiO2 − 0.21)
//
// (common practice, from a mass balance of oxygen). fio2 0.22–1.0; outside:
// a *RangeError (at 0.21 nothing but air would be entrained). 1.0 gives 0.
// Unrounded; informational, round to nearest.
func VenturiEntrainmentRatio(fio2 Fraction) (float64, error) {
	if err := checkRange("Venturi FiO2", float64(fio2), 0.22, 1, ""); err != nil {
		return 0, err
	}
	return (1 - float64(fio2)) / (float64(fio2) - deviceAirO2), nil
}

// VenturiTotalFlow returns the total gas flow leaving a Venturi device in
// L/min: oxygen flow × (1 + entrainment ratio). o2 0.01–200 L/min, fio2
// 0.22–1.0; outside: a *RangeError. Unrounded: round DOWN when checking
// that the total meets the patient's inspiratory flow.
func VenturiTotalFlow(o2 Flow, fio2 Fraction) (Flow, error) {
	if err := checkRange("Venturi oxygen flow", o2.LitresPerMinute(), deviceMinFlow, deviceMaxFlow, "L/min"); err != nil {
		return 0, err
	}
	ratio, err := VenturiEntrainmentRatio(fio2)
	if err != nil {
		return 0, err
	}
	return Flow(o2.LitresPerMinute() * (1 + ratio)), nil
}

// BlendFiO2 returns the oxygen fraction of a mix of oxygen and air flows:
//
//	FiO2 = (Q_O2 + 0.21·Q_air) / (Q_O2 + Q_air)
//
// o2 and air 0–200 L/min each, together at least 0.01 L/min; outside: a
// *RangeError. Unrounded: it is an FiO2 delivered, so round DOWN when
// showing whether it meets a need.
func BlendFiO2(o2, air Flow) (Fraction, error) {
	if err := checkRange("oxygen flow", o2.LitresPerMinute(), 0, deviceMaxFlow, "L/min"); err != nil {
		return 0, err
	}
	if err := checkRange("air flow", air.LitresPerMinute(), 0, deviceMaxFlow, "L/min"); err != nil {
		return 0, err
	}
	total := o2.LitresPerMinute() + air.LitresPerMinute()
	if err := checkRange("total blended flow", total, deviceMinFlow, 2*deviceMaxFlow, "L/min"); err != nil {
		return 0, err
	}
	return Fraction((o2.LitresPerMinute() + deviceAirO2*air.LitresPerMinute()) / total), nil
}

// OxygenShareOfBlend returns the oxygen flow in L/min inside a total flow
// blended from oxygen and air to fio2:
//
//	Q_O2 = Q_total · (FiO2 − 0.21) / 0.79
//
// total 0.01–200 L/min, fio2 0.21–1.0; outside: a *RangeError. Unrounded:
// it is oxygen used, round UP.
func OxygenShareOfBlend(total Flow, fio2 Fraction) (Flow, error) {
	if err := checkRange("total flow", total.LitresPerMinute(), deviceMinFlow, deviceMaxFlow, "L/min"); err != nil {
		return 0, err
	}
	return deviceShare(total, fio2)
}

func deviceShare(total Flow, fio2 Fraction) (Flow, error) {
	if err := checkRange("FiO2", float64(fio2), deviceAirO2, 1, ""); err != nil {
		return 0, err
	}
	return Flow(total.LitresPerMinute() * deviceOxygenShare(fio2)), nil
}

// deviceOxygenShare is (F − 0.21)/0.79, computed so that F = 1 gives
// exactly 1 (both differences are rounded the same way).
func deviceOxygenShare(fio2 Fraction) float64 {
	air := float64(deviceAirO2)
	return (float64(fio2) - air) / (1 - air)
}

// HighFlowOxygen returns the oxygen flow in L/min a high-flow nasal cannula
// draws at a total flow and FiO2, by the same blend share as
// OxygenShareOfBlend. total must lie in HighFlowMinTotal–HighFlowMaxTotal
// (10–60 L/min, adults, common practice) and fio2 in 0.21–1.0; outside: a
// *RangeError. Unrounded: oxygen used, round UP.
func HighFlowOxygen(total Flow, fio2 Fraction) (Flow, error) {
	if err := checkRange("high-flow total flow", total.LitresPerMinute(), float64(HighFlowMinTotal), float64(HighFlowMaxTotal), "L/min"); err != nil {
		return 0, err
	}
	return deviceShare(total, fio2)
}

// SetUp is one way to deliver an FiO2: a device at an oxygen flow, the FiO2
// range it is expected to give, and the total gas flow the patient
// receives (equal to Flow for low-flow devices; the entrained total for a
// Venturi; the set total for high-flow).
type SetUp struct {
	Device    Device
	Flow      Flow // oxygen drawn from the supply, L/min
	FiO2      FiO2Range
	TotalFlow Flow
}

// highFlowSetUpTotals are the total flows offered for high-flow: the common
// adult starting flow and the top of the adult range (common practice).
var highFlowSetUpTotals = []Flow{30, HighFlowMaxTotal}

// SetUpsFor lists the set-ups whose FiO2 covers a needed FiO2 — options for
// the crew, not orders; local protocol and medical direction decide. Sorted
// by oxygen flow ascending (ties keep the order: cannula, mask,
// non-rebreather, Venturi, high-flow).
//
//   - Cannula (1–6 L/min), simple mask (5–10) and non-rebreather (10–15)
//     at each whole L/min whose DeviceFiO2 range holds needed.
//   - Venturi: the lowest setting at or above needed, at its minimum flow.
//   - High-flow at 30 and 60 L/min total, set to needed.
//
// needed must be above 0.21 and at most 1.0: at or below air no
// supplemental oxygen is needed and the result is nil, as it is for NaN or
// values above 1. Blenders and ventilators are not listed: their oxygen use
// depends on what they feed (see BlendFiO2, VentilatorOxygen).
func SetUpsFor(needed Fraction) []SetUp {
	n := float64(needed)
	if !(n > deviceAirO2 && n <= 1) {
		return nil
	}
	var out []SetUp
	for _, d := range []Device{NasalCannula, SimpleMask, NonRebreather} {
		lf := deviceLowFlowTable[d]
		for f := lf.minFlow; f <= lf.maxFlow; f++ {
			r, err := DeviceFiO2(d, Flow(f))
			if err != nil {
				continue
			}
			// 1e-9 keeps float noise in the band limits (0.32 computed as
			// 0.3199…) from dropping a set-up at the edge.
			if float64(r.Low)-1e-9 <= n && n <= float64(r.High)+1e-9 {
				out = append(out, SetUp{Device: d, Flow: Flow(f), FiO2: r, TotalFlow: Flow(f)})
			}
		}
	}
	for i, s := range deviceVenturiSettings {
		if float64(s) >= n-1e-9 {
			o2 := Flow(deviceVenturiMinFlow[i])
			total, err := VenturiTotalFlow(o2, s)
			if err == nil {
				out = append(out, SetUp{Device: Venturi, Flow: o2, FiO2: FiO2Range{s, s}, TotalFlow: total})
			}
			break
		}
	}
	for _, total := range highFlowSetUpTotals {
		o2, err := HighFlowOxygen(total, needed)
		if err == nil {
			out = append(out, SetUp{Device: HighFlow, Flow: o2, FiO2: FiO2Range{needed, needed}, TotalFlow: total})
		}
	}
	// Sort on flows rounded to 1e-6 L/min so that float noise (2.9999… from
	// a blend share) does not reorder set-ups of the same flow.
	key := func(f Flow) float64 { return math.Round(f.LitresPerMinute() * 1e6) }
	sort.SliceStable(out, func(i, j int) bool { return key(out[i].Flow) < key(out[j].Flow) })
	return out
}
