//go:build !linux

package main

// walkRoot declines: the walk is written for Linux, and git's listings
// answer elsewhere.
func (s *treeScan) walkRoot(root string) error { return errTreeUnusual }
