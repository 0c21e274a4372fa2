// Package review serves a local review page for a layout of devices that
// each serve a radius: move, add and remove devices, switch them off,
// slide the range, and see the exact figures of package coverage change
// at once — covered share, uncovered area, gaps with their closing ranges
// and bordering devices, the full-cover range, the holes of the union of
// disks and the coverage curve.
//
// New starts a session from a loaded scene (local metres, see package
// siteinput); Server.Handler serves the page (embedded HTML, CSS and
// JavaScript; layered canvases and SVG, no outside library) and its JSON
// API. See server.go for the endpoints, session.go for what each edit
// recomputes, ranges.go for devices with their own ranges (power
// diagram; the slider grows every range by uniform power growth) and
// failures.go for the loss if one device with its own range fails.
//
// The figures are exact for the disk model; they are planning aids for a
// design review, not a guarantee that a real device reaches its range
// (report.Cautions, shown on the page).
package review
