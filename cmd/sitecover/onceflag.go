// Flags that take one value: giving one twice is a usage error, never a
// silent choice of the last value (e.g. --range 150m --range 40m).

package main

import "fmt"

// onceString is a string flag value that refuses a second Set.
type onceString struct {
	p   *string
	set bool
}

// newOnceString returns a onceString writing to p, with p set to def.
func newOnceString(p *string, def string) *onceString {
	*p = def
	return &onceString{p: p}
}

// Set stores v, or fails if the flag was already given.
func (o *onceString) Set(v string) error {
	if o.set {
		return fmt.Errorf("given twice (%q and %q): give it once", *o.p, v)
	}
	*o.p, o.set = v, true
	return nil
}

// String returns the current value.
func (o *onceString) String() string {
	if o.p == nil {
		return ""
	}
	return *o.p
}

// Type names the value kind in help texts.
func (o *onceString) Type() string { return "string" }
