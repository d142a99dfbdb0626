package idb

import (
	"strings"
	"testing"
)

// The seeding scripts split the records into transactions of seedChunk and
// write the header and chain head with the last one only, so a vault is
// never seen with a head that names records not yet written.
func TestSeedScriptsChunks(t *testing.T) {
	recs := make([]SeedRecord, 2*seedChunk+1)
	for i := range recs {
		recs[i] = SeedRecord{Seq: uint64(i + 1), Index: []byte{1}, Body: []byte{2}}
	}
	scripts := SeedScripts(recs, []byte("H"), []byte("D"))
	if len(scripts) != 3 {
		t.Fatalf("%d scripts for %d records, want 3", len(scripts), len(recs))
	}
	for i, s := range scripts {
		if !strings.Contains(s, `indexedDB.open("`+DBName+`", 1)`) {
			t.Errorf("script %d does not open %s version 1", i, DBName)
		}
		if got, want := strings.Contains(s, `const meta = null;`), i < len(scripts)-1; got != want {
			t.Errorf("script %d: no header and head = %v, want %v", i, got, want)
		}
	}
	if !strings.Contains(scripts[2], `"k":5001`) || strings.Contains(scripts[2], `"k":5000,`) {
		t.Error("the last script does not hold exactly the last record")
	}
	if got := SeedScripts(nil, []byte("H"), []byte("D")); len(got) != 1 || strings.Contains(got[0], "const meta = null;") {
		t.Error("an empty vault still needs its header and head written")
	}
}
