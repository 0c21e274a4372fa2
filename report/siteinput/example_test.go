package siteinput_test

import (
	"errors"
	"fmt"

	"github.com/sitecover/sitecover/report/siteinput"
)

// Load a CSV of sites in local metres and a GeoJSON area with an
// exclusion zone; then a file with a bad coordinate.
func ExampleLoad() {
	sites := siteinput.Source{Name: "sites.csv", Data: []byte("name,x,y\ngate,10,10\nyard,90,10\nroof,50,80\nroof,50,80\n")}
	area := siteinput.Source{Name: "area.geojson", Data: []byte(`{"type":"FeatureCollection","features":[
	 {"type":"Feature","properties":{"name":"Depot"},"geometry":{"type":"Polygon","coordinates":[[[0,0],[100,0],[100,100],[0,100],[0,0]]]}},
	 {"type":"Feature","properties":{"exclude":true},"geometry":{"type":"Polygon","coordinates":[[[40,40],[60,40],[60,60],[40,60],[40,40]]]}}]}`)}
	sc, err := siteinput.Load(siteinput.Inputs{Sites: sites, Area: &area, Planar: true})
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Println(sc.Title, sc.Names, sc.Sites)
	fmt.Printf("area %g m², projected: %v\n", sc.Region.Area(), sc.Projection != nil)
	for _, w := range sc.Warnings {
		fmt.Println("warning:", w)
	}

	bad := siteinput.Source{Name: "bad.csv", Data: []byte("lat,lon\n44,-99\n95.2,-99\n")}
	_, err = siteinput.Load(siteinput.Inputs{Sites: bad})
	var ie *siteinput.Error
	fmt.Println(errors.As(err, &ie), err)
	// Output:
	// Depot [gate yard roof roof] [[10 10] [90 10] [50 80] [50 80]]
	// area 9600 m², projected: false
	// warning: 1 site repeats the exact position of an earlier site and shares its service area: roof (#4) = roof (#3)
	// true bad.csv line 3: latitude 95.2 is outside -90..90
}

// The sites' own columns are kept as attributes, one value per site.
func ExampleScene_attributes() {
	sites := siteinput.Source{Name: "sites.geojson", Data: []byte(`{"type":"FeatureCollection","features":[
	 {"type":"Feature","properties":{"name":"gate","floor":0,"owner":"ACME"},"geometry":{"type":"Point","coordinates":[0,0]}},
	 {"type":"Feature","properties":{"name":"yard","floor":2},"geometry":{"type":"Point","coordinates":[100,0]}},
	 {"type":"Feature","properties":{"name":"roof","floor":5,"owner":"Bob"},"geometry":{"type":"Point","coordinates":[50,80]}}]}`)}
	sc, err := siteinput.Load(siteinput.Inputs{Sites: sites, Planar: true})
	if err != nil {
		fmt.Println(err)
		return
	}
	for _, a := range sc.Attributes {
		fmt.Println(a.Name, a.Type, a.Values)
	}
	// Output:
	// floor INTEGER [0 2 5]
	// owner TEXT [ACME <nil> Bob]
}
