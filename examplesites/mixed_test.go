// The mixed-range campus agrees with the plain one: the same forty sensor
// positions and names, each with a type and a range, then the gateways.

package examplesites

import (
	"encoding/json"
	"slices"
	"testing"
)

func TestMixedSites(t *testing.T) {
	plain := decode(t, SitesFile, SitesGeoJSON())
	mixed := decode(t, MixedSitesFile, MixedSitesGeoJSON())
	if len(mixed.Features) != 46 {
		t.Fatalf("want 46 sites, got %d", len(mixed.Features))
	}
	for i, f := range mixed.Features {
		typ, _ := f.Properties["type"].(string)
		rng, _ := f.Properties["range"].(string)
		t.Run(f.Properties["id"].(string), func(t *testing.T) {
			if i < len(plain.Features) {
				if typ != "sensor" || rng != "80m" || string(f.Geometry.Coordinates) != string(plain.Features[i].Geometry.Coordinates) ||
					f.Properties["name"] != plain.Features[i].Properties["name"] {
					t.Errorf("sensor %d: %v %s differs from %s", i, f.Properties, f.Geometry.Coordinates, SitesFile)
				}
			} else if typ != "gateway" || rng != "180m" {
				t.Errorf("gateway %d: %v", i, f.Properties)
			}
		})
	}
	var ref struct {
		Sites  int   `json:"sites"`
		Hidden []int `json:"hidden"`
	}
	if err := json.Unmarshal(MixedReferenceJSON(), &ref); err != nil || ref.Sites != 46 || !slices.IsSorted(ref.Hidden) {
		t.Errorf("%s: %v %+v", MixedReferenceFile, err, ref)
	}
}
