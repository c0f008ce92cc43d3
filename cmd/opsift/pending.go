package main

// Commands not built yet say so and exit 2. Each moves to its own file
// when it is built.

func runRank(e *env, args []string) error    { return usageError("rank is not built yet") }
func runDerive(e *env, args []string) error  { return usageError("derive is not built yet") }
func runCheck(e *env, args []string) error   { return usageError("check is not built yet") }
func runReplace(e *env, args []string) error { return usageError("replace is not built yet") }
func runPreview(e *env, args []string) error { return usageError("preview is not built yet") }
func runInit(e *env, args []string) error    { return usageError("init is not built yet") }
func runSelector(e *env, args []string) error {
	return usageError("the interactive selector is not built yet")
}
