package main

import (
	"context"
	"errors"
	"fmt"
	"io"
	"io/fs"
	"log"
	"net"
	"net/http"
	"os"
	"os/signal"
	"strconv"
	"strings"
	"syscall"
	"time"

	"earshot/wasm/site"
)

const serveSynopsis = `[--addr HOST:PORT] [--public]

Serves the browser app on this machine and prints its address. The page,
its scripts and the app are built into earshot ("make app" before building
earshot; "make run" does both). Stop with Ctrl-C.

Only loopback addresses (127.0.0.0/8, ::1, localhost) are allowed unless
--public is given: then anyone who can reach the address can load the app.`

// defaultServeAddr is the address "earshot serve" listens on by default.
const defaultServeAddr = "127.0.0.1:8417"

// shutdownGrace is how long a stopping server waits for open requests.
const shutdownGrace = 5 * time.Second

func runServe(args []string, stdout, stderr io.Writer) int {
	flags := newFlagSet("serve", serveSynopsis, stdout)
	addr := flags.String("addr", defaultServeAddr, "HOST:PORT to listen on; port 0 picks a free one")
	public := flags.Bool("public", false, "allow an --addr that is not loopback (other machines can connect)")
	if done, status := parseFlags(flags, args, stderr); done {
		return status
	}
	if err := checkServeAddr(*addr, *public); err != nil {
		return report("serve", err, stderr)
	}
	ctx, stop := signal.NotifyContext(context.Background(), os.Interrupt, syscall.SIGTERM)
	defer stop()
	ln, err := net.Listen("tcp", *addr)
	if err != nil {
		return report("serve", listenError(*addr, err), stderr)
	}
	if err := serveOn(ctx, ln, site.FS(), stdout, stderr); err != nil {
		return report("serve", err, stderr)
	}
	return exitOK
}

// checkServeAddr checks --addr: HOST:PORT with a numeric port, and a
// loopback host unless public. Loopback is 127.0.0.0/8 (RFC 1122
// §3.2.1.3), ::1 (RFC 4291 §2.5.3) and the name "localhost" (RFC 6761
// §6.3); other names are not looked up.
func checkServeAddr(addr string, public bool) error {
	host, port, err := net.SplitHostPort(addr)
	if err != nil {
		return usagef("--addr must be HOST:PORT such as %s, got %q", defaultServeAddr, addr)
	}
	if _, err := strconv.ParseUint(port, 10, 16); err != nil {
		return usagef("--addr port must be a number from 0 to 65535, got %q", port)
	}
	if public || strings.EqualFold(host, "localhost") {
		return nil
	}
	if ip := net.ParseIP(host); ip != nil && ip.IsLoopback() {
		return nil
	}
	return usagef("--addr host must be loopback (127.0.0.0/8, ::1 or localhost) unless --public is given, got %q", addr)
}

// listenError turns a failed listen into a one-line message.
func listenError(addr string, err error) error {
	if errors.Is(err, syscall.EADDRINUSE) {
		return fmt.Errorf("--addr %s is already in use (another earshot serve?); choose another port with --addr", addr)
	}
	var oe *net.OpError
	if errors.As(err, &oe) && oe.Err != nil {
		err = oe.Err
	}
	return fmt.Errorf("cannot listen on --addr %s: %v", addr, err)
}

// serveOn serves the files of fsys on ln until ctx is done, then shuts the
// server down gracefully and returns nil. It prints the page's URL on
// stdout first. It closes ln.
func serveOn(ctx context.Context, ln net.Listener, fsys fs.FS, stdout, stderr io.Writer) error {
	h, err := site.Handler(fsys)
	if err != nil {
		ln.Close()
		return errors.New(strings.TrimPrefix(err.Error(), "site: "))
	}
	fmt.Fprintln(stdout, pageURL(ln.Addr()))
	if !site.Built(fsys) {
		fmt.Fprintln(stderr, "earshot serve: warning: the browser app is not built into this earshot; run make run (or make app, then rebuild)")
	}
	srv := &http.Server{
		Handler:           h,
		ReadHeaderTimeout: 10 * time.Second,
		ErrorLog:          log.New(stderr, "earshot serve: ", 0),
	}
	done := make(chan error, 1)
	go func() { done <- srv.Serve(ln) }()
	select {
	case err := <-done:
		return err // Serve returns only on failure until Shutdown
	case <-ctx.Done():
	}
	sctx, cancel := context.WithTimeout(context.Background(), shutdownGrace)
	defer cancel()
	if err := srv.Shutdown(sctx); err != nil {
		srv.Close() // requests still open after the grace period
	}
	<-done
	return nil
}

// pageURL is the address to open in a browser for a listener's address. A
// listener on every interface (--public with 0.0.0.0 or ::) is reached
// from this machine through 127.0.0.1.
func pageURL(a net.Addr) string {
	host, port, err := net.SplitHostPort(a.String())
	if err != nil {
		return "http://" + a.String() + "/"
	}
	if ip := net.ParseIP(host); ip != nil && ip.IsUnspecified() {
		host = "127.0.0.1"
	}
	return "http://" + net.JoinHostPort(host, port) + "/"
}
