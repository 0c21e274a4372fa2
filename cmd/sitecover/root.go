// The command tree and the shared run harness.
//
// run builds a fresh cobra tree for each call, so tests can run the command
// in-process with their own arguments and output buffers. Cobra's own error
// and usage printing is silenced: every failure becomes one line on stderr
// and an exit code (see errors.go). A panic anywhere in the command's
// goroutine is recovered into an "internal error" line and exit code 3.

package main

import (
	"fmt"
	"io"
	"os"
	"runtime"
	"runtime/debug"
	"strings"

	"github.com/sitecover/sitecover/report"
	"github.com/sitecover/sitecover/report/siteinput"
	"github.com/spf13/cobra"
	"github.com/spf13/pflag"
)

// version is the program version, set at build time with
//
//	go build -ldflags "-X main.version=1.2.3" ./cmd/sitecover
var version = "dev"

// versionString is the text printed by --version.
func versionString() string {
	v := version
	var extra []string
	if bi, ok := debug.ReadBuildInfo(); ok {
		if mv := bi.Main.Version; mv != "" && mv != "(devel)" && v == "dev" {
			v = mv
		}
		for _, s := range bi.Settings {
			switch s.Key {
			case "vcs.revision":
				r := s.Value
				if len(r) > 12 {
					r = r[:12]
				}
				extra = append(extra, "commit "+r)
			case "vcs.modified":
				if s.Value == "true" {
					extra = append(extra, "modified")
				}
			}
		}
	}
	extra = append(extra, runtime.Version(), runtime.GOOS+"/"+runtime.GOARCH)
	return fmt.Sprintf("sitecover %s (%s)", v, strings.Join(extra, ", "))
}

// env is what a run writes to.
type env struct {
	stdout, stderr io.Writer
	// terminal is true when stderr is a terminal (progress lines allowed).
	terminal bool
	args     []string // the command line, for the report's manifest
}

// run executes the command line args and returns the exit code.
func run(args []string, stdout, stderr io.Writer) (code int) {
	e := &env{stdout: stdout, stderr: stderr, terminal: isTerminal(stderr) || os.Getenv(supervisedTerminalEnv) != "", args: args}
	defer func() {
		if p := recover(); p != nil {
			fmt.Fprintf(stderr, "sitecover: internal error: %v (this is a bug; please report it with the command line)\n", p)
			if os.Getenv("SITECOVER_DEBUG") != "" {
				fmt.Fprintf(stderr, "%s", debug.Stack())
			}
			code = exitInternal
		}
	}()
	root := newRootCmd(e)
	root.SetArgs(args)
	root.SetOut(stdout)
	root.SetErr(stderr)
	err := root.Execute()
	if err != nil && report.Interrupted() {
		// Ctrl-C removed the files being written: the signal handler
		// (main.go) prints the one line and exits; wait for it.
		select {}
	}
	if err != nil {
		fmt.Fprintln(stderr, errorLine(err))
	}
	return exitCode(err)
}

// isTerminal reports whether w is a character device (a terminal).
func isTerminal(w io.Writer) bool {
	f, ok := w.(*os.File)
	if !ok {
		return false
	}
	fi, err := f.Stat()
	return err == nil && fi.Mode()&os.ModeCharDevice != 0
}

const rootLong = `sitecover answers the planner's questions about devices that each serve a
radius - wireless gateways, sensors, sirens, alarm call points, defibrillator
cabinets - across a site: is every point of the site area within range of a
device, where are the gaps and how large are they, which range closes each
gap and all of them, and which device serves which part of the site; and
it plans: where to add devices, which devices are critical, and which
device serves each building.

The answers are exact geometry (Voronoi cells clipped to the area, exact
polygon-disk areas, the alpha filtration of the disks), not a raster.

Inputs: sites as GeoJSON points or CSV (lat/lon, or x/y with --planar), the
site area as GeoJSON polygons; zones that need no coverage are polygon holes,
features with "exclude": true, or a separate --exclude file.

Cautions:
`

func newRootCmd(e *env) *cobra.Command {
	root := &cobra.Command{
		Use:   "sitecover",
		Short: "Coverage and service areas of fixed devices that serve a radius",
		Long:  rootLong + report.Cautions(),
		Example: `  sitecover demo --out campus-report
  sitecover analyze --sites sensors.csv --area site.geojson --range 150m
  sitecover gaps --sites gateways.geojson --area site.geojson --range 0.2km
  sitecover cells --sites sirens.csv --area town.geojson
  sitecover analyze --planar --sites plan-xy.csv --area plan.geojson --range 30m
  sitecover suggest --sites sensors.csv --area site.geojson --add 3 --range 150m
  sitecover failures --sites sensors.csv --area site.geojson --range 150m
  sitecover assign --sites sensors.csv --area site.geojson --points buildings.geojson --range 150m`,
		Version:       versionString(),
		SilenceErrors: true,
		SilenceUsage:  true,
	}
	root.SetVersionTemplate("{{.Version}}\n")
	root.SetFlagErrorFunc(flagError)
	root.CompletionOptions.HiddenDefaultCmd = false
	root.AddCommand(newAnalyzeCmd(e), newCellsCmd(e), newGapsCmd(e), newDemoCmd(e),
		newSuggestCmd(e), newFailuresCmd(e), newAssignCmd(e), newReviewCmd(e))
	for _, c := range root.Commands() {
		c.SilenceErrors, c.SilenceUsage = true, true
		c.SetFlagErrorFunc(flagError)
	}
	return root
}

// flagError marks flag parsing errors as bad usage with a pointer to help.
func flagError(cmd *cobra.Command, err error) error {
	return usageErrorf("%v (see '%s --help')", err, cmd.CommandPath())
}

// noArgs refuses positional arguments as bad usage.
func noArgs(cmd *cobra.Command, args []string) error {
	if len(args) > 0 {
		return usageErrorf("unexpected argument %q: inputs are given with flags such as --sites FILE (see '%s --help')", args[0], cmd.CommandPath())
	}
	return nil
}

// runFlags are the flags shared by the commands.
type runFlags struct {
	sites, area, exclude string
	context              string
	planar               bool
	crs                  string
	outCRS               string
	rangeText            string
	// typeRange and rangeTable give ranges per device type (ranges.go).
	typeRange  []string
	rangeTable string
	out        string
	json       bool
	noMaps     bool
	gpkg       bool
	title      string
	lifeSafety bool
	mapWidth   int
	reach      string // analyze --reach: k values, comma-separated
}

// addContextFlag registers --context (analyze, gaps, cells).
func (f *runFlags) addContextFlag(fs *pflag.FlagSet) {
	fs.Var(newOnceString(&f.context, ""), "context", "drawing-only context layer for the maps: GeoJSON points or polygons (buildings, paths), never analysed")
}

// addInputFlags registers the input flags.
func (f *runFlags) addInputFlags(fs *pflag.FlagSet) {
	fs.Var(newOnceString(&f.sites, ""), "sites", "device sites: GeoJSON Point/MultiPoint features, or CSV with lat/lon (x/y with --planar) columns (required)")
	fs.Var(newOnceString(&f.area, ""), "area", "site area: GeoJSON Polygon/MultiPolygon features; holes and features with \"exclude\": true need no coverage (default: the sites' convex hull)")
	fs.Var(newOnceString(&f.exclude, ""), "exclude", "extra zones that need no coverage: GeoJSON polygons cut out of --area")
	fs.BoolVar(&f.planar, "planar", false, "coordinates are already local metres (x east, y north), e.g. a site plan or CAD export")
	f.addTypeRangeFlags(fs)
	fs.Var(newOnceString(&f.crs, ""), "crs", "coordinate reference system of CSV x/y (Easting/Northing) columns and of GeoJSON without a \"crs\" member, e.g. EPSG:32632 (UTM zones of WGS 84 and ETRS89, SWEREF99 TM, ETRS-TM35FIN, NZTM2000, Poland CS92, Portugal TM06; EPSG:4326 reads x/y as longitude/latitude); outputs stay WGS84")
}

// addOutCRSFlag registers --out-crs (analyze, gaps, cells and the planning
// commands suggest, failures, assign).
func (f *runFlags) addOutCRSFlag(fs *pflag.FlagSet) {
	fs.Var(newOnceString(&f.outCRS, ""), "out-crs", "also write each layer in a projected system, as LAYER-epsgNNNN.geojson with a \"crs\" member: \"input\" for the inputs' own (from --crs or a file's \"crs\" member) or an EPSG code of --crs's list")
}

// addOutputFlags registers the output flags.
func (f *runFlags) addOutputFlags(fs *pflag.FlagSet, maps bool) {
	fs.Var(newOnceString(&f.out, "sitecover-report"), "out", "output folder for one report: created if needed, must be new, empty or an earlier report; the whole set is replaced at the end (input files are never overwritten)")
	fs.BoolVar(&f.json, "json", false, "print a copy of the summary.json written to --out on stdout, instead of the text summary (warnings still go to stderr; the files are written either way)")
	fs.BoolVar(&f.gpkg, "gpkg", false, "also write sitecover.gpkg: every layer in one GeoPackage (read by desktop GIS; roughly doubles the time spent writing layers)")
	if maps {
		fs.BoolVar(&f.noMaps, "no-maps", false, "skip the PNG maps and charts (faster on very large inputs)")
		fs.IntVar(&f.mapWidth, "map-width", report.DefaultMapWidth, "width of the PNG maps and charts in pixels")
	}
	fs.Var(newOnceString(&f.title, ""), "title", "title of the report and maps (default: the area's name, else the sites file name)")
	fs.BoolVar(&f.lifeSafety, "life-safety", false, "the devices are life-safety equipment (sirens, call points, defibrillators): put the cautions first")
}

// addRangeFlag registers --range.
func (f *runFlags) addRangeFlag(fs *pflag.FlagSet, def, usage string) {
	fs.Var(newOnceString(&f.rangeText, def), "range", usage)
}

// requireFlags returns a usage error naming the first missing flag.
func requireFlags(cmd *cobra.Command, names ...string) error {
	for _, n := range names {
		fl := cmd.Flags().Lookup(n)
		if fl == nil || !fl.Changed || strings.TrimSpace(fl.Value.String()) == "" {
			return usageErrorf("required flag --%s is missing (see '%s --help')", n, cmd.CommandPath())
		}
	}
	return nil
}

// inputs opens the input files named by the flags.
func (f *runFlags) inputs() (siteinput.Inputs, error) {
	if f.exclude != "" && f.area == "" {
		return siteinput.Inputs{}, usageErrorf("--exclude needs --area: exclusion zones are cut out of a given area")
	}
	var in siteinput.Inputs
	var err error
	if f.planar && f.crs != "" {
		return in, usageErrorf("--crs names a coordinate reference system, --planar says local metres: give one of them")
	}
	in.Planar = f.planar
	in.CRS = f.crs
	if f.outCRS != "" {
		if f.planar {
			return in, usageErrorf("--out-crs names an output coordinate reference system, --planar says local metres: give one of them")
		}
		if !strings.EqualFold(strings.TrimSpace(f.outCRS), "input") {
			if _, err := siteinput.ParseCRS(f.outCRS); err != nil {
				return in, usageErrorf("--out-crs: %v", err)
			}
		}
		in.OutCRS = f.outCRS
	}
	if in.CRS != "" {
		if _, err := siteinput.ParseCRS(in.CRS); err != nil {
			return in, usageErrorf("--crs: %v", err)
		}
	}
	if in.Sites, err = readSource(f.sites, "--sites"); err != nil {
		return in, err
	}
	if in.TypeRanges, err = f.typeRanges(); err != nil {
		return in, err
	}
	if f.area != "" {
		if in.Area, err = openSource(f.area, "--area"); err != nil {
			return in, err
		}
	}
	if f.exclude != "" {
		if in.Exclude, err = openSource(f.exclude, "--exclude"); err != nil {
			return in, err
		}
	}
	if f.context != "" {
		if in.Context, err = openSource(f.context, "--context"); err != nil {
			return in, err
		}
	}
	return in, nil
}
