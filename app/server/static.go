package server

import (
	"fmt"
	"io"
	"os"
	"path/filepath"

	"github.com/maxence-charriere/go-app/v10/pkg/app"
)

// WriteStatic writes the static site for the assets in root/web into out:
// go-app's pages (index.html and one .html per route), app.js, the service
// worker, the manifest and styles, and a copy of every file under root/web
// (go-app leaves web/ empty). The routes must be registered before the call.
// It returns the version the site carries.
func WriteStatic(out, root string) (string, error) {
	h, err := NewHandler(root)
	if err != nil {
		return "", err
	}
	if err := os.MkdirAll(out, 0o755); err != nil {
		return "", fmt.Errorf("server: %w", err)
	}
	if err := app.GenerateStaticWebsite(out, h); err != nil {
		return "", fmt.Errorf("server: writing static site: %w", err)
	}
	web := filepath.Join(root, "web")
	files, err := webFiles(web)
	if err != nil {
		return "", err
	}
	for _, name := range files {
		if err := copyFile(filepath.Join(out, "web", filepath.FromSlash(name)), filepath.Join(web, filepath.FromSlash(name))); err != nil {
			return "", err
		}
	}
	return h.Version, nil
}

func copyFile(dst, src string) error {
	if err := os.MkdirAll(filepath.Dir(dst), 0o755); err != nil {
		return fmt.Errorf("server: %w", err)
	}
	in, err := os.Open(src)
	if err != nil {
		return fmt.Errorf("server: %w", err)
	}
	defer in.Close()
	outFile, err := os.Create(dst)
	if err != nil {
		return fmt.Errorf("server: %w", err)
	}
	if _, err := io.Copy(outFile, in); err != nil {
		outFile.Close()
		return fmt.Errorf("server: copying %s: %w", src, err)
	}
	if err := outFile.Close(); err != nil {
		return fmt.Errorf("server: %w", err)
	}
	return nil
}
