//go:build !js

package ui

import (
	"context"
	"errors"
)

// Natively there is no file input and no download; tests replace these.

var lbReadFile = func(ctx context.Context, id string) ([]byte, error) { return nil, lbErrNoFile }

func lbFileName(id string) string { return "" }

var lbDownload = func(name string, data []byte) error { return errors.ErrUnsupported }
