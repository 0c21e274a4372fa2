//go:build !linux

package main

// adviseHugePages: huge-page advice is Linux-only (hugepages_linux.go).
func adviseHugePages(sites int, limit int64) {}

// adviseHugePagesForFile: huge-page advice is Linux-only.
func adviseHugePagesForFile(path string) {}
