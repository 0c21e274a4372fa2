// The review command: load the inputs like analyze, start the local review
// page of package report/review (net/http, loopback only unless
// --allow-remote), print its URL and serve until Ctrl-C. The first Ctrl-C
// (or SIGTERM) is taken by the interrupt hook: the signal handler of
// main.go shuts the server down (open requests get reviewShutdownWait to
// finish) and the command returns, exit 0. A second Ctrl-C during the
// shutdown exits at once, 130, as for every other command.

package main

import (
	"context"
	"errors"
	"fmt"
	"net"
	"net/http"
	"sync"
	"time"

	"github.com/sitecover/sitecover/examplesites"
	"github.com/sitecover/sitecover/report"
	"github.com/sitecover/sitecover/report/review"
	"github.com/sitecover/sitecover/report/siteinput"
	"github.com/spf13/cobra"
)

// reviewShutdownWait is how long open requests may finish at shutdown.
const reviewShutdownWait = 3 * time.Second

// reviewFlags are the flags of the review command beyond runFlags.
type reviewFlags struct {
	listen      string
	allowRemote bool
	context     string
	demo        bool
}

func newReviewCmd(e *env) *cobra.Command {
	f := &runFlags{}
	rf := &reviewFlags{}
	cmd := &cobra.Command{
		Use:   "review --sites FILE [--area FILE] --range LENGTH [flags]",
		Short: "Live review page: move, add, remove, switch off devices and slide the range",
		Long: `review loads the inputs like analyze and serves a local page (no internet
needed) showing the plan: site area, exclusions, devices with their disks,
the gaps numbered with their deepest points, service areas on a toggle.
Drag a device, click to add one, remove or switch one off, slide the range:
the covered share, uncovered area, gaps, full-cover range and holes are
recomputed exactly on every change. Devices with their own ranges (a range
column, or a type column with --type-range or --range-table) are reviewed
with their power diagram: each device's disk at its own range, a range
control for the selected device and for each type, and the slider growing
every range together (uniform power growth). Setting one device's range on
a plan with one common range switches it to ranges per device (the others
keep the common range; undo switches back). Click a device for the area it
serves and what its failure would leave uncovered. The edited plan can be
saved as GeoJSON or CSV, and the full report (the files analyze writes)
written into --out.

The page listens on 127.0.0.1 on a free port by default; the URL is printed.
Ctrl-C stops it.`,
		Example: `  sitecover review --sites sensors.geojson --area campus.geojson --range 120m
  sitecover review --demo
  sitecover review --sites gw.csv --area site.geojson --range 2km --listen 127.0.0.1:8080 --out gw-review`,
		Args: noArgs,
		RunE: func(cmd *cobra.Command, args []string) error {
			in, r, err := reviewInputs(cmd, f, rf)
			if err != nil {
				return err
			}
			return asInput(runReview(e, f, rf, in, r))
		},
	}
	fs := cmd.Flags()
	f.addInputFlags(fs)
	f.addRangeFlag(fs, "", "planned range of every device to start from, e.g. 150m, 0.2km, 500ft (required unless the sites give their own: a range column, or a type column with --type-range)")
	fs.Var(newOnceString(&f.out, "sitecover-review"), "out", "folder the page's \"write the full report\" writes into (created when used)")
	fs.Var(newOnceString(&f.title, ""), "title", "title of the page and the report (default: the area's name, else the sites file name)")
	fs.BoolVar(&f.lifeSafety, "life-safety", false, "the devices are life-safety equipment (sirens, call points, defibrillators): cautions shown prominently")
	fs.Var(newOnceString(&rf.context, ""), "context", "drawing-only context layer: GeoJSON polygons or points (buildings, paths)")
	fs.Var(newOnceString(&rf.listen, "127.0.0.1:0"), "listen", "address to listen on (port 0: a free port)")
	fs.BoolVar(&rf.allowRemote, "allow-remote", false, "allow a --listen address beyond loopback (anyone who can reach it can edit the plan)")
	fs.BoolVar(&rf.demo, "demo", false, "review the built-in demo campus (invented data) instead of --sites/--area")
	return cmd
}

// reviewInputs opens the inputs named by the flags, or the demo's.
func reviewInputs(cmd *cobra.Command, f *runFlags, rf *reviewFlags) (siteinput.Inputs, float64, error) {
	if !rf.demo {
		in, err := f.rangesInputs(cmd)
		if err != nil {
			if !cmd.Flags().Changed("range") && in.TypeRanges == nil {
				// without --range the sites must give their own ranges,
				// and they could not be read
				return in, 0, usageErrorf("required flag --range is missing (and the sites' own ranges could not be read: %v)", err)
			}
			return in, 0, err
		}
		if rf.context != "" {
			in.Points, err = openSource(rf.context, "--context")
		}
		return in, in.Range, err
	}
	if f.sites != "" || f.area != "" || f.exclude != "" {
		return siteinput.Inputs{}, 0, usageErrorf("--demo reviews the built-in campus: drop --sites, --area and --exclude")
	}
	r, given, err := f.optionalRange(cmd)
	if err != nil {
		return siteinput.Inputs{}, 0, err
	}
	if !given {
		r = examplesites.PlannedRange
	}
	sites, area, _, title := examplesites.Campus()
	if f.title == "" {
		f.title = title
	}
	return siteinput.Inputs{
		Sites:  siteinput.Source{Name: examplesites.SitesFile + " (built in)", Data: sites},
		Area:   &siteinput.Source{Name: examplesites.AreaFile + " (built in)", Data: area},
		Points: &siteinput.Source{Name: examplesites.BuildingsFile + " (built in)", Data: examplesites.BuildingsGeoJSON()},
	}, r, nil
}

// reviewConfig builds the session configuration from the loaded scene.
func reviewConfig(sc *scene, f *runFlags, r float64) review.Config {
	if r == 0 {
		r = sc.rangeM // from a type table with one range for every type
	}
	cfg := review.Config{Sites: sc.sites, Names: sc.meta.SiteNames, Region: sc.region, Range: r, Meta: sc.meta, OutDir: f.out,
		Ranges: sc.ranges, Types: sc.types}
	if d := sc.demand; d != nil {
		for k, p := range d.Polys {
			if p != nil {
				cfg.Context = append(cfg.Context, p)
			} else {
				cfg.ContextPoints = append(cfg.ContextPoints, d.Pts[k])
			}
		}
	}
	return cfg
}

// runReview loads the scene, starts the server and serves until the
// server is stopped (Ctrl-C, through interruptHook).
func runReview(e *env, f *runFlags, rf *reviewFlags, in siteinput.Inputs, r float64) error {
	host, _, err := net.SplitHostPort(rf.listen)
	if err != nil {
		return usageErrorf("--listen %q: %v (use host:port, e.g. 127.0.0.1:8080)", rf.listen, err)
	}
	loopback := isLoopbackHost(host)
	if !loopback && !rf.allowRemote {
		return usageErrorf("--listen %q is not a loopback address: anyone who reaches it could edit the plan and write reports; add --allow-remote to accept that", rf.listen)
	}
	sc, err := loadScene(in)
	if err != nil {
		return err
	}
	sc.setMeta("review", f)
	sc.meta.Arguments = e.args
	cfg := reviewConfig(sc, f, r)
	if err := report.CheckOutputFolder(f.out, nil, cfg.Meta); err != nil {
		return inputErrorf("%v", err)
	}
	cfg.AnyHost = !loopback
	sv, err := review.New(cfg)
	if err != nil {
		return inputErrorf("%s: %v", inputNames(in), err)
	}
	ln, err := net.Listen("tcp", rf.listen)
	if err != nil {
		return inputErrorf("--listen %s: %v", rf.listen, err)
	}
	hs := &http.Server{Handler: sv.Handler(), ReadHeaderTimeout: 10 * time.Second}
	printWarnings(e.stderr, cfg.Meta.Warnings)
	if !loopback {
		fmt.Fprintf(e.stderr, "sitecover: warning: the review page listens on %s, beyond this machine: anyone who can reach it can edit the plan and write reports into %s\n", ln.Addr(), f.out)
	}
	fmt.Fprintf(e.stdout, "Review page for %s (%d devices, range %s m): http://%s/\nPress Ctrl-C to stop.\n",
		cfg.Meta.Title, len(cfg.Sites), fmtNum(r, 2), urlHost(ln.Addr()))
	stopped := make(chan struct{})
	setInterruptHook(func() {
		go func() {
			ctx, cancel := context.WithTimeout(context.Background(), reviewShutdownWait)
			defer cancel()
			hs.Shutdown(ctx)
			close(stopped)
		}()
	})
	defer setInterruptHook(nil)
	if err := hs.Serve(ln); err != nil && !errors.Is(err, http.ErrServerClosed) {
		return inputErrorf("review server: %v", err)
	}
	<-stopped
	fmt.Fprintln(e.stderr, "sitecover: review stopped")
	return nil
}

// isLoopbackHost reports whether a --listen host is a loopback address or
// localhost ("" listens on every interface: not loopback).
func isLoopbackHost(host string) bool {
	if host == "localhost" {
		return true
	}
	ip := net.ParseIP(host)
	return ip != nil && ip.IsLoopback()
}

// urlHost is the host:port of a listening address for a URL; an
// unspecified address (every interface) is shown as 127.0.0.1.
func urlHost(a net.Addr) string {
	ta, ok := a.(*net.TCPAddr)
	if !ok {
		return a.String()
	}
	ip := ta.IP
	if ip.IsUnspecified() {
		ip = net.IPv4(127, 0, 0, 1)
	}
	return net.JoinHostPort(ip.String(), fmt.Sprint(ta.Port))
}

// interruptHook, when set, takes the next Ctrl-C or SIGTERM instead of the
// default exit; the review command stops its server there.
var interruptHook struct {
	sync.Mutex
	fn func()
}

// setInterruptHook sets (nil: clears) the interrupt hook.
func setInterruptHook(fn func()) {
	interruptHook.Lock()
	interruptHook.fn = fn
	interruptHook.Unlock()
}

// runInterruptHook runs the interrupt hook once and clears it; it reports
// whether there was one. The hook must not block.
func runInterruptHook() bool {
	interruptHook.Lock()
	fn := interruptHook.fn
	interruptHook.fn = nil
	interruptHook.Unlock()
	if fn != nil {
		fn()
	}
	return fn != nil
}
