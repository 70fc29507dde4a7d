package main

import (
	"bytes"
	"context"
	"image"
	"image/png"
	"os"
	"os/exec"
	"path/filepath"
	"regexp"
	"strings"
	"testing"
	"time"
)

// The browser checks open rollwise's HTML pages in a real headless
// Chromium (Debian's chromium package; .ci/run installs it): the page
// loads without console messages, its pictures have the marks expected,
// and a screenshot is not blank. They need the browser, named by
// ROLLWISE_TEST_BROWSER or found at /usr/bin/chromium; without one they
// are skipped, and under CI=true they fail.

const envBrowser = "ROLLWISE_TEST_BROWSER"

func browserPath(t *testing.T) string {
	t.Helper()
	if p := os.Getenv(envBrowser); p != "" {
		return p
	}
	if _, err := os.Stat("/usr/bin/chromium"); err == nil {
		return "/usr/bin/chromium"
	}
	msg := "no browser: set " + envBrowser + " or install Debian's chromium package (apt-get install chromium)"
	if os.Getenv("CI") == "true" {
		t.Fatal(msg + "; under CI=true the browser checks must run")
	}
	t.Skip(msg)
	return ""
}

// consoleRE finds what Chromium logs for each console message (errors,
// warnings and uncaught exceptions alike) with --enable-logging=stderr.
var consoleRE = regexp.MustCompile(`:CONSOLE[^\]]*\] (.*)`)

// chromium runs the browser headless on a page with extra flags and
// returns its stdout and the console messages it logged.
func chromium(t *testing.T, page string, flags ...string) (string, []string) {
	t.Helper()
	abs, err := filepath.Abs(page)
	if err != nil {
		t.Fatal(err)
	}
	ctx, cancel := context.WithTimeout(context.Background(), 2*time.Minute)
	defer cancel()
	args := append([]string{"--headless=new", "--no-sandbox", "--disable-gpu", "--no-first-run",
		"--user-data-dir=" + t.TempDir(), "--enable-logging=stderr", "--v=0"}, flags...)
	cmd := exec.CommandContext(ctx, browserPath(t), append(args, "file://"+abs)...)
	var out, errb bytes.Buffer
	cmd.Stdout, cmd.Stderr = &out, &errb
	if err := cmd.Run(); err != nil {
		t.Fatalf("chromium %s: %v\n%s", page, err, errb.String())
	}
	var console []string
	for _, m := range consoleRE.FindAllStringSubmatch(errb.String(), -1) {
		console = append(console, m[1])
	}
	return out.String(), console
}

// loadPage opens a page and returns its DOM as the browser built it,
// failing the test on any console message.
func loadPage(t *testing.T, page string) string {
	t.Helper()
	dom, console := chromium(t, page, "--dump-dom")
	for _, c := range console {
		t.Errorf("%s: console: %s", filepath.Base(page), c)
	}
	if !strings.Contains(dom, "</html>") {
		t.Fatalf("%s: no document came back:\n%s", page, dom)
	}
	return dom
}

// screenshotVaried takes a screenshot of a page and checks that it is not
// blank: many colours, and a fair share of pixels that are not the
// background's.
func screenshotVaried(t *testing.T, page string) {
	t.Helper()
	shot := filepath.Join(t.TempDir(), "shot.png")
	chromium(t, page, "--screenshot="+shot, "--window-size=1000,800", "--hide-scrollbars")
	f, err := os.Open(shot)
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	img, err := png.Decode(f)
	if err != nil {
		t.Fatal(err)
	}
	colours, inked, total := pixelVariety(img)
	if colours < 16 || inked*100 < total { // at least 1% of the pixels drawn
		t.Errorf("%s: the screenshot looks blank: %d colours, %d of %d pixels not background", filepath.Base(page), colours, inked, total)
	}
}

// pixelVariety counts the distinct colours of an image and the pixels
// that differ from its top-left pixel (the background).
func pixelVariety(img image.Image) (colours, inked, total int) {
	seen := map[[4]uint32]bool{}
	b := img.Bounds()
	r0, g0, b0, _ := img.At(b.Min.X, b.Min.Y).RGBA()
	for y := b.Min.Y; y < b.Max.Y; y++ {
		for x := b.Min.X; x < b.Max.X; x++ {
			r, g, bl, a := img.At(x, y).RGBA()
			seen[[4]uint32{r, g, bl, a}] = true
			if r != r0 || g != g0 || bl != b0 {
				inked++
			}
			total++
		}
	}
	return len(seen), inked, total
}

// TestBrowserHarnessSeesConsoleErrors proves the console capture works:
// a page that logs an error and throws must be caught.
func TestBrowserHarnessSeesConsoleErrors(t *testing.T) {
	t.Parallel()
	page := filepath.Join(t.TempDir(), "bad.html")
	os.WriteFile(page, []byte(`<!DOCTYPE html><html><body><script>console.error("boom"); missingFunction();</script></body></html>`), 0o644)
	_, console := chromium(t, page, "--dump-dom")
	text := strings.Join(console, "\n")
	if !strings.Contains(text, "boom") || !strings.Contains(text, "missingFunction") {
		t.Errorf("the console capture missed the page's errors: %q", console)
	}
	blank := image.NewRGBA(image.Rect(0, 0, 10, 10))
	if colours, inked, _ := pixelVariety(blank); colours != 1 || inked != 0 {
		t.Errorf("a blank image counts %d colours, %d inked pixels", colours, inked)
	}
}

func TestBrowserShowsTheCatalog(t *testing.T) {
	t.Parallel()
	browserPath(t)
	dir := writeCatalog(t, catalogModels...)
	// takings builds on revenue and fees, which read sales and repairs.
	dom := loadPage(t, filepath.Join(dir, "measure-takings.html"))
	if n := strings.Count(dom, `<g class="node `); n != 5 {
		t.Errorf("the takings graph shows %d boxes, want 5", n)
	}
	if n := strings.Count(dom, "<polygon "); n != 4 {
		t.Errorf("the takings graph shows %d arrow heads, want 4", n)
	}
	dom = loadPage(t, filepath.Join(dir, "index.html"))
	if drawn, listed := strings.Count(dom, `<g class="node table">`), strings.Count(dom, `<tr><td><a href="table-`); drawn != listed || listed < 6 {
		t.Errorf("the index lists %d tables and draws %d", listed, drawn)
	}
	screenshotVaried(t, filepath.Join(dir, "measure-takings.html"))
}
