//go:build !wasm

package main

import (
	"context"
	"errors"
	"flag"
	"fmt"
	"io"
	"net"
	"os"
	"os/signal"
	"strconv"
	"strings"
	"syscall"

	"alvea/app/cli"
	"alvea/app/server"
)

const usage = `usage: alvea <command> [arguments]

commands:
  serve  [-addr 127.0.0.1:8000] [-root .]   serve the app (root holds web/ with app.wasm)
  static [-out dist] [-root .]              write the static site
  plan   ...                                compute a transport plan (alvea plan -h)
  audit  ...                                audit a logbook export (alvea audit -h)
`

// exitUsage is the exit status for a command line that cannot be run.
const exitUsage = 2

func runNative(args []string) int {
	return dispatch(args, os.Stdin, os.Stdout, os.Stderr)
}

func dispatch(args []string, stdin io.Reader, stdout, stderr io.Writer) int {
	if len(args) == 0 {
		fmt.Fprint(stderr, usage)
		return exitUsage
	}
	switch args[0] {
	case "serve":
		return serveCmd(args[1:], stdout, stderr)
	case "static":
		return staticCmd(args[1:], stdout, stderr)
	case "plan":
		return cli.Plan(args[1:], stdin, stdout, stderr)
	case "audit":
		return cli.Audit(args[1:], stdin, stdout, stderr)
	case "help", "-h", "-help", "--help":
		fmt.Fprint(stdout, usage)
		return 0
	default:
		fmt.Fprintf(stderr, "alvea: unknown command %q\n\n%s", args[0], usage)
		return exitUsage
	}
}

func serveCmd(args []string, stdout, stderr io.Writer) int {
	fs := flag.NewFlagSet("alvea serve", flag.ContinueOnError)
	fs.SetOutput(stderr)
	addr := fs.String("addr", "127.0.0.1:8000", "address to listen on")
	root := fs.String("root", ".", "directory holding web/ (with the built app.wasm)")
	if err := fs.Parse(args); err != nil {
		return flagStatus(err)
	}
	if fs.NArg() > 0 {
		fmt.Fprintf(stderr, "alvea serve: unexpected argument %q\n", fs.Arg(0))
		return exitUsage
	}
	if err := checkAddr(*addr); err != nil {
		fmt.Fprintf(stderr, "alvea serve: %v\n", err)
		return exitUsage
	}
	ctx, stop := signal.NotifyContext(context.Background(), os.Interrupt, syscall.SIGTERM)
	defer stop()
	if err := server.Serve(ctx, *addr, *root, stdout); err != nil {
		fmt.Fprintf(stderr, "alvea serve: %v\n", err)
		return 1
	}
	return 0
}

func staticCmd(args []string, stdout, stderr io.Writer) int {
	fs := flag.NewFlagSet("alvea static", flag.ContinueOnError)
	fs.SetOutput(stderr)
	out := fs.String("out", "dist", "directory to write the site into")
	root := fs.String("root", ".", "directory holding web/ (with the built app.wasm)")
	if err := fs.Parse(args); err != nil {
		return flagStatus(err)
	}
	if fs.NArg() > 0 {
		fmt.Fprintf(stderr, "alvea static: unexpected argument %q\n", fs.Arg(0))
		return exitUsage
	}
	if strings.TrimSpace(*out) == "" {
		fmt.Fprintln(stderr, "alvea static: -out is empty: give the directory to write the site into")
		return exitUsage
	}
	version, err := server.WriteStatic(*out, *root)
	if err != nil {
		fmt.Fprintf(stderr, "alvea static: %v\n", err)
		return 1
	}
	fmt.Fprintf(stdout, "alvea static: wrote version %s to %s\n", version, *out)
	return 0
}

// checkAddr checks serve's -addr before anything listens: host:port, the
// host given (an empty host, as in ":8000", listens on every network
// interface; 0.0.0.0 says so on purpose), the port a number from 0 (any
// free port) to 65535.
func checkAddr(addr string) error {
	host, port, err := net.SplitHostPort(addr)
	if err != nil {
		return fmt.Errorf("-addr %q is not host:port (for example 127.0.0.1:8000)", addr)
	}
	if host == "" {
		return fmt.Errorf("-addr %q names no host: it would listen on every network interface; give 127.0.0.1:%s for this device only, or 0.0.0.0:%s to listen on every interface on purpose", addr, port, port)
	}
	if n, err := strconv.Atoi(port); err != nil || n < 0 || n > 65535 || port != strconv.Itoa(n) {
		return fmt.Errorf("-addr %q: the port must be a number from 0 (any free port) to 65535", addr)
	}
	return nil
}

// flagStatus maps a flag parse error to an exit status: -h is success.
func flagStatus(err error) int {
	if errors.Is(err, flag.ErrHelp) {
		return 0
	}
	return exitUsage
}
