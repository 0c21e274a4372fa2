//go:build !linux

package main

// injectFault does nothing outside Linux.
func injectFault() {}
