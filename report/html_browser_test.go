package report

import (
	"context"
	"fmt"
	"net/url"
	"os"
	"os/exec"
	"path/filepath"
	"strings"
	"testing"
	"time"

	"coefaudit/audit"

	"golang.org/x/net/html"
)

// chromiumPath finds a headless-capable Chromium. Without one the browser
// tests skip, unless CI=true, where they fail: CI installs it with
// .ci/install-chromium.
func chromiumPath(t *testing.T) string {
	t.Helper()
	for _, name := range []string{"/usr/bin/chromium", "chromium", "chromium-browser"} {
		if p, err := exec.LookPath(name); err == nil {
			return p
		}
	}
	msg := "chromium not found: install it with .ci/install-chromium (apt-get install chromium) to test the HTML report in a browser"
	if os.Getenv("CI") == "true" {
		t.Fatal(msg + "; CI=true requires it")
	}
	t.Skip(msg)
	return ""
}

// chromium runs headless Chromium on the page with extra flags and returns
// its standard output.
func chromium(t *testing.T, bin, profile, page string, flags ...string) string {
	t.Helper()
	stdout, _ := chromiumLogged(t, bin, profile, page, flags...)
	return stdout
}

// chromiumLogged is chromium that also returns what the page wrote to the
// console: Chromium logs every console message, a script's uncaught
// exception and a Content-Security-Policy refusal to its standard error as
// a line with ":CONSOLE" (--enable-logging=stderr).
func chromiumLogged(t *testing.T, bin, profile, page string, flags ...string) (string, []string) {
	t.Helper()
	ctx, cancel := context.WithTimeout(context.Background(), 90*time.Second)
	defer cancel()
	args := append([]string{"--headless", "--no-sandbox", "--disable-gpu", "--disable-quic", "--no-first-run",
		"--disable-background-networking", "--disable-component-update", "--disable-sync", "--disable-dev-shm-usage",
		"--enable-logging=stderr", "--v=0", "--user-data-dir=" + profile}, flags...)
	cmd := exec.CommandContext(ctx, bin, append(args, page)...)
	var stdout, stderr strings.Builder
	cmd.Stdout, cmd.Stderr = &stdout, &stderr
	if err := cmd.Run(); err != nil {
		t.Fatalf("chromium %s: %v\n%s", strings.Join(flags, " "), err, stderr.String())
	}
	var console []string
	for _, line := range strings.Split(stderr.String(), "\n") {
		if strings.Contains(line, ":CONSOLE") {
			console = append(console, line)
		}
	}
	return stdout.String(), console
}

// TestWriteHTMLInChromium opens the demo's report in headless Chromium with
// a filter in the URL, checks in the DOM the page's script left that every
// claim has its line, that exactly the filtered-out lines and cards are
// hidden, and that the summary and the filters were moved before the
// claims, and takes a screenshot (kept in the test's temporary folder and
// logged).
func TestWriteHTMLInChromium(t *testing.T) {
	bin := chromiumPath(t)
	rep, in := demoReport(t)
	dir := t.TempDir()
	path := filepath.Join(dir, "report.html")
	if err := os.WriteFile(path, writeInput(t, "html", in), 0o600); err != nil {
		t.Fatal(err)
	}
	pageURL := (&url.URL{Scheme: "file", Path: path}).String()
	// The study with the most claims, so that the filters leave some shown.
	perStudy := map[string]int{}
	study := ""
	for _, c := range rep.Claims {
		perStudy[c.Study]++
		if perStudy[c.Study] > perStudy[study] {
			study = c.Study
		}
	}
	tests := []struct {
		name string
		// query and fragment added to the page's URL
		suffix string
		keep   func(audit.ClaimResult) bool
	}{
		{"outcome in the fragment", "#outcome=unsupported", func(c audit.ClaimResult) bool { return c.Outcome == audit.Unsupported }},
		{"two outcomes and a study", "#outcome=consistent,incomplete&study=" + url.QueryEscape(study),
			func(c audit.ClaimResult) bool {
				return (c.Outcome == audit.Consistent || c.Outcome == audit.Incomplete) && c.Study == study
			}},
		{"study in the query", "?study=" + url.QueryEscape(study), func(c audit.ClaimResult) bool { return c.Study == study }},
		{"no filter", "", func(audit.ClaimResult) bool { return true }},
	}
	// Each browser gets its own profile, so the runs can share the cores.
	for i, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			t.Parallel()
			profile := filepath.Join(dir, fmt.Sprintf("profile-%d", i))
			dom := chromium(t, bin, profile, pageURL+tt.suffix, "--dump-dom", "--virtual-time-budget=3000")
			doc, err := html.Parse(strings.NewReader(dom))
			if err != nil {
				t.Fatal(err)
			}
			check := func(what string, nodes []*html.Node, claims []audit.ClaimResult) int {
				t.Helper()
				if len(nodes) != len(claims) {
					t.Fatalf("the DOM has %d %s, want %d", len(nodes), what, len(claims))
				}
				shown := 0
				for i, n := range nodes {
					c := claims[i]
					_, hidden := attr(n, "hidden")
					filtered, _ := attr(n, "data-filtered")
					if want := !tt.keep(c); hidden != want || (filtered == "out") != want {
						t.Errorf("%s of claim %s (%s, %s): hidden=%v data-filtered=%q, want hidden=%v", what, c.Claim, c.Study, c.Outcome, hidden, filtered, want)
					}
					if !hidden {
						shown++
					}
				}
				return shown
			}
			shown := check("lines", claimLines(doc), rep.Claims)
			check("cards", claimSections(doc), flaggedClaims(rep))
			if shown == 0 {
				t.Error("the filter left no claim shown; the test needs one")
			}
			count := findAll(doc, func(n *html.Node) bool { id, _ := attr(n, "id"); return id == "shown-count" })
			want := fmt.Sprintf("Showing %d of %d claims", shown, len(rep.Claims))
			if len(count) != 1 || textOf(count[0]) != want {
				t.Errorf("shown-count = %q, want %q", textOf(count[0]), want)
			}
			form := findAll(doc, func(n *html.Node) bool { id, _ := attr(n, "id"); return id == "filters" })
			if _, hidden := attr(form[0], "hidden"); len(form) != 1 || hidden {
				t.Error("the script did not reveal the filters")
			}
			// The summary and the filters now stand before the table of claims.
			var order []string
			for _, n := range findAll(doc, func(n *html.Node) bool { id, _ := attr(n, "id"); return id != "" }) {
				id, _ := attr(n, "id")
				if id == "summary" || id == "filters" || id == "index" {
					order = append(order, id)
				}
			}
			if strings.Join(order, " ") != "summary filters index" {
				t.Errorf("page order %v, want the summary and the filters before the claims", order)
			}
		})
	}
	t.Run("screenshot", func(t *testing.T) {
		t.Parallel()
		shot := filepath.Join(dir, "report.png")
		_, console := chromiumLogged(t, bin, filepath.Join(dir, "profile-shot"), pageURL+"#outcome=unsupported,reversed,missed,conflict",
			"--screenshot="+shot, "--window-size=1200,1600", "--hide-scrollbars", "--virtual-time-budget=3000")
		// Issue 20: the page opens with no console message: no script
		// error, no refusal by its Content-Security-Policy.
		for _, m := range console {
			t.Errorf("console: %s", m)
		}
		checkScreenshot(t, shot, "report.png")
	})
}

// TestChromiumConsoleCaught: the console check of the screenshot sees a
// script's error, so that a clean console there means something.
func TestChromiumConsoleCaught(t *testing.T) {
	bin := chromiumPath(t)
	dir := t.TempDir()
	path := filepath.Join(dir, "broken.html")
	page := `<!DOCTYPE html><html><body><p>x</p><script>console.error("broken page"); notDefined();</script></body></html>`
	if err := os.WriteFile(path, []byte(page), 0o600); err != nil {
		t.Fatal(err)
	}
	_, console := chromiumLogged(t, bin, filepath.Join(dir, "profile"), (&url.URL{Scheme: "file", Path: path}).String(),
		"--dump-dom", "--virtual-time-budget=1000")
	if len(console) < 2 || !strings.Contains(strings.Join(console, "\n"), "notDefined") {
		t.Errorf("console = %q, want the page's error and its uncaught exception", console)
	}
}

func sizeOf(fi os.FileInfo) int64 {
	if fi == nil {
		return 0
	}
	return fi.Size()
}
