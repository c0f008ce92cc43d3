package main

// runDerive is not built yet; the file goes when derive is built.
func runDerive(e *env, args []string) error { return usageError("derive is not built yet") }
