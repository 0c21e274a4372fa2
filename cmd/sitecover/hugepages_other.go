//go:build !linux

package main

// adviseHugePages: huge-page advice is Linux-only (hugepages_linux.go).
func adviseHugePages(sites int, limit int64) {}
