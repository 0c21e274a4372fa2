// The page's assets, embedded in the binary (go:embed): index.html,
// style.css and app.js, plain HTML, CSS and JavaScript with no outside
// library, no network fetch beyond this server's own API.

package review

import (
	"embed"
	"io/fs"
)

//go:embed assets
var assets embed.FS

// assetFS is the assets folder served under /assets/.
func assetFS() fs.FS {
	sub, err := fs.Sub(assets, "assets")
	if err != nil {
		panic(err) // the embedded folder is fixed at build time
	}
	return sub
}

// pageHTML is the page.
func pageHTML() []byte {
	b, err := assets.ReadFile("assets/index.html")
	if err != nil {
		panic(err) // the embedded file is fixed at build time
	}
	return b
}
