package main

// runPreview is not built yet; the file goes when preview is built.
func runPreview(e *env, args []string) error { return usageError("preview is not built yet") }
