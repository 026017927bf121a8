package rules

// ConcurrentFrom lets the tests run the analyzers concurrently on designs
// of any size.
var ConcurrentFrom = &concurrentFrom
