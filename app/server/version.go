package server

import (
	"encoding/hex"
	"fmt"
	"hash/fnv"
	"io"
	"os"
	"path/filepath"
	"runtime"
	"runtime/debug"
)

// Version returns the content hash of the built assets: every file under
// root/web (app.wasm included), the service worker template, and what
// decides go-app's generated files (the Go toolchain, which picks
// wasm_exec.js, and the go-app module version). The same build restarted
// gives the same version, so a restart is not mistaken for an update.
//
// It is the first 20 hex digits of a 128-bit FNV-1a hash over length-prefixed names and
// contents, so no two file layouts can hash alike by concatenation.
func Version(root string) (string, error) {
	web := filepath.Join(root, "web")
	files, err := webFiles(web)
	if err != nil {
		return "", err
	}
	h := fnv.New128a()
	writeField := func(b []byte) {
		fmt.Fprintf(h, "%d:", len(b))
		h.Write(b)
	}
	writeField([]byte(workerTemplate))
	writeField([]byte(runtime.Version()))
	writeField([]byte(goAppVersion()))
	for _, name := range files {
		writeField([]byte(name))
		f, err := os.Open(filepath.Join(web, filepath.FromSlash(name)))
		if err != nil {
			return "", fmt.Errorf("server: hashing %s: %w", name, err)
		}
		st, err := f.Stat()
		if err != nil {
			f.Close()
			return "", fmt.Errorf("server: hashing %s: %w", name, err)
		}
		fmt.Fprintf(h, "%d:", st.Size())
		_, err = io.Copy(h, f)
		f.Close()
		if err != nil {
			return "", fmt.Errorf("server: hashing %s: %w", name, err)
		}
	}
	return hex.EncodeToString(h.Sum(nil))[:20], nil
}

func goAppVersion() string {
	info, ok := debug.ReadBuildInfo()
	if !ok {
		return "unknown"
	}
	for _, dep := range info.Deps {
		if dep.Path == "github.com/maxence-charriere/go-app/v10" {
			return dep.Version
		}
	}
	return "unknown"
}

// contentHash names a file's contents for caching: FNV-1a, 128 bits, in
// hex. It tells builds apart; it is not a security measure (nothing here
// defends against a forged file, and crypto stays in app/logbook).
func contentHash(data []byte) string {
	h := fnv.New128a()
	h.Write(data)
	return hex.EncodeToString(h.Sum(nil))
}
