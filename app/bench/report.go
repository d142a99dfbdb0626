//go:build !wasm

package main

import (
	"fmt"
	"math"
	"sort"
	"strings"
	"time"
)

// stat is a figure: one value, or the median, min and max of N samples.
type stat struct {
	Median, Min, Max float64
	N                int
	Set              bool
}

func one(v float64) stat { return stat{Median: v, Min: v, Max: v, N: 1, Set: true} }

// summary returns the median (the mean of the middle two for an even
// count), min and max of vs.
func summary(vs []float64) stat {
	if len(vs) == 0 {
		return stat{}
	}
	s := append([]float64(nil), vs...)
	sort.Float64s(s)
	n := len(s)
	med := s[n/2]
	if n%2 == 0 {
		med = (s[n/2-1] + s[n/2]) / 2
	}
	return stat{Median: med, Min: s[0], Max: s[n-1], N: n, Set: true}
}

// percentile returns the p-th percentile (0–100) of vs by the
// nearest-rank method.
func percentile(vs []float64, p float64) float64 {
	s := append([]float64(nil), vs...)
	sort.Float64s(s)
	rank := int(math.Ceil(p / 100 * float64(len(s))))
	if rank < 1 {
		rank = 1
	}
	return s[rank-1]
}

type budget struct {
	Text string
	Met  bool
}

// row is one line of the table: Alvea's figure A, the floor's F (unset
// where the floor has no such thing), and a budget if one applies.
type row struct {
	Section string // a row with only a section title
	Name    string
	Unit    string // "B", "ms", "ns/op", "s"
	A, F    stat
	Budget  *budget
	Note    string
}

func section(title string) row { return row{Section: title} }

type report struct {
	Started   time.Time
	Runs      int
	Toolchain string
	Rows      []row
	Notes     []string
}

func (r *report) add(x row) { r.Rows = append(r.Rows, x) }

func (r *report) note(format string, args ...any) {
	r.Notes = append(r.Notes, fmt.Sprintf(format, args...))
}

func (r *report) markdown() string {
	var b strings.Builder
	fmt.Fprintf(&b, "# Alvea against the go-app floor\n\n")
	fmt.Fprintf(&b, "Measured %s with %s on this machine; builds %s; headless Chromium over loopback. ",
		r.Started.Format("2006-01-02 15:04"), r.Toolchain, buildFlagsText)
	fmt.Fprintf(&b, "Timings: median [min–max] of n runs. Ratio: Alvea / floor (medians).\n\n")
	fmt.Fprintf(&b, "| figure | Alvea | floor | Alvea / floor | budget |\n|---|---:|---:|---:|---|\n")
	for _, x := range r.Rows {
		if x.Section != "" {
			fmt.Fprintf(&b, "| **%s** | | | | |\n", x.Section)
			continue
		}
		ratio := ""
		if x.A.Set && x.F.Set && x.F.Median > 0 {
			ratio = fmt.Sprintf("%.2f", x.A.Median/x.F.Median)
		}
		bud := ""
		if x.Budget != nil {
			mark := "not met"
			if x.Budget.Met {
				mark = "met"
			}
			bud = x.Budget.Text + ": **" + mark + "**"
		}
		name := x.Name
		if x.Note != "" {
			name += " (" + x.Note + ")"
		}
		fmt.Fprintf(&b, "| %s | %s | %s | %s | %s |\n", name, x.A.format(x.Unit), x.F.format(x.Unit), ratio, bud)
	}
	if len(r.Notes) > 0 {
		b.WriteString("\n")
		for _, n := range r.Notes {
			fmt.Fprintf(&b, "- %s\n", n)
		}
	}
	return b.String()
}

func (s stat) format(unit string) string {
	if !s.Set {
		return "—"
	}
	f := func(v float64) string {
		switch unit {
		case "B":
			return groupDigits(int64(math.Round(v)))
		case "ms":
			if v < 20 {
				return fmt.Sprintf("%.1f", v)
			}
			return fmt.Sprintf("%.0f", v)
		case "ns/op":
			return groupDigits(int64(math.Round(v)))
		default:
			return fmt.Sprintf("%.3g", v)
		}
	}
	u := ""
	if unit != "" {
		u = " " + unit
	}
	if s.N <= 1 || s.Min == s.Max {
		if s.N > 1 {
			return fmt.Sprintf("%s%s (n=%d)", f(s.Median), u, s.N)
		}
		return f(s.Median) + u
	}
	return fmt.Sprintf("%s%s [%s–%s] n=%d", f(s.Median), u, f(s.Min), f(s.Max), s.N)
}

// groupDigits writes n with thin spaces between groups of three digits.
func groupDigits(n int64) string {
	s := fmt.Sprint(n)
	neg := strings.HasPrefix(s, "-")
	s = strings.TrimPrefix(s, "-")
	var out []string
	for len(s) > 3 {
		out = append([]string{s[len(s)-3:]}, out...)
		s = s[:len(s)-3]
	}
	out = append([]string{s}, out...)
	r := strings.Join(out, " ")
	if neg {
		r = "-" + r
	}
	return r
}
