// Tests of the merged k-gap outlines (kgMergeOutline in kcover_gaps.go):
// the union of a gap's parts against GEOS (Debian python3-shapely,
// shapely.ops.unary_union), from testdata/kgap_union_ref.json written by
// testdata/ref_kgap_union.py from the parts of the k-coverage test scenes;
// TestKGapMergeLive re-runs the script on the parts of a fresh random scene
// under SITECOVER_LIVE=1. Regenerate the committed data with
//
//	SITECOVER_KGAP_PARTS=/tmp/parts.json go test -run TestKGapMergeWriteParts ./coverage
//	/usr/bin/python3 coverage/testdata/ref_kgap_union.py --in /tmp/parts.json
//
// Tolerances. Snapping moves each vertex by at most 2^−41 of the largest
// coordinate magnitude M (KGapSnapBits), changing the area by at most that
// times the perimeter; the union's rounded crossings move edges by a few
// ulps of M. The area bound is absolute, not relative to the gap: a
// tiny gap far from the origin (area 0.004 m² at M ≈ 100 m) moves by the
// same step as a large one. kMergeAreaTol takes the larger of
// kMergeRefAreaRel (1e-9 of the gap's area, far below a missing or extra
// part) and the snap bound: snap step s = 2^(e−KGapSnapBits) for
// M < 2^e, each vertex moves by at most s·√2/2, so one snapped outline's
// area moves by at most s·√2/2 times its perimeter P, and two outlines
// snapped on different grids (the merge of all of a scene's gaps uses the
// largest M of them, a gap on its own its own M) differ by at most
// √2·s·P; the bound used is 2·s·P. Points within kMergeRefEdge·M of an
// edge of either outline are not classified.

package coverage

import (
	"encoding/json"
	"fmt"
	"math"
	"os"
	"os/exec"
	"path/filepath"
	"testing"
	"time"

	"github.com/paulmach/orb"
	orbplanar "github.com/paulmach/orb/planar"
	"github.com/sitecover/sitecover/planar"
	"github.com/sitecover/sitecover/planar/sitegen"
)

// kMergeRefAreaRel is the relative area tolerance against GEOS (see the
// file comment).
const kMergeRefAreaRel = 1e-9

// kMergeAreaTol is the area tolerance for an outline mp whose vertices
// were snapped on the grid of coordinate magnitude m, or on a finer one
// (see the file comment): the larger of kMergeRefAreaRel of its area and
// 2·s·P for snap step s and perimeter P.
func kMergeAreaTol(mp orb.MultiPolygon, m float64) float64 {
	return max(kMergeRefAreaRel*math.Abs(coveredPolyArea(mp)), 2*kgSnapStep(m)*orbplanar.Length(mp))
}

// kMergeRefEdge is the distance from an edge, relative to the coordinate
// magnitude, within which a sample point is not classified (see the file
// comment).
const kMergeRefEdge = 1e-9

// kMergeMaxGaps is the number of gaps taken per scene, range and k (the
// first by closing range), to keep the committed data small.
const kMergeMaxGaps = 3

// kMergeMaxParts is the largest number of parts of a gap taken into the
// committed data (to keep it small).
const kMergeMaxParts = 150

// kMergeGap is one gap of kgap_union_ref.json (and, without the geos_
// members, of the parts file).
type kMergeGap struct {
	Scene     string           `json:"scene"`
	K         int              `json:"k"`
	ID        int              `json:"id"`
	Parts     orb.MultiPolygon `json:"parts"`
	GEOSArea  float64          `json:"geos_area"`
	GEOSPolys int              `json:"geos_polygons"`
	GEOSHoles int              `json:"geos_holes"`
	GEOSHow   string           `json:"geos_how"`
	GEOSUnion orb.MultiPolygon `json:"geos_union"`
}

// kMergeDoc is the parts file and kgap_union_ref.json.
type kMergeDoc struct {
	Generator string      `json:"generator,omitempty"`
	Gaps      []kMergeGap `json:"gaps"`
}

// kMergeParts returns the unmerged parts of every gap with at least two
// parts of the scenes at the ranges.
func kMergeParts(t testing.TB, scenes []kTestScene, ranges []float64) []kMergeGap {
	t.Helper()
	var out []kMergeGap
	for _, sc := range scenes {
		K := min(4, len(kDistinct(sc.l)))
		for _, r := range ranges {
			// CurveSamples keeps the pieces; gaps() then gives the parts
			// before KCover merges them.
			kc, err := KCover(sc.l, r, KOptions{MaxK: K, CurveSamples: 2})
			if err != nil {
				t.Fatal(err)
			}
			for li, lv := range kc.Levels {
				if lv.K < 2 {
					continue
				}
				n := 0
				for _, g := range kc.gaps(sc.l, li, DefaultChordTolerance) {
					if len(g.Outline) >= 2 && len(g.Outline) <= kMergeMaxParts && n < kMergeMaxGaps {
						out = append(out, kMergeGap{Scene: sc.name, K: lv.K, ID: g.ID, Parts: g.Outline})
						n++
					}
				}
			}
		}
	}
	return out
}

// kMergeScenes are the scenes of the committed data.
func kMergeScenes(t testing.TB) []kTestScene {
	var out []kTestScene
	for _, sc := range kTestScenes(t) {
		if sc.name != "uniform-300" { // large; the others cover its cases
			out = append(out, sc)
		}
	}
	return out
}

func TestKGapMergeWriteParts(t *testing.T) {
	path := os.Getenv("SITECOVER_KGAP_PARTS")
	if path == "" {
		t.Skip("set SITECOVER_KGAP_PARTS=<file> to write the parts for testdata/ref_kgap_union.py")
	}
	kMergeWrite(t, path, kMergeParts(t, kMergeScenes(t), []float64{14}))
}

func kMergeWrite(t *testing.T, path string, gaps []kMergeGap) {
	t.Helper()
	b, err := json.Marshal(kMergeDoc{Gaps: gaps})
	if err != nil {
		t.Fatal(err)
	}
	if err := os.WriteFile(path, b, 0o644); err != nil {
		t.Fatal(err)
	}
}

func kMergeLoad(t *testing.T, path string) []kMergeGap {
	t.Helper()
	var d kMergeDoc
	kLoadJSON(t, path, &d)
	if len(d.Gaps) == 0 {
		t.Fatalf("%s: no gaps", path)
	}
	return d.Gaps
}

func TestKGapMergeGEOS(t *testing.T) {
	kMergeCheck(t, kMergeLoad(t, filepath.Join("testdata", "kgap_union_ref.json")))
}

func TestKGapMergeLive(t *testing.T) {
	if os.Getenv("SITECOVER_LIVE") != "1" {
		t.Skip("set SITECOVER_LIVE=1 to re-run testdata/ref_kgap_union.py (GEOS via python3-shapely) on a fresh scene")
	}
	if _, err := os.Stat("/usr/bin/python3"); err != nil {
		t.Fatalf("reference tool missing: /usr/bin/python3: %v", err)
	}
	seed := uint64(kLiveSeed(t))
	pts := sitegen.Uniform(80, seed)
	for i := range pts {
		pts[i] = orb.Point{pts[i][0] * 100 / (math.Sqrt(80) * 10), pts[i][1] * 100 / (math.Sqrt(80) * 10)}
	}
	sc := kTestScene{"live", cvLayout(t, pts, benchArea(t, pts, 5))}
	dir := t.TempDir()
	in, out := filepath.Join(dir, "parts.json"), filepath.Join(dir, "ref.json")
	kMergeWrite(t, in, kMergeParts(t, []kTestScene{sc}, []float64{12, 16}))
	cmd := exec.Command("/usr/bin/python3", filepath.Join("testdata", "ref_kgap_union.py"), "--in", in, "--out", out)
	if b, err := cmd.CombinedOutput(); err != nil {
		t.Fatalf("ref_kgap_union.py failed (seed %d): %v\n%s", seed, err, b)
	}
	kMergeCheck(t, kMergeLoad(t, out))
}

// kLiveSeed returns SITECOVER_SEED or a fresh seed, logged.
func kLiveSeed(t *testing.T) int64 {
	seed := time.Now().UnixNano() % 1000000007
	if s := os.Getenv("SITECOVER_SEED"); s != "" {
		if err := json.Unmarshal([]byte(s), &seed); err != nil {
			t.Fatal(err)
		}
	}
	t.Logf("seed %d", seed)
	return seed
}

// kMergeCheck compares kgMergeOutline on each gap's parts with the GEOS
// union: the number of polygons and holes, the area, and the side of a grid
// of sample points.
func kMergeCheck(t *testing.T, gaps []kMergeGap) {
	// The merge of all gaps of one scene and k at once (kgMergeOutlines,
	// as KCover does it) must give the same outlines as each on its own,
	// up to the two snapping grids (kMergeAreaTol): parts that meet
	// within a snap step may touch at a point on one grid (an opened
	// pinch, one more polygon; kMergePinches) and share an edge on the
	// other.
	byLevel := map[string][]int{}
	for i, g := range gaps {
		key := fmt.Sprint(g.Scene, "/", g.K)
		byLevel[key] = append(byLevel[key], i)
	}
	for key, idx := range byLevel {
		gs := make([]KGap, len(idx))
		for j, i := range idx {
			gs[j].Outline = gaps[i].Parts
		}
		m := 0.0
		for _, g := range gs {
			m = max(m, kgMaxAbs(g.Outline))
		}
		kgMergeOutlines(gs)
		for j, i := range idx {
			own, _ := kgMergeOutline(gaps[i].Parts)
			all := gs[j].Outline
			extra := max(len(all)-len(own), len(own)-len(all))
			polysDiffer := extra > 0 && extra > kMergePinches(all)+kMergePinches(own)
			if a, b := coveredPolyArea(all), coveredPolyArea(own); polysDiffer || math.Abs(a-b) > kMergeAreaTol(own, m) {
				t.Errorf("%s gap %d: merged with the others %d polygons of area %.12g, alone %d of %.12g", key, gaps[i].ID, len(all), a, len(own), b)
			}
		}
	}
	for _, g := range gaps {
		got, refused := kgMergeOutline(g.Parts)
		// Reference: GEOS unary_union (python3-shapely), see
		// testdata/ref_kgap_union.py. A part the union refused (a
		// non-simple outline, kept as it is) may split a polygon of
		// GEOS's union or add one: at most refused more polygons each
		// way, and its holes may be missing.
		holes := 0
		for _, pg := range got {
			holes += len(pg) - 1
		}
		if refused > 0 {
			t.Logf("%s k=%d gap %d: %d of %d parts left unmerged (non-simple)", g.Scene, g.K, g.ID, refused, len(g.Parts))
		}
		// Pinch points: where GEOS keeps parts or a hole touching at a
		// point as one polygon, planar's union opens the point (its
		// documented convention), giving one more polygon or one hole
		// fewer per opened point.
		pinches := kMergePinches(got)
		// GEOS polygons closer than the snap step of the merge
		// (KGapSnapBits) are one polygon at the merge's resolution:
		// the merge joins parts that meet up to that step.
		geosPolys := kMergeComponents(g.GEOSUnion, kgSnapStep(kgMaxAbs(g.Parts)))
		countsAgree := len(got) >= geosPolys && holes <= g.GEOSHoles &&
			(len(got)-geosPolys)+(g.GEOSHoles-holes) <= pinches
		if refused > 0 && len(got) > 2*refused+g.GEOSPolys || refused == 0 && !countsAgree {
			t.Errorf("%s k=%d gap %d: %d polygons, %d holes; GEOS %d, %d (from %d parts); area %.12g, GEOS %.12g (%s)",
				g.Scene, g.K, g.ID, len(got), holes, g.GEOSPolys, g.GEOSHoles, len(g.Parts), coveredPolyArea(got), g.GEOSArea, g.GEOSHow)
			continue
		}
		if a := coveredPolyArea(got); math.Abs(a-g.GEOSArea) > kMergeAreaTol(got, kgMaxAbs(g.Parts)) {
			t.Errorf("%s k=%d gap %d: area %.12g, GEOS %.12g", g.Scene, g.K, g.ID, a, g.GEOSArea)
		}
		if bad := kMergeSamples(got, g.GEOSUnion); bad > 0 {
			t.Errorf("%s k=%d gap %d: %d sample points on different sides of the outline and GEOS's", g.Scene, g.K, g.ID, bad)
		}
	}
}

// kMergePinchRel is the distance, relative to the coordinates, within
// which two vertices of different rings of a union are the two sides of an
// opened pinch point (planar pulls them booleanPinchSep = 64 ulps apart).
const kMergePinchRel = 0x1p-40

// kMergeComponents returns the number of groups of the polygons of mp
// when two polygons closer than tol (a vertex of one within tol of an
// exterior edge of the other; the least distance between two disjoint
// polygons is attained at a vertex of one of them) are grouped.
func kMergeComponents(mp orb.MultiPolygon, tol float64) int {
	n := len(mp)
	uf := planar.NewUnionFind(n)
	near := func(a, b orb.Polygon) bool {
		if len(a) == 0 || len(b) == 0 {
			return false
		}
		ring := b[0]
		for _, p := range a[0] {
			for k := 0; k+1 < len(ring); k++ {
				if planar.PointSegmentDistance(p[0], p[1], ring[k][0], ring[k][1], ring[k+1][0], ring[k+1][1]) <= tol {
					return true
				}
			}
		}
		return false
	}
	groups := n
	for i := range mp {
		for j := i + 1; j < n; j++ {
			if uf.Find(int32(i)) != uf.Find(int32(j)) && (near(mp[i], mp[j]) || near(mp[j], mp[i])) {
				uf.Union(int32(i), int32(j))
				groups--
			}
		}
	}
	return groups
}

// kMergePinches counts the opened pinch points of mp: pairs of distinct
// vertices within kMergePinchRel of each other that are not neighbours on
// one ring (an opened point leaves its sides on different rings, or on one
// ring when a hole became a bay).
func kMergePinches(mp orb.MultiPolygon) int {
	type v struct {
		p         orb.Point
		ring, idx int
		n         int // vertices of the ring, closing one excluded
	}
	var vs []v
	ring := 0
	for _, pg := range mp {
		for _, r := range pg {
			m := len(r) - 1 // closed ring
			for i := 0; i < m; i++ {
				vs = append(vs, v{r[i], ring, i, m})
			}
			ring++
		}
	}
	n := 0
	for i := range vs {
		for j := i + 1; j < len(vs); j++ {
			a, b := vs[i], vs[j]
			eps := kMergePinchRel * math.Max(1, math.Max(math.Abs(a.p[0]), math.Abs(a.p[1])))
			if a.p == b.p || math.Abs(a.p[0]-b.p[0]) > eps || math.Abs(a.p[1]-b.p[1]) > eps {
				continue
			}
			if a.ring == b.ring && (b.idx-a.idx == 1 || a.idx == 0 && b.idx == a.n-1) {
				continue
			}
			n++
		}
	}
	return n
}

// kMergeSamples returns the number of points of a 40 × 40 grid over the
// bounding box of ref that lie inside one of a, ref and not the other,
// away from both outlines' edges.
func kMergeSamples(a, ref orb.MultiPolygon) int {
	b := ref.Bound()
	m := math.Max(math.Max(math.Abs(b.Min[0]), math.Abs(b.Max[0])), math.Max(math.Abs(b.Min[1]), math.Abs(b.Max[1])))
	near := func(mp orb.MultiPolygon, x, y float64) bool {
		for _, pg := range mp {
			for _, r := range pg {
				for i := 1; i < len(r); i++ {
					if planar.PointSegmentDistance(x, y, r[i-1][0], r[i-1][1], r[i][0], r[i][1]) <= kMergeRefEdge*m {
						return true
					}
				}
			}
		}
		return false
	}
	const n = 40
	bad := 0
	for i := 0; i < n; i++ {
		for j := 0; j < n; j++ {
			x := b.Min[0] + (float64(i)+0.37)/n*(b.Max[0]-b.Min[0])
			y := b.Min[1] + (float64(j)+0.61)/n*(b.Max[1]-b.Min[1])
			if near(a, x, y) || near(ref, x, y) {
				continue
			}
			if gapsOutlineContains(a, orb.Point{x, y}) != gapsOutlineContains(ref, orb.Point{x, y}) {
				bad++
			}
		}
	}
	return bad
}

// TestKGapMergeNearVertices: four parts of a k = 4 gap of the
// "duplicates" scene at r = 20, whose shared edges end at points one or two
// ulps apart. planar.Union on them as they are returns a ring with NaN
// vertices; snapped (KGapSnapBits) they merge into one polygon with the
// parts' area (the parts do not overlap: the area of the union is the sum).
func TestKGapMergeNearVertices(t *testing.T) {
	parts := orb.MultiPolygon{
		{{{46.237926882792756, 13.666420565500378}, {44.01911294364769, 14.333885158752004}, {46.17315575361574, 3.3190202757984357}, {46.17315575361574, 3.3190202757984357}, {46.237926882792756, 13.666420565500378}}},
		{{{44.01911294364769, 14.333885158752008}, {44.01911294364769, 14.333885158752004}, {46.23792688279276, 13.666420565500374}, {56.34107512875944, 28.388415220118528}, {57.8948101000794, 34.46934519299851}, {57.8948101000794, 34.469345192998546}, {53.539602925789225, 34.60311897660256}, {44.01911294364769, 14.333885158752008}}},
		{{{42.89586485718421, 11.942476928431024}, {44.0191129436477, 14.333885158752}, {44.0191129436477, 14.333885158752}, {31.350232896422263, 18.14494327340094}, {31.150002779539985, 17.840484686075857}, {42.89586485718421, 11.942476928431024}}},
		{{{42.89586485718421, 11.942476928431022}, {43.66009911187321, 2.8940816340286326}, {46.17315575361574, 3.319020275798437}, {46.17315575361574, 3.3190202757984566}, {44.0191129436477, 14.333885158752}, {44.0191129436477, 14.333885158752002}, {42.89586485718421, 11.942476928431022}}},
	}
	got, refused := kgMergeOutline(parts)
	if refused > 0 || len(got) != 1 || len(got[0]) != 1 {
		t.Fatalf("merged into %d polygons (want 1 without holes): %v", len(got), got)
	}
	// Reference: GEOS unary_union of these parts (shapely 1.8.5): one
	// polygon of area 142.48757360553788.
	if a := coveredPolyArea(got); math.Abs(a-142.48757360553788) > kMergeRefAreaRel*a {
		t.Errorf("area %.14g, GEOS 142.48757360553788", a)
	}
	for _, p := range got[0][0] {
		if math.IsNaN(p[0]+p[1]) || math.IsInf(p[0]+p[1], 0) {
			t.Fatalf("non-finite vertex %v", p)
		}
	}
}
