package logbook

import (
	"errors"
	"os"
	"strings"
	"testing"
)

// TestOpenBundleSaysWhyItIsNotReadable: a file that is not a readable
// bundle is refused with ErrBundle and why, so that `alvea audit` can say
// which problem the file has: empty, not a bundle at all, cut short right
// after the signature (not "version 0"), or cut short in the vault header.
func TestOpenBundleSaysWhyItIsNotReadable(t *testing.T) {
	data, err := os.ReadFile(demoPath)
	if err != nil {
		t.Fatal(err)
	}
	for _, c := range []struct {
		name string
		data []byte
		want string
	}{
		{"empty", nil, "the file is empty"},
		{"plan document", []byte(`{"version": 1}`), "not a logbook bundle"},
		{"signature only", data[:len(bundleMagic)], "cut short after the bundle signature"},
		{"cut in the header", data[:len(bundleMagic)+20], "cut short in the vault header"},
	} {
		_, err := OpenBundle(ctx, c.data, DemoPassphrase)
		if !errors.Is(err, ErrBundle) || !strings.Contains(err.Error(), c.want) {
			t.Errorf("%s: %v, want ErrBundle saying %q", c.name, err, c.want)
		}
	}
}
