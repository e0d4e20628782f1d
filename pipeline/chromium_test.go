package pipeline

import (
	"context"
	"image"
	"image/color"
	"image/png"
	"os"
	"os/exec"
	"path/filepath"
	"regexp"
	"strings"
	"testing"
	"time"

	"slipfront/report"
)

// chromiumTimeout bounds one headless Chromium run (it loads one local
// page; a minute is generous on a busy machine).
const chromiumTimeout = 2 * time.Minute

// screenshot renders the page at path in headless Chromium (Debian's
// chromium; skipped when it is not installed, CI installs it) at
// 1200 × 2000 pixels and returns the PNG's path. The flags keep it off
// the network and out of the user's profile.
func screenshot(t *testing.T, path string) string {
	t.Helper()
	bin, err := exec.LookPath("chromium")
	if err != nil {
		t.Skip("chromium not installed: the page is not rendered")
	}
	out := filepath.Join(t.TempDir(), "page.png")
	ctx, cancel := context.WithTimeout(context.Background(), chromiumTimeout)
	defer cancel()
	cmd := exec.CommandContext(ctx, bin, "--headless", "--no-sandbox", "--disable-gpu", "--disable-quic", "--no-first-run",
		"--disable-background-networking", "--disable-component-update", "--disable-sync",
		"--user-data-dir="+t.TempDir(), "--screenshot="+out, "--window-size=1200,2000", "file://"+path)
	if b, err := cmd.CombinedOutput(); err != nil {
		t.Fatalf("chromium: %v\n%s", err, b)
	}
	return out
}

// readPNG decodes the PNG at path.
func readPNG(t *testing.T, path string) image.Image {
	t.Helper()
	f, err := os.Open(path)
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	img, err := png.Decode(f)
	if err != nil {
		t.Fatal(err)
	}
	return img
}

// pixelShares returns the share of the pixels of a that are not white,
// and the share that differ from b's (same size).
func pixelShares(t *testing.T, a, b image.Image) (inked, differ float64) {
	t.Helper()
	if a.Bounds() != b.Bounds() {
		t.Fatalf("screenshots of %v and %v pixels", a.Bounds(), b.Bounds())
	}
	r := a.Bounds()
	var ink, diff int
	for y := r.Min.Y; y < r.Max.Y; y++ {
		for x := r.Min.X; x < r.Max.X; x++ {
			ca, cb := color.NRGBAModel.Convert(a.At(x, y)), color.NRGBAModel.Convert(b.At(x, y))
			if ca != (color.NRGBA{255, 255, 255, 255}) {
				ink++
			}
			if ca != cb {
				diff++
			}
		}
	}
	n := float64(r.Dx() * r.Dy())
	return float64(ink) / n, float64(diff) / n
}

var (
	externalURL = regexp.MustCompile(`(?i)(https?:)?//[a-z0-9.-]+\.[a-z]{2,}`)
	imgSource   = regexp.MustCompile(`<img src="([^"]*)"`)
)

// The report page of a run and of a batch is one self-contained file:
// no URL outside it, every picture embedded as a PNG data URI; copied
// alone into an empty folder it renders in headless Chromium, and its
// pictures show (the screenshot changes when they are taken out).
func TestReportPageInChromium(t *testing.T) {
	runDir, _ := sharedRun(t)
	batchDir, _ := singleFractureBatch(t)
	for _, c := range []struct{ kind, dir string }{{"run", runDir}, {"batch", batchDir}} {
		rep, html := reportPage(t, c.dir)
		if u := externalURL.FindString(html); u != "" {
			t.Errorf("%s page names %q: it must load nothing from elsewhere", c.kind, u)
		}
		srcs := imgSource.FindAllStringSubmatch(html, -1)
		pngs := 0
		for _, name := range folderFiles(t, rep) {
			if strings.HasSuffix(name, ".png") {
				pngs++
			}
		}
		if len(srcs) == 0 || len(srcs) != pngs {
			t.Errorf("%s page has %d images for %d pictures", c.kind, len(srcs), pngs)
		}
		for _, s := range srcs {
			if !strings.HasPrefix(s[1], "data:image/png;base64,iVBORw0KGgo") { // The PNG signature in base64.
				t.Errorf("%s page image %.40q is not an embedded PNG", c.kind, s[1])
			}
		}
		for _, want := range []string{"Inputs", programName, "schedule start", report.PageCaution} {
			if !strings.Contains(html, want) {
				t.Errorf("%s page lacks %q", c.kind, want)
			}
		}
		// The page alone, and a copy with the pictures taken out.
		alone := filepath.Join(t.TempDir(), ReportPageFile)
		bare := filepath.Join(t.TempDir(), ReportPageFile)
		if err := os.WriteFile(alone, []byte(html), 0o644); err != nil {
			t.Fatal(err)
		}
		if err := os.WriteFile(bare, []byte(imgSource.ReplaceAllString(html, `<img src=""`)), 0o644); err != nil {
			t.Fatal(err)
		}
		inked, differ := pixelShares(t, readPNG(t, screenshot(t, alone)), readPNG(t, screenshot(t, bare)))
		// At least one picture shows in the 1200 × 2000 window below the
		// tables: about 1100 × 800 pixels, a sixth or more of them inked,
		// so without the pictures at least 5 % of the window changes. A
		// blank page has no ink.
		const minInk, minChange = 0.02, 0.05
		t.Logf("%s page: %.1f %% inked, %.1f %% changed without the pictures", c.kind, 100*inked, 100*differ)
		if inked < minInk || differ < minChange {
			t.Errorf("%s page screenshot: %.1f %% of the pixels inked, %.1f %% changed without the pictures: want ≥ %g %% and ≥ %g %%",
				c.kind, 100*inked, 100*differ, 100*minInk, 100*minChange)
		}
	}
}
