package main

// runCheck is not built yet; the file goes when check is built.
func runCheck(e *env, args []string) error { return usageError("check is not built yet") }
