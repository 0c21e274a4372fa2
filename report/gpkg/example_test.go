// Runnable examples of writing and reading a GeoPackage.

package gpkg_test

import (
	"fmt"
	"log"
	"os"
	"path/filepath"

	"github.com/paulmach/orb"
	"github.com/sitecover/sitecover/report/gpkg"
)

// Writing two layers, sites as points in WGS 84 and a service area as a
// multipolygon, then reading them back.
func Example() {
	dir, err := os.MkdirTemp("", "gpkg-example")
	if err != nil {
		log.Fatal(err)
	}
	defer os.RemoveAll(dir)
	path := filepath.Join(dir, "run.gpkg")

	w, err := gpkg.Create(path, gpkg.Options{})
	if err != nil {
		log.Fatal(err)
	}
	sites, err := w.AddLayer(gpkg.LayerSpec{
		Name: "sites", Geometry: gpkg.Point, SRS: gpkg.WGS84, SpatialIndex: true,
		Fields: []gpkg.Field{{Name: "id", Type: gpkg.Text}, {Name: "range_m", Type: gpkg.Real}},
	})
	if err != nil {
		log.Fatal(err)
	}
	areas, err := w.AddLayer(gpkg.LayerSpec{
		Name: "service_areas", Geometry: gpkg.MultiPolygon, SRS: gpkg.WGS84,
		Fields: []gpkg.Field{{Name: "site", Type: gpkg.Text}},
	})
	if err != nil {
		log.Fatal(err)
	}
	if err := sites.Insert(orb.Point{9.1771, 48.7823}, "mast-1", 120.0); err != nil {
		log.Fatal(err) // after an error, Close removes the file
	}
	cell := orb.Polygon{{{9.176, 48.781}, {9.178, 48.781}, {9.178, 48.783}, {9.176, 48.783}, {9.176, 48.781}}}
	if err := areas.Insert(cell, "mast-1"); err != nil { // promoted to a MultiPolygon
		log.Fatal(err)
	}
	if err := w.Close(); err != nil {
		log.Fatal(err)
	}

	r, err := gpkg.Open(path)
	if err != nil {
		log.Fatal(err)
	}
	defer r.Close()
	layers, err := r.Layers()
	if err != nil {
		log.Fatal(err)
	}
	for _, l := range layers {
		if err := l.RequireWGS84(); err != nil {
			log.Fatal(err)
		}
		err := r.ReadLayer(l.Name, func(f gpkg.Feature) error {
			fmt.Println(l.Name, l.Geometry, f.FID, f.Geometry.GeoJSONType(), f.Properties)
			return nil
		})
		if err != nil {
			log.Fatal(err)
		}
	}
	// Output:
	// sites POINT 1 Point map[id:mast-1 range_m:120]
	// service_areas MULTIPOLYGON 1 MultiPolygon map[site:mast-1]
}
