//go:build !js

package ui

import (
	"context"
	"errors"
)

// Natively there is no file input and no download; tests replace these.

var readFile = func(ctx context.Context, id string) ([]byte, error) { return nil, errNoFile }

func fileName(id string) string { return "" }

var download = func(name string, data []byte) error { return errors.ErrUnsupported }
