package main

// runSelector is not built yet; the file goes when the selector is built.
func runSelector(e *env, args []string) error {
	return usageError("the interactive selector is not built yet")
}
