package render

import (
	"encoding/base64"
	"fmt"
	"html/template"
	"mime"
	"net/url"
	"os"
	"path/filepath"
	"strings"
)

// pageImages makes the addresses of the page's images: data URIs when
// embedding, else paths relative to the page's folder, so that the page
// and the run folder can move together.
type pageImages struct {
	embed   bool
	pageDir string // absolute folder of the page
}

// newPageImages returns the addresser for a page written to out.
func newPageImages(out string, embed bool) (pageImages, error) {
	abs, err := filepath.Abs(out)
	if err != nil {
		return pageImages{}, fmt.Errorf("report %s: %w", out, err)
	}
	return pageImages{embed: embed, pageDir: filepath.Dir(abs)}, nil
}

// URL returns the address of the image file at path. The address is built
// here from a file the run folder holds (a base64 data URI or an escaped
// relative path), so it is safe to mark as a URL for html/template.
func (im pageImages) URL(path string) (template.URL, error) {
	if im.embed {
		data, err := os.ReadFile(path)
		if err != nil {
			return "", fmt.Errorf("report: embedding %w", err)
		}
		kind := mime.TypeByExtension(strings.ToLower(filepath.Ext(path)))
		if kind == "" {
			kind = "application/octet-stream"
		}
		kind, _, _ = strings.Cut(kind, ";")
		return template.URL("data:" + kind + ";base64," + base64.StdEncoding.EncodeToString(data)), nil
	}
	abs, err := filepath.Abs(path)
	if err != nil {
		return "", fmt.Errorf("report: %w", err)
	}
	rel, err := filepath.Rel(im.pageDir, abs)
	if err != nil {
		return template.URL((&url.URL{Scheme: "file", Path: filepath.ToSlash(abs)}).String()), nil
	}
	parts := strings.Split(filepath.ToSlash(rel), "/")
	for i, p := range parts {
		parts[i] = url.PathEscape(p)
	}
	return template.URL(strings.Join(parts, "/")), nil
}
