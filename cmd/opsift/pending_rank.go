package main

// runRank is not built yet; the file goes when rank is built.
func runRank(e *env, args []string) error { return usageError("rank is not built yet") }
