package main

import (
	"bytes"
	"context"
	"crypto/sha256"
	"errors"
	"flag"
	"fmt"
	"html/template"
	"io"
	"net"
	"net/http"
	"os"
	"os/signal"
	"path/filepath"
	"strconv"
	"sync"
	"time"

	"loopwise/runtime"
)

const watchUsage = `usage: loopwise watch [-port N] [-tol R] [-budget SECONDS] FILE
  Serve the script's report page on this computer only (127.0.0.1, port N,
  default a free one, printed at start) and evaluate the script again each
  time it is saved: the open page updates itself and keeps its scroll
  position. An error shows at its line, with the last results that were
  evaluated without an error beneath it. Ctrl-C stops it.
` + budgetUsage

// watchPoll is how often watch looks at the file. It polls (size, time and
// a hash of the content) rather than asking the system for change events,
// which works the same on every system and with editors that replace the
// file on save.
const watchPoll = 250 * time.Millisecond

func watchFiles(args []string, stdout, stderr io.Writer) int {
	args, budget, code := takeBudget("watch", args, stderr)
	if code != 0 {
		return code
	}
	fs := flag.NewFlagSet("watch", flag.ContinueOnError)
	fs.SetOutput(stderr)
	port := fs.Int("port", 0, "the port to serve on (0: a free one)")
	tol := fs.Float64("tol", runtime.DefaultTolerance, "relative tolerance for numeric results")
	files, err := parseInterleaved(fs, args)
	if err != nil {
		return 2
	}
	if len(files) != 1 {
		fmt.Fprintf(stderr, "loopwise watch: name one script file\n%s", watchUsage)
		return 2
	}
	if *port < 0 || *port > 65535 || !(*tol >= 0 && *tol < 1) {
		fmt.Fprintf(stderr, "loopwise watch: -port must be 0 to 65535 and -tol at least 0 and below 1\n")
		return 2
	}
	if _, err := load(files[0]); err != nil {
		var none *runtime.NoStatementsError
		if !errors.As(err, &none) {
			fmt.Fprintln(stderr, err)
			return 1
		}
	}
	ln, err := net.Listen("tcp", net.JoinHostPort("127.0.0.1", strconv.Itoa(*port)))
	if err != nil {
		fmt.Fprintf(stderr, "loopwise watch: %v\n", err)
		return 1
	}
	ctx, stop := signal.NotifyContext(context.Background(), os.Interrupt)
	defer stop()
	w := &watcher{file: files[0], budget: budget, tol: *tol, log: stderr}
	fmt.Fprintf(stdout, "%s: serving http://%s/ (Ctrl-C stops)\n", files[0], ln.Addr())
	if err := w.serve(ctx, ln); err != nil {
		fmt.Fprintf(stderr, "loopwise watch: %v\n", err)
		return 1
	}
	fmt.Fprintf(stdout, "%s: stopped\n", files[0])
	return 0
}

// watcher holds the page of the latest evaluation.
type watcher struct {
	file   string
	budget float64
	tol    float64
	log    io.Writer

	mu       sync.Mutex
	changed  chan struct{} // closed and replaced at each new page
	gen      int           // counts the pages made
	page     []byte
	lastGood template.HTML // the article of the last evaluation without an error
	goodWhen time.Time
}

// serve evaluates the file, serves the page on ln, and evaluates again on
// every change until ctx ends.
func (w *watcher) serve(ctx context.Context, ln net.Listener) error {
	w.changed = make(chan struct{})
	sum := w.evaluate(nil)
	mux := http.NewServeMux()
	mux.HandleFunc("/", w.handlePage)
	mux.HandleFunc("/gen", w.handleGen)
	srv := &http.Server{Handler: localOnly(ln.Addr().String(), mux), BaseContext: func(net.Listener) context.Context { return ctx }}
	done := make(chan error, 1)
	go func() { done <- srv.Serve(ln) }()
	tick := time.NewTicker(watchPoll)
	defer tick.Stop()
	for {
		select {
		case <-ctx.Done():
			sctx, cancel := context.WithTimeout(context.Background(), 2*time.Second)
			defer cancel()
			srv.Shutdown(sctx)
			return nil
		case err := <-done:
			return err
		case <-tick.C:
			if s := fileSum(w.file); !bytes.Equal(s, sum) {
				sum = w.evaluate(s)
			}
		}
	}
}

// localOnly refuses a request that names another host than the address
// served: a web page elsewhere could otherwise reach the server through a
// name that resolves to 127.0.0.1 (DNS rebinding) and read the script.
func localOnly(addr string, h http.Handler) http.Handler {
	_, port, _ := net.SplitHostPort(addr)
	return http.HandlerFunc(func(rw http.ResponseWriter, r *http.Request) {
		if r.Host != "127.0.0.1:"+port && r.Host != "localhost:"+port {
			http.Error(rw, "this server answers only to 127.0.0.1:"+port, http.StatusForbidden)
			return
		}
		h.ServeHTTP(rw, r)
	})
}

// fileSum identifies the content of a file; nil when it cannot be read.
func fileSum(path string) []byte {
	data, err := os.ReadFile(path)
	if err != nil {
		return nil
	}
	s := sha256.Sum256(data)
	return s[:]
}

// evaluate reads and evaluates the file and makes its page; it returns
// the file's sum.
func (w *watcher) evaluate(sum []byte) []byte {
	if sum == nil {
		sum = fileSum(w.file)
	}
	sc, err := load(w.file)
	w.mu.Lock()
	lastGood, goodWhen := w.lastGood, w.goodWhen
	w.mu.Unlock()
	w.mu.Lock()
	gen := w.gen + 1
	w.mu.Unlock()
	in := reportInput{Script: sc, Digits: runtime.DefaultDigits, Version: version(), When: time.Now(), Live: true, Gen: gen, Path: w.file}
	if err == nil {
		s := scriptSession(w.budget, nil)
		s.OutDir = outDirFor(w.file, "", false)
		s.InDir = filepath.Dir(w.file)
		in.Results, in.Err = sc.Evaluate(s, w.tol)
		in.Digits = s.Digits
		var none *runtime.NoStatementsError
		if errors.As(in.Err, &none) {
			in.Script, in.LoadErr = nil, in.Err
		}
	} else {
		in.Script, in.LoadErr = nil, err
	}
	if in.Err != nil || in.LoadErr != nil {
		in.LastGood, in.LastGoodWhen = lastGood, goodWhen
		fmt.Fprintf(w.log, "%v\n", firstNonNil(in.LoadErr, in.Err))
	}
	page, article, rerr := renderReportParts(in)
	if rerr != nil {
		fmt.Fprintf(w.log, "loopwise watch: %v\n", rerr)
		return sum
	}
	w.mu.Lock()
	defer w.mu.Unlock()
	if in.Err == nil && in.LoadErr == nil {
		w.lastGood, w.goodWhen = article, in.When
	}
	w.page = page
	w.gen++
	close(w.changed)
	w.changed = make(chan struct{})
	return sum
}

func firstNonNil(errs ...error) error {
	for _, e := range errs {
		if e != nil {
			return e
		}
	}
	return nil
}

func (w *watcher) handlePage(rw http.ResponseWriter, r *http.Request) {
	if r.URL.Path != "/" {
		http.NotFound(rw, r)
		return
	}
	w.mu.Lock()
	page, gen := w.page, w.gen
	w.mu.Unlock()
	rw.Header().Set("Content-Type", "text/html; charset=utf-8")
	rw.Header().Set("Cache-Control", "no-store")
	rw.Header().Set("X-Loopwise-Gen", strconv.Itoa(gen))
	rw.Write(page)
}

// handleGen answers the number of the current page once it is above
// ?since=N, or after 20 s; the page asks it in a loop.
func (w *watcher) handleGen(rw http.ResponseWriter, r *http.Request) {
	since, _ := strconv.Atoi(r.URL.Query().Get("since"))
	timeout := time.NewTimer(20 * time.Second)
	defer timeout.Stop()
	for {
		w.mu.Lock()
		gen, ch := w.gen, w.changed
		w.mu.Unlock()
		if gen > since {
			rw.Header().Set("Cache-Control", "no-store")
			fmt.Fprint(rw, gen)
			return
		}
		select {
		case <-ch:
		case <-timeout.C:
			fmt.Fprint(rw, gen)
			return
		case <-r.Context().Done():
			return
		}
	}
}

// liveScript is put into the page watch serves (never into a report
// file): it waits for a new page, then swaps the content in place and
// restores the scroll position.
const liveScript = `<script>
(function () {
  var gen = %d;
  function swap() {
    fetch('/', {cache: 'no-store'}).then(function (r) { return r.text(); }).then(function (text) {
      var doc = new DOMParser().parseFromString(text, 'text/html');
      var x = window.scrollX, y = window.scrollY;
      document.querySelector('main').innerHTML = doc.querySelector('main').innerHTML;
      document.title = doc.title;
      window.scrollTo(x, y);
    });
  }
  function wait() {
    fetch('/gen?since=' + gen, {cache: 'no-store'}).then(function (r) { return r.text(); }).then(function (t) {
      var n = parseInt(t, 10);
      if (n > gen) { gen = n; swap(); }
      wait();
    }).catch(function () { setTimeout(wait, 1000); });
  }
  wait();
})();
</script>`
