//go:build !js

package ui

import (
	"context"
)

// Natively there is no file input; tests replace these.

var lbReadFile = func(ctx context.Context, id string) ([]byte, error) { return nil, lbErrNoFile }

func lbFileName(id string) string { return "" }
