package main

// runReplace is not built yet; the file goes when replace is built.
func runReplace(e *env, args []string) error { return usageError("replace is not built yet") }
