package main

import (
	"context"
	"io"
	"net"
	"net/http"
	"os"
	"path/filepath"
	"strings"
	"testing"
	"time"
)

// startWatch serves script from a temporary file and returns the file,
// the server's address and a stop function that waits for the server to
// end.
func startWatch(t *testing.T, script string) (string, string, func()) {
	t.Helper()
	path := filepath.Join(t.TempDir(), "w.lw")
	if err := os.WriteFile(path, []byte(script), 0o644); err != nil {
		t.Fatal(err)
	}
	ln, err := net.Listen("tcp", "127.0.0.1:0")
	if err != nil {
		t.Fatal(err)
	}
	ctx, cancel := context.WithCancel(context.Background())
	w := &watcher{file: path, budget: 60, tol: 1e-9, log: io.Discard}
	done := make(chan error, 1)
	go func() { done <- w.serve(ctx, ln) }()
	stop := func() {
		cancel()
		select {
		case err := <-done:
			if err != nil {
				t.Errorf("serve: %v", err)
			}
		case <-time.After(5 * time.Second):
			t.Error("the server did not stop")
		}
	}
	t.Cleanup(cancel)
	return path, "http://" + ln.Addr().String(), stop
}

func get(t *testing.T, url string) string {
	t.Helper()
	r, err := http.Get(url)
	if err != nil {
		t.Fatal(err)
	}
	defer r.Body.Close()
	b, err := io.ReadAll(r.Body)
	if err != nil {
		t.Fatal(err)
	}
	return string(b)
}

// waitFor fetches the page until it holds want.
func waitFor(t *testing.T, url, want string) string {
	t.Helper()
	deadline := time.Now().Add(10 * time.Second)
	for {
		page := get(t, url)
		if strings.Contains(page, want) {
			return page
		}
		if time.Now().After(deadline) {
			t.Fatalf("the page never showed %q:\n%s", want, page)
		}
		time.Sleep(50 * time.Millisecond)
	}
}

// TestWatch: the served page follows the file; an error shows at its line
// with the last good results beneath; cancelling stops the server.
func TestWatch(t *testing.T) {
	path, url, stop := startWatch(t, "# W\n\n```lw\na = 2 m * 3\n```\n")
	page := waitFor(t, url+"/", "<output>6 m</output>")
	if !strings.Contains(page, "<script>") || strings.Contains(page, `id="last-good"`) {
		t.Error("the first page lacks its live script or shows last good results")
	}
	if g := get(t, url+"/gen?since=0"); g != "1" {
		t.Errorf("gen %q, want 1", g)
	}
	if err := os.WriteFile(path, []byte("# W\n\n```lw\na = 2 m * 4\n```\n"), 0o644); err != nil {
		t.Fatal(err)
	}
	if g := get(t, url+"/gen?since=1"); g != "2" { // waits for the change
		t.Errorf("gen %q, want 2", g)
	}
	waitFor(t, url+"/", "<output>8 m</output>")
	if err := os.WriteFile(path, []byte("# W\n\n```lw\na = 2 m * 4\nb = a + 1 s\n```\n"), 0o644); err != nil {
		t.Fatal(err)
	}
	page = waitFor(t, url+"/", "Error at line 5")
	last := page[strings.Index(page, `id="last-good"`):]
	if !strings.Contains(last, "<output>8 m</output>") {
		t.Errorf("the last good results are not beneath the error:\n%s", page)
	}
	if strings.Index(page, "Error at line 5") > strings.Index(page, `id="last-good"`) {
		t.Error("the error is not above the last good results")
	}
	req, _ := http.NewRequest("GET", url+"/", nil)
	req.Host = "elsewhere.example:80"
	if r, err := http.DefaultClient.Do(req); err != nil {
		t.Error(err)
	} else if r.StatusCode != http.StatusForbidden {
		t.Errorf("a request for another host: %s, want 403", r.Status)
	}
	stop()
	if _, err := http.Get(url + "/"); err == nil {
		t.Error("the server still answers after it stopped")
	}
}
