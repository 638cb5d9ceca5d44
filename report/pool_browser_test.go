package report

import (
	"bytes"
	"net/url"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"coefaudit/pool"

	"golang.org/x/net/html"
)

// TestIssue20PoolHTMLInChromium opens the demo's pooling page in headless
// Chromium: no console message (a script error or a refused style would
// show there), the pooled results, the heterogeneity sentences and the
// forest plot drawn inline as SVG in the DOM, and a screenshot, kept in
// the test's temporary folder and logged. A second page, with --covariance
// bound on claims of unknown covariance, shows its sensitivity analysis.
func TestIssue20PoolHTMLInChromium(t *testing.T) {
	bin := chromiumPath(t)
	dir := t.TempDir()
	doc := poolDemoDocument(t, pool.DefaultOptions)
	var buf bytes.Buffer
	if err := WritePoolHTML(&buf, doc); err != nil {
		t.Fatal(err)
	}
	path := filepath.Join(dir, "pool.html")
	if err := os.WriteFile(path, buf.Bytes(), 0o600); err != nil {
		t.Fatal(err)
	}
	pageURL := (&url.URL{Scheme: "file", Path: path}).String()
	t.Run("dom", func(t *testing.T) {
		t.Parallel()
		dom, console := chromiumLogged(t, bin, filepath.Join(dir, "profile-dom"), pageURL, "--dump-dom", "--virtual-time-budget=2000")
		if len(console) > 0 {
			t.Errorf("the pooling page logged to the console:\n%s", strings.Join(console, "\n"))
		}
		root, err := html.Parse(strings.NewReader(dom))
		if err != nil {
			t.Fatal(err)
		}
		svgs := findAll(root, func(n *html.Node) bool { return n.Type == html.ElementNode && n.Data == "svg" })
		if len(svgs) != 1 {
			t.Errorf("the DOM has %d inline SVG plots, want 1 (one pooled topic of 4 claims)", len(svgs))
		}
		text := textOf(root)
		for _, want := range []string{"Random effects (REML), HKSJ interval", "Between-study variance τ² =", "I² = 0%: the studies agree within their sampling error", "p = .008"} {
			if !strings.Contains(text, want) {
				t.Errorf("the pooling page lacks %q", want)
			}
		}
	})
	t.Run("screenshot", func(t *testing.T) {
		t.Parallel()
		shot := filepath.Join(dir, "pool.png")
		_, console := chromiumLogged(t, bin, filepath.Join(dir, "profile-shot"), pageURL,
			"--screenshot="+shot, "--window-size=1200,1600", "--hide-scrollbars")
		if len(console) > 0 {
			t.Errorf("the pooling page logged to the console:\n%s", strings.Join(console, "\n"))
		}
		checkScreenshot(t, shot, "pool.png")
	})
}

// checkScreenshot fails unless shot holds a rendered page, logs where it
// is, and keeps a copy named name in $COEFAUDIT_SCREENSHOT_DIR, when set,
// for a person to look at.
func checkScreenshot(t *testing.T, shot, name string) {
	t.Helper()
	fi, err := os.Stat(shot)
	if err != nil || fi.Size() < 10000 {
		t.Fatalf("screenshot %s: %v (size %d), want a rendered page", shot, err, sizeOf(fi))
	}
	t.Logf("screenshot: %s", shot)
	if keep := os.Getenv("COEFAUDIT_SCREENSHOT_DIR"); keep != "" {
		b, err := os.ReadFile(shot)
		if err == nil {
			err = os.WriteFile(filepath.Join(keep, name), b, 0o644)
		}
		if err != nil {
			t.Errorf("keeping the screenshot in %s: %v", keep, err)
		}
	}
}
