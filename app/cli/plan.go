// Package cli holds Alvea's terminal subcommands. Each is a function of its
// arguments and standard streams that returns the process exit status, so
// that app/main.go only dispatches and tests run them in-process.
package cli

import (
	"encoding/json"
	"errors"
	"fmt"
	"io"
	"os"
	"strings"
	"text/tabwriter"

	"alvea/physio"
)

// Exit statuses of `alvea plan`.
const (
	ExitGo          = 0 // the plan is a go (possibly with cautions to read)
	ExitNoGo        = 1 // the plan computed, and it is a no-go
	ExitUsage       = 2 // bad arguments, unreadable file, or a bad plan document
	ExitEngineError = 3 // the document was valid but the engine could not compute it (a bug: please report), or the brief could not be written
)

const planUsage = `usage: alvea plan [--json] [--] FILE|-

Reads a plan document (JSON, version 1) from FILE, or from standard input
when FILE is -, and prints the brief: a GO / NO-GO line, then the numbers
with their units, the warnings and a caution. --json prints the result
document instead.

Exit status: 0 go (read any cautions), 1 no-go, 2 usage error or bad plan
document (each problem named by its path, value, range and unit), 3 engine
error or the brief could not be written out.
`

// Plan runs `alvea plan [--json] FILE|-`. See planUsage for the exit
// statuses.
func Plan(args []string, stdin io.Reader, stdout, stderr io.Writer) int {
	asJSON := false
	file := ""
	files := 0
	options := true // until "--": what follows it is a FILE even when it starts with -
	for _, a := range args {
		switch {
		case options && a == "--":
			options = false
		case options && (a == "--json" || a == "-json"):
			asJSON = true
		case options && (a == "-h" || a == "--help" || a == "-help"):
			fmt.Fprint(stdout, planUsage)
			return ExitGo
		case a == "-":
			file = a
			files++
		case options && strings.HasPrefix(a, "-"):
			fmt.Fprintf(stderr, "alvea plan: unknown option %s\n%s", a, planUsage)
			return ExitUsage
		default:
			file = a
			files++
		}
	}
	if files != 1 {
		fmt.Fprintf(stderr, "alvea plan: want exactly one FILE (or - for standard input)\n%s", planUsage)
		return ExitUsage
	}
	name := file
	var r io.Reader = stdin
	if file == "-" {
		name = "standard input"
	} else {
		f, err := os.Open(file)
		if err != nil {
			fmt.Fprintf(stderr, "alvea plan: %v\n", err)
			return ExitUsage
		}
		defer f.Close()
		r = f
	}
	data, err := io.ReadAll(io.LimitReader(r, physio.MaxPlanDocumentBytes+1))
	if err != nil {
		fmt.Fprintf(stderr, "alvea plan: reading %s: %v\n", name, err)
		return ExitUsage
	}
	doc, err := physio.ParsePlan(data)
	if err != nil {
		reportPlanErrors(stderr, name, err)
		return ExitUsage
	}
	res, err := physio.ComputePlan(doc)
	if err != nil {
		var pe physio.PlanErrors
		if errors.As(err, &pe) {
			reportPlanErrors(stderr, name, err)
			return ExitUsage
		}
		fmt.Fprintf(stderr, "alvea plan: %s: %v\n", name, err)
		return ExitEngineError
	}
	out := &stickyWriter{w: stdout}
	if asJSON {
		enc := json.NewEncoder(out)
		enc.SetIndent("", "  ")
		if err := enc.Encode(res); err != nil && out.err == nil {
			fmt.Fprintf(stderr, "alvea plan: %v\n", err)
			return ExitEngineError
		}
	} else {
		writeBrief(out, doc, res)
	}
	if out.err != nil {
		fmt.Fprintf(stderr, "alvea plan: write standard output: %v\n", out.err)
		return ExitEngineError
	}
	if !res.Go {
		return ExitNoGo
	}
	return ExitGo
}

func reportPlanErrors(w io.Writer, name string, err error) {
	var pe physio.PlanErrors
	if !errors.As(err, &pe) {
		fmt.Fprintf(w, "alvea plan: %s: %v\n", name, err)
		return
	}
	noun := "problems"
	if len(pe) == 1 {
		noun = "problem"
	}
	fmt.Fprintf(w, "alvea plan: %s: %d %s in the plan document:\n", name, len(pe), noun)
	for _, fe := range pe {
		fmt.Fprintf(w, "  %s\n", printable(fe.Error()))
	}
}

// writeBrief prints the brief a crew reads before lift-off.
func writeBrief(w io.Writer, doc *physio.PlanDocument, r *physio.PlanResult) {
	fmt.Fprintln(w, statusLine(r))
	if r.Title != "" {
		fmt.Fprintf(w, "Plan: %s\n", printable(r.Title))
	}
	fmt.Fprintf(w, "Engine %s, plan document version %d\n\n", r.EngineVersion, r.DocumentVersion)

	fmt.Fprintln(w, "Route")
	tw := tabwriter.NewWriter(w, 0, 0, 2, ' ', tabwriter.AlignRight)
	fmt.Fprintf(tw, "  origin\t%s ft\t\n", fmtFt(*doc.Route.OriginElevationFt))
	fmt.Fprintf(tw, "  destination\t%s ft\t\n", fmtFt(*doc.Route.DestinationElevationFt))
	if r.CabinAltitudeFt != nil {
		how := "unpressurised: cabin = cruise"
		switch {
		case doc.Route.CabinAltitudeFt != nil:
			how = "as stated"
		case r.Pressurised:
			how = fmt.Sprintf("cruise %s ft, max differential %s psi", fmtFt(*doc.Route.CruiseAltitudeFt), fmtNum(*doc.Route.MaxDifferentialPsi))
		}
		fmt.Fprintf(tw, "  cabin\t%s ft\t  (%s)\n", r.CabinAltitudeFt, how)
	}
	hl := r.Legs[r.HighestLeg]
	fmt.Fprintf(tw, "  highest\t%s ft\t  (leg %d, %s)\n", r.HighestAltitudeFt, hl.Index+1, hl.Where)
	tw.Flush()

	g := r.Ground
	fmt.Fprintf(w, "\nPatient on the ground (%s, %s ft, %s mmHg)\n", g.MeasuredAt, g.AltitudeFt, g.PressureMmHg)
	pao2 := fmt.Sprintf("PaO2 %s mmHg (measured)", g.PaO2MmHg)
	if g.PaO2Source == "from_spo2" {
		pao2 = fmt.Sprintf("PaO2 %s mmHg (estimated from SpO2 %s %%)", g.PaO2MmHg, g.SpO2Percent)
	}
	fmt.Fprintf(w, "  FiO2 %s, %s, PaCO2 %s mmHg, PAO2 %s mmHg, a/A %s, A-a gradient %s mmHg\n",
		g.FiO2, pao2, g.PaCO2MmHg, g.AlveolarPO2MmHg, g.AARatio, g.AaGradientMmHg)

	fmt.Fprintln(w, "\nLegs (PAO2, PaO2 and SpO2 expected at the low end of the set-up's FiO2)")
	tw = tabwriter.NewWriter(w, 0, 0, 2, ' ', tabwriter.AlignRight)
	fmt.Fprintln(tw, "  #\twhere\tmin\taltitude ft\tPB mmHg\tset-up\tFiO2 set\tFiO2 needed\tPAO2 mmHg\tPaO2 mmHg\tSpO2 %\tO2 L/min\tO2 L\t")
	for i, l := range r.Legs {
		fio2 := l.FiO2DeliveredLow.String()
		if l.FiO2DeliveredHigh.Cmp(l.FiO2DeliveredLow.Decimal) != 0 {
			fio2 += "-" + l.FiO2DeliveredHigh.String()
		}
		need := l.FiO2Needed.String()
		if !l.FiO2Possible {
			need += " !"
		} else if !l.Delivers {
			need += " *"
		}
		fmt.Fprintf(tw, "  %d\t%s\t%s\t%s\t%s\t%s\t%s\t%s\t%s\t%s\t%s\t%s\t%s\t\n", l.Index+1, l.Where, l.Minutes,
			l.AltitudeFt, l.PressureMmHg, setUp(doc.Legs[i].Oxygen), fio2, need, l.PAO2MmHg,
			l.PaO2ExpectedMmHg, l.SpO2ExpectedPercent, l.OxygenLpm, l.OxygenL)
	}
	tw.Flush()
	fmt.Fprintln(w, "  (* the set-up may deliver less than needed; ! even FiO2 1.0 cannot hold the ground state)")
	for _, l := range r.Legs {
		if len(l.Options) == 0 {
			continue
		}
		fmt.Fprintf(w, "  Leg %d options (not orders; local protocol and medical direction decide):\n", l.Index+1)
		for _, o := range l.Options {
			fmt.Fprintf(w, "    - %s\n", printable(strings.TrimPrefix(o.Label, "option: ")))
		}
	}

	fmt.Fprintln(w, "\nLimits")
	possible := "yes"
	if !r.FiO2Possible {
		possible = "NO"
	}
	fmt.Fprintf(w, "  FiO2 needed at the highest leg: %s (reachable: %s)\n", r.FiO2Needed, possible)
	fmt.Fprintf(w, "  FiO2 1.0 holds the ground state up to a cabin altitude of %s ft\n", r.MaxCabinAltitudeFt)
	if r.MaxCruiseAltitudeFt != nil {
		ceiling := ""
		if r.MaxCruiseAtCeiling {
			ceiling = " (or higher: the atmosphere model ends there)"
		}
		fmt.Fprintf(w, "  highest cruise keeping that cabin: %s ft%s\n", r.MaxCruiseAltitudeFt, ceiling)
	}

	fmt.Fprintln(w, "\nOxygen")
	tw = tabwriter.NewWriter(w, 0, 0, 2, ' ', tabwriter.AlignRight)
	fmt.Fprintf(tw, "  calculated need\t%s L\t\n", r.OxygenCalculatedL)
	fmt.Fprintf(tw, "  needed with reserve\t%s L\t  (× %s + %s min at the highest flow)\n", r.OxygenNeededL, r.ReserveFactor, r.ReserveMinutes)
	residual := r.ResidualPsi.String() + " psi"
	if doc.Policy != nil && doc.Policy.ResidualBar != nil {
		residual = r.ResidualBar.String() + " bar"
	}
	fmt.Fprintf(tw, "  usable on board\t%s L\t  (above a %s residual in each cylinder)\n", r.OxygenUsableL, residual)
	margin := r.OxygenMarginL.String()
	if r.OxygenMarginL.Sign() > 0 {
		margin = "+" + margin
	}
	fmt.Fprintf(tw, "  margin\t%s L\t\n", margin)
	fmt.Fprintf(tw, "  transport\t%s min\t\n", r.TransportMinutes)
	if r.SupplyExhaustedMin != nil {
		fmt.Fprintf(tw, "  supply reaches residual at\tminute %s\t\n", r.SupplyExhaustedMin)
	}
	tw.Flush()
	if len(r.Cylinders) > 0 {
		fmt.Fprintln(w, "  Cylinders, in the order listed (each used to its residual before the next):")
		tw = tabwriter.NewWriter(w, 0, 0, 2, ' ', 0)
		for _, cy := range r.Cylinders {
			when := "not emptied during the transport"
			if cy.ChangeMinute != nil {
				when = fmt.Sprintf("reaches residual at minute %s", cy.ChangeMinute)
				if cy.ChangeLeg != nil && *cy.ChangeLeg >= 0 {
					when += fmt.Sprintf(" (leg %d)", *cy.ChangeLeg+1)
				}
			}
			open := "not opened"
			if cy.StartMinute != nil {
				open = fmt.Sprintf("open at minute %s", cy.StartMinute)
			}
			fmt.Fprintf(tw, "    %d\t%s\tusable %s L\t%s\t%s\n", cy.Order, printable(cy.Name), cy.UsableL, open, when)
		}
		tw.Flush()
	}

	tg := r.TrappedGas
	fmt.Fprintf(w, "\nTrapped gas (origin %s ft to %s ft)\n", tg.FromAltitudeFt, tg.ToAltitudeFt)
	fmt.Fprintf(w, "  volume ×%s; a %s mL air pocket becomes %s mL; a %s mL pneumothorax becomes %s mL;\n",
		tg.Ratio, tg.CuffMl, tg.CuffAtAltitudeMl, tg.PneumothoraxMl, tg.PneumothoraxAltitudeMl)
	fmt.Fprintf(w, "  a sealed rigid space rises up to %s cmH2O above ambient\n", tg.RigidOverpressureCmH2O)
	fmt.Fprintf(w, "  %s\n", tg.Caution)

	if len(r.Assumptions) > 0 {
		fmt.Fprintln(w, "\nAssumptions")
		for _, a := range r.Assumptions {
			fmt.Fprintf(w, "  %s = %s: %s\n", printable(a.Path), printable(a.Value), printable(a.Reason))
		}
	}
	if len(r.Warnings) > 0 {
		fmt.Fprintln(w, "\nWarnings")
		for _, wn := range r.Warnings {
			fmt.Fprintf(w, "  [%s] %s: %s\n", severityWord(wn.Severity), wn.Code, printable(wn.Message))
		}
	}
	fmt.Fprintf(w, "\nCaution: %s\n", r.Caution)
}

func statusLine(r *physio.PlanResult) string {
	var codes []string
	seen := map[string]bool{}
	for _, w := range r.Warnings {
		if (r.Status == physio.StatusNoGo && w.Severity == physio.SeverityNoGo) ||
			(r.Status == physio.StatusCaution && w.Severity == physio.SeverityCaution) {
			if !seen[w.Code] {
				seen[w.Code] = true
				codes = append(codes, w.Code)
			}
		}
	}
	switch r.Status {
	case physio.StatusNoGo:
		return "NO-GO: " + strings.Join(codes, ", ")
	case physio.StatusCaution:
		return "GO, with cautions: " + strings.Join(codes, ", ")
	}
	return "GO"
}

func severityWord(s string) string {
	switch s {
	case physio.SeverityNoGo:
		return "NO-GO"
	case physio.SeverityCaution:
		return "caution"
	}
	return "info"
}

func setUp(o *physio.PlanOxygen) string {
	switch o.Device {
	case physio.RoomAir:
		return "room air"
	case physio.Ventilator:
		return fmt.Sprintf("ventilator %s L/min, %s drive", fmtNum(*o.MinuteVolumeLpm), o.Drive)
	case physio.Blender, physio.HighFlow:
		return fmt.Sprintf("%s %s L/min total", o.Device, fmtNum(*o.FlowLpm))
	}
	return fmt.Sprintf("%s %s L/min", o.Device, fmtNum(*o.FlowLpm))
}

func fmtNum(v float64) string { return strings.TrimSuffix(fmt.Sprintf("%g", v), ".0") }

func fmtFt(v float64) string { return fmt.Sprintf("%.0f", v) }
