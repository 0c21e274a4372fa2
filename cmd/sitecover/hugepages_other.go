//go:build !linux

package main

// adviseHugePages: huge-page advice is Linux-only (hugepages_linux.go).
func adviseHugePages(sites int, limit int64) {}

// adviseHugePagesForInput: huge-page advice is Linux-only.
func adviseHugePagesForInput(size int64, head []byte) {}
