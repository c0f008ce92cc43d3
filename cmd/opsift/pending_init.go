package main

// runInit is not built yet; the file goes when init is built.
func runInit(e *env, args []string) error { return usageError("init is not built yet") }
