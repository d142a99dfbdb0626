package cli

import (
	"bufio"
	"context"
	"encoding/json"
	"errors"
	"flag"
	"fmt"
	"io"
	"math"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"text/tabwriter"
	"time"

	"golang.org/x/term"

	"alvea/app/logbook"
	"alvea/physio"
)

// Exit statuses of `alvea audit` (0 and ExitUsage as for plan).
const (
	ExitAuditOK         = 0 // verified and audited
	ExitAuditIO         = 1 // an output file, or the summary on standard output, could not be written
	ExitAuditDamaged    = 3 // the bundle failed verification (each failure named by record) or is not a bundle
	ExitAuditPassphrase = 4 // wrong passphrase (or a damaged bundle header: the two cannot be told apart)
)

const auditUsage = `usage: alvea audit BUNDLE [options]

Opens a logbook bundle read-only, verifies every record and the chain, and
prints the audit of each transport (planned against used oxygen, reserve at
arrival, patient course, deviations) and across transports.

options:
  --passphrase-file FILE  read the passphrase from the first line of FILE
                          (only the line ending, and a byte-order mark an
                          editor put at the start, are removed)
                          (otherwise: asked on the terminal without echo, or
                          one line read from standard input)
  --csv FILE              write the table as CSV (no identifying columns
                          unless --csv-include names them; a text cell
                          starting with = + - @ is written with a leading '
                          so that a spreadsheet shows it as text)
  --csv-include LIST      identifying columns to add: id,date,route,crew,patient
  --json FILE             write the whole audit as JSON
  --from DATE             transports opened on or after DATE (YYYY-MM-DD, UTC)
  --to DATE               transports opened on or before DATE (inclusive)
  --vehicle TEXT          transports whose vehicle contains TEXT
  --flag CODE             transports with deviation CODE (repeatable, or
                          comma-separated; all must be present)
  --spo2-target PERCENT   SpO2 target instead of each Brief's (50-100)
  --spo2-limit MINUTES    a run below target longer than this is a deviation
                          (default 5)

Exit status: 0 audited; 1 an output file (or standard output) could not
be written; 2 usage error or unreadable file; 3 the bundle failed
verification (what failed is printed by record) or is not a bundle; 4 wrong
passphrase.
`

// listFlag collects a repeatable, comma-separated option.
type listFlag []string

func (l *listFlag) String() string { return strings.Join(*l, ",") }
func (l *listFlag) Set(s string) error {
	for _, p := range strings.Split(s, ",") {
		if p = strings.TrimSpace(p); p != "" {
			*l = append(*l, p)
		}
	}
	return nil
}

type auditArgs struct {
	bundle, passFile, csvFile, jsonFile string
	include                             []string
	opts                                logbook.AuditOptions
	filter                              logbook.AuditFilter
}

// Audit runs `alvea audit`. See auditUsage for the options and exit
// statuses. The bundle is only ever read.
func Audit(args []string, stdin io.Reader, stdout, stderr io.Writer) int {
	a, code, ok := parseAuditArgs(args, stdout, stderr)
	if !ok {
		return code
	}
	data, err := readBundleFile(a.bundle)
	if err != nil {
		fmt.Fprintf(stderr, "alvea audit: %v\n", err)
		return ExitUsage
	}
	if a.passFile == "" {
		// A file that is not a bundle is named before anyone is asked for
		// a passphrase (with a passphrase file, OpenBundle says the same).
		if err := logbook.CheckBundle(data); err != nil {
			fmt.Fprintf(stderr, "alvea audit: %s: %v\n", filepath.Base(a.bundle), err)
			return ExitAuditDamaged
		}
	}
	pass, err := readPassphrase(a.passFile, stdin, stderr)
	if err != nil {
		fmt.Fprintf(stderr, "alvea audit: %v\n", err)
		return ExitUsage
	}
	ctx := context.Background()
	v, err := logbook.OpenBundle(ctx, data, pass)
	var damage *logbook.DamageError
	switch {
	case errors.Is(err, logbook.ErrUnlock):
		fmt.Fprintln(stderr, "alvea audit: wrong passphrase (or the bundle's header is damaged); nothing was read")
		return ExitAuditPassphrase
	case errors.Is(err, logbook.ErrBundle):
		fmt.Fprintf(stderr, "alvea audit: %s: %v\n", filepath.Base(a.bundle), err)
		return ExitAuditDamaged
	case errors.As(err, &damage):
		v.Lock()
		fmt.Fprintf(stdout, "VERIFICATION FAILED: %s\n", filepath.Base(a.bundle))
		fmt.Fprintf(stdout, "%s, by record:\n", count(len(damage.Problems), "problem"))
		for _, p := range damage.Problems {
			fmt.Fprintf(stdout, "  %-6s %s: %s\n", p.Record(), p.Kind, printable(p.Detail))
		}
		fmt.Fprintln(stdout, "No audit is printed or written from a bundle that fails verification: ask for a fresh export.")
		fmt.Fprintf(stderr, "alvea audit: %s failed verification (%s)\n", filepath.Base(a.bundle), count(len(damage.Problems), "problem"))
		return ExitAuditDamaged
	case err != nil:
		fmt.Fprintf(stderr, "alvea audit: %v\n", err)
		return ExitAuditDamaged
	}
	defer v.Lock()
	report, err := logbook.AuditVault(ctx, v, a.opts, a.filter)
	if err != nil {
		fmt.Fprintf(stderr, "alvea audit: %v\n", err)
		return ExitAuditDamaged
	}
	if !report.Chain.Verified {
		// OpenBundle verified everything; reading again must agree.
		fmt.Fprintf(stderr, "alvea audit: problems found on reading: %s\n", printable(strings.Join(report.Chain.Problems, "; ")))
		return ExitAuditDamaged
	}
	out := &stickyWriter{w: stdout}
	PrintAudit(out, filepath.Base(a.bundle), report)
	if a.jsonFile != "" {
		b, err := json.MarshalIndent(report, "", "  ")
		if err == nil {
			err = os.WriteFile(a.jsonFile, append(b, '\n'), 0o600)
		}
		if err != nil {
			fmt.Fprintf(stderr, "alvea audit: write JSON: %v\n", err)
			return ExitAuditIO
		}
	}
	if a.csvFile != "" {
		f, err := os.OpenFile(a.csvFile, os.O_WRONLY|os.O_CREATE|os.O_TRUNC, 0o600)
		if err == nil {
			err = report.WriteCSV(f, a.include)
			if cerr := f.Close(); err == nil {
				err = cerr
			}
		}
		if err != nil {
			fmt.Fprintf(stderr, "alvea audit: write CSV: %v\n", err)
			return ExitAuditIO
		}
	}
	if out.err != nil {
		fmt.Fprintf(stderr, "alvea audit: write standard output: %v\n", out.err)
		return ExitAuditIO
	}
	return ExitAuditOK
}

// count writes n things: "1 problem", "2 problems".
func count(n int, noun string) string {
	if n == 1 {
		return "1 " + noun
	}
	return fmt.Sprintf("%d %ss", n, noun)
}

// parseAuditArgs reads the command line; options may come before or after
// BUNDLE. On failure it has printed why and returns the exit status.
func parseAuditArgs(args []string, stdout, stderr io.Writer) (auditArgs, int, bool) {
	var a auditArgs
	fs := flag.NewFlagSet("alvea audit", flag.ContinueOnError)
	fs.SetOutput(io.Discard)
	fs.StringVar(&a.passFile, "passphrase-file", "", "")
	fs.StringVar(&a.csvFile, "csv", "", "")
	fs.StringVar(&a.jsonFile, "json", "", "")
	var include, flags listFlag
	fs.Var(&include, "csv-include", "")
	fs.Var(&flags, "flag", "")
	from := fs.String("from", "", "")
	to := fs.String("to", "", "")
	fs.StringVar(&a.filter.Vehicle, "vehicle", "", "")
	target := fs.Float64("spo2-target", 0, "")
	limit := fs.Float64("spo2-limit", logbook.DefaultSpO2BelowLimit.Minutes(), "")
	usage := func(format string, args ...any) (auditArgs, int, bool) {
		fmt.Fprintf(stderr, "alvea audit: "+format+"\n%s", append(args, auditUsage)...)
		return a, ExitUsage, false
	}
	var positional []string
	for {
		if err := fs.Parse(args); err != nil {
			if errors.Is(err, flag.ErrHelp) {
				fmt.Fprint(stdout, auditUsage)
				return a, ExitAuditOK, false
			}
			return usage("%v", err)
		}
		if fs.NArg() == 0 {
			break
		}
		positional = append(positional, fs.Arg(0))
		args = fs.Args()[1:]
	}
	if len(positional) != 1 {
		return usage("want exactly one BUNDLE, got %d", len(positional))
	}
	a.bundle = positional[0]
	a.include = include
	for _, c := range include {
		found := false
		for _, id := range logbook.IdentifyingColumns {
			found = found || c == id
		}
		if !found {
			return usage("--csv-include %q: allowed %s", c, strings.Join(logbook.IdentifyingColumns, ", "))
		}
	}
	if len(include) > 0 && a.csvFile == "" {
		return usage("--csv-include needs --csv FILE")
	}
	a.filter.Flags = flags
	for _, d := range []struct {
		name, text string
		into       *time.Time
		days       int
	}{{"--from", *from, &a.filter.From, 0}, {"--to", *to, &a.filter.To, 1}} {
		if d.text == "" {
			continue
		}
		t, err := time.Parse(time.DateOnly, d.text)
		if err != nil {
			return usage("%s %q: allowed a date YYYY-MM-DD", d.name, d.text)
		}
		*d.into = t.AddDate(0, 0, d.days) // --to is inclusive: before the next day
	}
	if !a.filter.From.IsZero() && !a.filter.To.IsZero() && !a.filter.From.Before(a.filter.To) {
		// Said with the dates as typed (the filter holds the day after --to).
		return usage("--to %s: allowed a date on or after --from %s", *to, *from)
	}
	given := map[string]bool{}
	fs.Visit(func(f *flag.Flag) { given[f.Name] = true })
	// A typed target is checked as typed: 0 would otherwise read as "each
	// Brief's target", which is what leaving the option out means.
	if given["spo2-target"] && (math.IsNaN(*target) || *target < 50 || *target > 100) {
		return usage("--spo2-target %g %%: allowed 50 to 100 %%", *target)
	}
	if math.IsNaN(*limit) || *limit < 0 || *limit > 24*60 {
		return usage("--spo2-limit %g min: allowed 0 to 1440 min", *limit)
	}
	a.opts = logbook.AuditOptions{SpO2TargetPercent: *target, SpO2BelowLimit: time.Duration(*limit * float64(time.Minute))}
	if a.opts.SpO2BelowLimit == 0 {
		a.opts.SpO2BelowLimit = time.Nanosecond // 0 means "any run": WithDefaults would replace a plain zero
	}
	if err := a.opts.Validate(); err != nil {
		return usage("%v", err)
	}
	if err := a.filter.Validate(); err != nil {
		return usage("%v", err)
	}
	for _, out := range []string{a.csvFile, a.jsonFile} {
		if out != "" && samePath(out, a.bundle) {
			return usage("output %s is the bundle itself: the bundle is never written", out)
		}
		if out != "" && a.passFile != "" && samePath(out, a.passFile) {
			return usage("output %s and --passphrase-file name the same file", out)
		}
	}
	if a.csvFile != "" && a.jsonFile != "" && samePath(a.csvFile, a.jsonFile) {
		return usage("--csv and --json name the same file")
	}
	return a, 0, true
}

// samePath reports whether two names are the same file (or the same
// absolute path when the first does not exist yet).
func samePath(x, y string) bool {
	sx, errx := os.Stat(x)
	sy, erry := os.Stat(y)
	if errx == nil && erry == nil {
		return os.SameFile(sx, sy)
	}
	ax, _ := filepath.Abs(x)
	ay, _ := filepath.Abs(y)
	return ax == ay
}

// readPassphrase takes the first line of file; else, on a terminal, asks
// without echo; else reads one line from stdin. Only the line ending (and
// in a file a leading byte-order mark) is removed: spaces may belong to
// the passphrase. An empty passphrase is an
// error naming where it was read (no vault has one; it is most likely the
// wrong file), not a key derivation ending in "wrong passphrase".
func readPassphrase(file string, stdin io.Reader, stderr io.Writer) (string, error) {
	if file != "" {
		f, err := os.Open(file)
		if err != nil {
			return "", err
		}
		defer f.Close()
		line, err := firstLine(f)
		// A byte-order mark is what some editors write first in a UTF-8
		// file; it is never typed into the app's passphrase field.
		line = strings.TrimPrefix(line, "\ufeff")
		switch {
		case err != nil:
			return "", fmt.Errorf("%s: %w", file, err)
		case line == "":
			return "", fmt.Errorf("%s: the first line is empty; want the bundle's passphrase on it", file)
		}
		return line, nil
	}
	if f, ok := stdin.(*os.File); ok && term.IsTerminal(int(f.Fd())) {
		fmt.Fprint(stderr, "Bundle passphrase: ")
		b, err := term.ReadPassword(int(f.Fd()))
		fmt.Fprintln(stderr)
		if err != nil {
			return "", fmt.Errorf("read passphrase: %w", err)
		}
		if len(b) == 0 {
			return "", errors.New("the passphrase typed is empty")
		}
		return string(b), nil
	}
	line, err := firstLine(stdin)
	switch {
	case errors.Is(err, io.EOF):
		return "", errors.New("no passphrase: give --passphrase-file FILE, or one line on standard input")
	case err != nil:
		return "", fmt.Errorf("standard input: %w", err)
	case line == "":
		return "", errors.New("standard input: the passphrase line is empty")
	}
	return line, nil
}

// maxPassphraseLine bounds the line read as a passphrase, so that a wrong
// file, or /dev/zero, is not read whole into memory. The vault sets no
// upper length; this is far above anything typed or pasted.
const maxPassphraseLine = 64 << 10

// firstLine reads r's first line without its line ending; io.EOF when r
// is empty. A line longer than maxPassphraseLine bytes is an error.
func firstLine(r io.Reader) (string, error) {
	line, err := bufio.NewReader(io.LimitReader(r, maxPassphraseLine+2)).ReadString('\n')
	if err != nil && (err != io.EOF || line == "") {
		return "", err
	}
	line = strings.TrimSuffix(strings.TrimSuffix(line, "\n"), "\r")
	if len(line) > maxPassphraseLine {
		return "", fmt.Errorf("the first line is longer than %d bytes; want the bundle's passphrase on it", maxPassphraseLine)
	}
	return line, nil
}

// maxBundleBytes bounds what is read as a bundle: far above any logbook's
// export (a record is at most 2 MiB, most are a few kB), it keeps a wrong
// path such as /dev/zero from filling memory. A variable for the tests.
var maxBundleBytes int64 = 1 << 30

// readBundleFile reads the bundle at path, refusing one larger than
// maxBundleBytes.
func readBundleFile(path string) ([]byte, error) {
	f, err := os.Open(path)
	if err != nil {
		return nil, err
	}
	defer f.Close()
	data, err := io.ReadAll(io.LimitReader(f, maxBundleBytes+1))
	if err != nil {
		return nil, fmt.Errorf("read %s: %w", path, err)
	}
	if int64(len(data)) > maxBundleBytes {
		return nil, fmt.Errorf("%s: larger than %d bytes: not a logbook bundle", path, maxBundleBytes)
	}
	return data, nil
}

// PrintAudit writes the text summary: each transport, then the table,
// totals and distributions across transports, then the caution.
func PrintAudit(w io.Writer, name string, r *logbook.AuditReport) {
	o := r.Options
	fmt.Fprintf(w, "Audit of %s: chain verified, %d records, head %s\n", name, r.Chain.Records, r.Chain.Head)
	fmt.Fprintf(w, "Audit rules %s; SpO2 run limit %s min; cylinder change tolerance %s min; arrival gauge window %s min\n",
		r.AuditVersion, minutes(o.SpO2BelowLimit), minutes(o.ChangeLateTolerance), minutes(o.ArrivalReadingWindow))
	if f := describeFilter(r.Filter); f != "" {
		fmt.Fprintf(w, "Filter: %s\n", f)
	}
	for i := range r.Transports {
		fmt.Fprintln(w)
		printTransport(w, &r.Transports[i])
	}
	fmt.Fprintln(w)
	printAcross(w, r)
	fmt.Fprintln(w)
	fmt.Fprintln(w, "Caution: an audit aid only. Figures come from the crew's entries and the Brief as recorded; check them against the source records, and follow local protocol and medical direction.")
}

func minutes(d time.Duration) string {
	return strconv.FormatFloat(math.Round(d.Minutes()*10)/10, 'f', -1, 64)
}

func describeFilter(f logbook.AuditFilter) string {
	var parts []string
	if !f.From.IsZero() {
		parts = append(parts, "from "+f.From.Format(time.DateOnly))
	}
	if !f.To.IsZero() {
		parts = append(parts, "to "+f.To.AddDate(0, 0, -1).Format(time.DateOnly))
	}
	if f.Vehicle != "" {
		parts = append(parts, fmt.Sprintf("vehicle contains %q", f.Vehicle))
	}
	if len(f.Flags) > 0 {
		parts = append(parts, "flags "+strings.Join(f.Flags, ", "))
	}
	return strings.Join(parts, "; ")
}

func stamp(t time.Time) string { return t.UTC().Format("2006-01-02 15:04 UTC") }

func printTransport(w io.Writer, a *logbook.TransportAudit) {
	closed := "not closed"
	if a.Closed != nil {
		closed = "closed " + stamp(*a.Closed)
	}
	fmt.Fprintf(w, "Transport %s  opened %s, %s\n", a.ID, stamp(a.Opened), closed)
	fmt.Fprintf(w, "  %s → %s; %s\n", printable(a.Origin), printable(a.Destination), printable(a.Vehicle))
	brief := "no Brief"
	if a.BriefRecord != "" {
		brief = fmt.Sprintf("Brief %s, engine %s", a.BriefRecord, a.EngineVersion)
	}
	fmt.Fprintf(w, "  records %s–%s (%d); %s\n", a.FirstRecord, a.LastRecord, a.Records, brief)

	ox := &a.Oxygen
	fmt.Fprintln(w, "  Oxygen planned")
	if len(ox.PlannedLegs) > 0 {
		tw := tabwriter.NewWriter(w, 0, 0, 2, ' ', 0)
		fmt.Fprintln(tw, "    leg\twhere\tfrom min\tto min\taltitude ft\tset-up\tO2 L/min\tO2 L")
		for _, l := range ox.PlannedLegs {
			label := l.Where
			if l.Label != "" {
				label = l.Label
			}
			fmt.Fprintf(tw, "    %d %s\t%s\t%s\t%s\t%s\t%s\t%s\t%s\n", l.Index+1, printable(label), printable(l.Where), l.StartMinute, l.EndMinute, l.AltitudeFt, printable(l.Device), l.OxygenLpm, l.OxygenL)
		}
		tw.Flush()
	}
	fmt.Fprintf(w, "    calculated need %s; with reserve %s; usable on board %s\n", say(ox.PlannedL), say(ox.PlannedWithReserveL), say(ox.PlannedUsableL))
	if ox.FinalPlannedL.Known() {
		fmt.Fprintf(w, "    amended plan (%s): calculated need %s\n", ox.FinalBriefRecord, say(ox.FinalPlannedL))
	}
	fmt.Fprintf(w, "    residual %s (%s)\n", say(ox.ResidualPressure), printable(ox.ResidualSource))
	fmt.Fprintln(w, "  Oxygen used, from the gauge readings")
	if len(ox.Cylinders) > 0 {
		tw := tabwriter.NewWriter(w, 0, 0, 2, ' ', 0)
		fmt.Fprintln(tw, "    cylinder\tdefinition\treadings\tfirst\tlast\tused\tat arrival\tabove residual")
		for _, c := range ox.Cylinders {
			fmt.Fprintf(tw, "    %s\t%s\t%d\t%s\t%s\t%s\t%s\t%s\n", printable(c.Label), printable(c.Definition), c.Readings, short(c.First), short(c.Last), short(c.UsedL), short(c.AtArrival), short(c.UsableAtArrivalL))
		}
		tw.Flush()
	}
	fmt.Fprintf(w, "    used %s; used ÷ planned %s\n", say(ox.UsedL), say(ox.Ratio))
	arrival := "no arrival recorded"
	if ox.Arrival != nil {
		arrival = fmt.Sprintf("%s at %s (%s)", ox.ArrivalEvent, stamp(*ox.Arrival), ox.ArrivalRecord)
	}
	fmt.Fprintf(w, "    arrival: %s\n", arrival)
	fmt.Fprintf(w, "    reserve at arrival %s; policy reserve %s; multiple %s\n", say(ox.ReserveAtArrivalL), say(ox.ReserveRequiredL), say(ox.ReserveMultiple))
	for _, c := range ox.PlannedChanges {
		actual := "none recorded"
		if c.ActualMinute != nil {
			actual = fmt.Sprintf("minute %s (%s)", c.ActualMinute, c.ActualRecord)
		}
		late := ""
		if c.Late {
			late = "  LATE"
		}
		fmt.Fprintf(w, "    change from %s planned at minute %s: %s%s\n", printable(c.From), c.PlannedMinute, actual, late)
	}

	pc := &a.Course
	fmt.Fprintf(w, "  Patient course (SpO2 target %s %%, %s)\n", pc.TargetPercent, printable(pc.TargetSource))
	low := say(pc.LowestSpO2)
	if pc.LowestRecord != "" {
		low += " (" + pc.LowestRecord + ")"
	}
	if pc.SpO2Readings == 0 {
		fmt.Fprintln(w, "    no SpO2 readings: lowest SpO2 and minutes below target not computable")
	} else {
		fmt.Fprintf(w, "    %d SpO2 readings over %s; longest gap %s\n", pc.SpO2Readings, say(pc.ObservedMinutes), say(pc.LongestGapMinutes))
		fmt.Fprintf(w, "    lowest SpO2 %s; below target %s; longest run %s", low, say(pc.MinutesBelowTarget), say(pc.LongestBelowMinutes))
		if pc.LongestBelowRecord != "" {
			fmt.Fprintf(w, " from %s", pc.LongestBelowRecord)
		}
		fmt.Fprintln(w)
	}
	for _, c := range pc.SetupChanges {
		var parts []string
		if c.FiO2 != nil {
			parts = append(parts, "FiO2 "+before(c.FiO2Before)+c.FiO2.String())
		}
		if c.Device != "" {
			from := ""
			if c.DeviceFrom != "" {
				from = c.DeviceFrom + " → "
			}
			parts = append(parts, from+c.Device)
		}
		if c.FlowLpm != nil {
			parts = append(parts, before(c.FlowBefore)+c.FlowLpm.String()+" L/min")
		}
		what := "change"
		if c.Initial {
			what = "initial"
		}
		fmt.Fprintf(w, "    minute %s %s (%s): %s\n", c.Minute, what, c.Record, printable(strings.Join(parts, ", ")))
	}
	fmt.Fprintf(w, "  Deviations (%d)\n", len(a.Deviations))
	for _, d := range a.Deviations {
		rec := d.Record
		if rec == "" {
			rec = "-"
		}
		fmt.Fprintf(w, "    %-24s %-5s %s\n", d.Code, rec, printable(d.Detail))
	}
	for _, p := range a.Problems {
		fmt.Fprintf(w, "    unreadable: %s\n", printable(p))
	}
}

func before(n *physio.Number) string {
	if n == nil {
		return ""
	}
	return n.String() + " → "
}

// short prints an amount in a table cell: the value, or "n/c" (its reason
// is printed in the lines below the table).
func short(a logbook.Amount) string {
	if !a.Known() {
		return "n/c"
	}
	return say(a)
}

// say prints an amount, or why it is not computable (a reason may name a
// cylinder label typed by the crew).
func say(a logbook.Amount) string { return printable(a.String()) }

func printAcross(w io.Writer, r *logbook.AuditReport) {
	fmt.Fprintf(w, "Across transports (%d)\n", len(r.Transports))
	tw := tabwriter.NewWriter(w, 0, 0, 2, ' ', 0)
	fmt.Fprintln(tw, "  id\tdate\troute\tvehicle\tplanned L\tused L\tratio\treserve L\tpolicy L\tdeviations")
	cell := func(a logbook.Amount) string {
		if !a.Known() {
			return "n/c"
		}
		return a.Value.String()
	}
	for i := range r.Transports {
		a := &r.Transports[i]
		o := &a.Oxygen
		fmt.Fprintf(tw, "  %s\t%s\t%s → %s\t%s\t%s\t%s\t%s\t%s\t%s\t%s\n", a.ID, a.Opened.UTC().Format(time.DateOnly), printable(a.Origin), printable(a.Destination), printable(a.Vehicle),
			cell(o.PlannedL), cell(o.UsedL), cell(o.Ratio), cell(o.ReserveAtArrivalL), cell(o.ReserveRequiredL), deviationList(a))
	}
	tw.Flush()
	t := r.Totals
	fmt.Fprintf(w, "  n/c: not computable (the reason is given under the transport)\n")
	fmt.Fprintf(w, "Totals: %d transports, %d closed; %d with planned and used oxygen: planned %s L, used %s L, ratio %s\n",
		t.Transports, t.Closed, t.Compared, t.PlannedL, t.UsedL, t.OverallRatio)
	fmt.Fprintf(w, "  reserve at arrival known for %d; some figure not computable for %d\n", t.ReserveKnown, t.NotComputable)
	for _, c := range r.Codes {
		if n := t.Deviations[c.Code]; n > 0 {
			fmt.Fprintf(w, "  %-24s %d in %d transport(s)\n", c.Code, n, t.TransportsWith[c.Code])
		}
	}
	for _, d := range []logbook.Distribution{r.RatioDistribution, r.ReserveDistribution} {
		fmt.Fprintf(w, "Distribution of %s (%d not computable)", d.Quantity, d.NotComputable)
		if d.Median != nil {
			fmt.Fprintf(w, ": min %s, median %s, max %s", d.Min, d.Median, d.Max)
		}
		fmt.Fprintln(w)
		for _, b := range d.Bins {
			fmt.Fprintf(w, "  %-9s %3d %s\n", b.Label, b.Count, strings.Repeat("#", b.Count))
		}
	}
}

func deviationList(a *logbook.TransportAudit) string {
	counts := map[string]int{}
	var order []string
	for _, d := range a.Deviations {
		if counts[d.Code] == 0 {
			order = append(order, d.Code)
		}
		counts[d.Code]++
	}
	if len(order) == 0 {
		return "none"
	}
	parts := make([]string, len(order))
	for i, c := range order {
		parts[i] = fmt.Sprintf("%s×%d", c, counts[c])
	}
	return strings.Join(parts, " ")
}
