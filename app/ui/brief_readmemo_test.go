package ui

import (
	"strconv"
	"testing"
)

// The memo gives what readEntry gives, for valid, invalid, empty and
// unit-bearing texts under each unit, and stays within its bound however
// many values are typed. readEntry's own tests hold its readings to the
// published conversions; this holds the memo to readEntry.
func TestReadEntryMemoIsReadEntry(t *testing.T) {
	specs := []fieldSpec{specOrigin, specDiff, specMinutes, specLegFiO2, specPaO2, specHb}
	texts := []string{"", " ", "8500", "2591 m", "6.5", "0.45 bar", "120", "0.35", "35%", "85", "11.3 kPa", "13", "abc", "1e3", "-5"}
	for round := 0; round < 2; round++ { // the second round comes from the memo
		for _, spec := range specs {
			for _, text := range texts {
				for _, disp := range []string{UnitFeet, UnitM, UnitPsi, UnitBar, UnitMmHg, UnitKPa, "min", ""} {
					for _, req := range []bool{true, false} {
						e := Entry{T: text}
						if got, want := readEntryMemo(spec, e, disp, req), readEntry(spec, e, disp, req); got != want {
							t.Fatalf("%s %q in %q (required %v): memo %+v, readEntry %+v", spec.Label, text, disp, req, got, want)
						}
					}
				}
			}
		}
	}
	for i := 0; i < 3*readMemoMax; i++ {
		readEntryMemo(specMinutes, Entry{T: strconv.Itoa(i)}, "min", true)
	}
	readMemo.Lock()
	n := len(readMemo.m)
	readMemo.Unlock()
	if n > readMemoMax {
		t.Errorf("the memo holds %d readings, more than its bound %d", n, readMemoMax)
	}
}
