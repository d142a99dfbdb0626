//go:build !wasm

package main

import (
	"bytes"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"alvea/app/ui"
)

func init() { ui.Register() }

// Command lines that cannot run exit 2 with a message; help exits 0.
func TestDispatchUsage(t *testing.T) {
	cases := []struct {
		args []string
		code int
		want string // part of stderr (or stdout for help)
	}{
		{nil, 2, "usage: alvea"},
		{[]string{"fly"}, 2, `unknown command "fly"`},
		{[]string{"serve", "-bogus"}, 2, "flag provided but not defined"},
		{[]string{"serve", "extra"}, 2, `unexpected argument "extra"`},
		{[]string{"static", "-out"}, 2, "flag needs an argument"},
		{[]string{"static", "a", "b"}, 2, `unexpected argument "a"`},
		// -addr is checked before anything listens: an empty host would
		// listen on every interface.
		{[]string{"serve", "-addr", ""}, 2, `-addr "" is not host:port`},
		{[]string{"serve", "-addr", ":8000"}, 2, "would listen on every network interface"},
		{[]string{"serve", "-addr", "nonsense"}, 2, `-addr "nonsense" is not host:port`},
		{[]string{"serve", "-addr", "127.0.0.1:99999"}, 2, "the port must be a number from 0 (any free port) to 65535"},
		{[]string{"serve", "-addr", "127.0.0.1:-1"}, 2, "from 0 (any free port) to 65535"},
		{[]string{"serve", "-addr", "127.0.0.1:http"}, 2, "the port must be a number"},
		{[]string{"static", "-out", ""}, 2, "-out is empty"},
		{[]string{"help"}, 0, "usage: alvea"},
		{[]string{"serve", "-h"}, 0, "-addr"},
	}
	for _, c := range cases {
		var out, errOut bytes.Buffer
		code := dispatch(c.args, strings.NewReader(""), &out, &errOut)
		if code != c.code {
			t.Errorf("%q: exit %d, want %d (stderr %q)", c.args, code, c.code, errOut.String())
		}
		if !strings.Contains(out.String()+errOut.String(), c.want) {
			t.Errorf("%q: output %q lacks %q", c.args, out.String()+errOut.String(), c.want)
		}
	}
}

// alvea static fails plainly without a built app.wasm, and writes the site
// with one.
func TestStaticCommand(t *testing.T) {
	root := t.TempDir()
	web := filepath.Join(root, "web")
	os.MkdirAll(web, 0o755)
	var out, errOut bytes.Buffer
	if code := dispatch([]string{"static", "-root", root, "-out", filepath.Join(root, "dist")}, nil, &out, &errOut); code != 1 || !strings.Contains(errOut.String(), "app.wasm") {
		t.Errorf("without app.wasm: exit %d, stderr %q", code, errOut.String())
	}
	os.WriteFile(filepath.Join(web, "app.wasm"), []byte("\x00asm\x01\x00\x00\x00"), 0o644)
	out.Reset()
	errOut.Reset()
	dist := filepath.Join(root, "dist")
	if code := dispatch([]string{"static", "-root", root, "-out", dist}, nil, &out, &errOut); code != 0 {
		t.Fatalf("exit %d, stderr %q", code, errOut.String())
	}
	for _, f := range []string{"index.html", "app-worker.js", "web/app.wasm"} {
		if _, err := os.Stat(filepath.Join(dist, f)); err != nil {
			t.Errorf("dist lacks %s", f)
		}
	}
}
