package main

import (
	"flag"
	"fmt"
	"io"
	"slices"
	"sort"
	"strings"

	"github.com/opsift/opsift/filter/listing"
	"github.com/opsift/opsift/filter/schema"
)

const completionUsage = `Usage: opsift completion bash|zsh|fish

Prints a shell completion script for opsift. It completes commands, flags,
output formats and sort keys, stage names (of the design given with
--design, else the demo design), part ids (of the catalog given with
--catalog, else the default sources) and file names where a file goes.
The script asks opsift itself for the words (the hidden command
"opsift ` + candidatesCmd + `"), so it stays true to the installed version.

  bash:  source <(opsift completion bash)        (e.g. in ~/.bashrc)
  zsh:   source <(opsift completion zsh)         (after compinit, e.g. in ~/.zshrc)
  fish:  opsift completion fish | source         (or save it as
         ~/.config/fish/completions/opsift.fish)
`

// candidatesCmd is the hidden command the completion scripts call back:
// "opsift __candidates -- WORD…" prints the candidates for the last word.
const candidatesCmd = "__candidates"

// Directives a completion callback prints instead of words: the shell
// completes file or directory names itself.
const (
	completeFiles = "@files"
	completeDirs  = "@dirs"
)

// shells are the shells opsift writes completion scripts for.
var shells = []string{"bash", "zsh", "fish"}

// runCompletion prints the completion script of a shell.
func runCompletion(e *env, args []string) error {
	fset := newFlagSet(e, "completion", completionUsage)
	if helped, err := parseFlags(e, fset, args); helped || err != nil {
		return err
	}
	if fset.NArg() != 1 {
		return usageError("completion: want one of %s (see opsift completion --help)", strings.Join(shells, ", "))
	}
	script, ok := completionScripts[fset.Arg(0)]
	if !ok {
		return usageError("completion: unknown shell %q, want one of %s", fset.Arg(0), strings.Join(shells, ", "))
	}
	_, err := io.WriteString(e.stdout, strings.ReplaceAll(script, "CANDIDATES", candidatesCmd))
	return err
}

// runCandidates prints, one a line, the words that may complete the last
// of the command-line words after "--" (the words after "opsift"), or a
// directive (completeFiles, completeDirs). It never fails: a catalog or
// design that cannot be read gives no ids or stages.
func runCandidates(e *env, args []string) error {
	if len(args) > 0 && args[0] == "--" {
		args = args[1:]
	}
	for _, c := range candidates(e, args) {
		fmt.Fprintln(e.stdout, c)
	}
	return nil
}

// candidates is runCandidates' list for words (the last is the word being
// completed, maybe empty).
func candidates(e *env, words []string) []string {
	if len(words) == 0 {
		words = []string{""}
	}
	cur, prev := words[len(words)-1], words[:len(words)-1]
	cmd := ""
	if len(prev) > 0 && !strings.HasPrefix(prev[0], "-") {
		cmd = prev[0]
	}
	fset := commandFlags(e, cmd)
	if fset == nil {
		return nil // an unknown command
	}
	// bash splits "--format=js" into "--format", "=", "js" (and gives
	// "=" as the word right after the sign).
	if n := len(prev); n >= 1 && cur == "=" && strings.HasPrefix(prev[n-1], "-") {
		return valueCandidates(e, fset, strings.TrimLeft(prev[n-1], "-"), words, "", "")
	}
	if n := len(prev); n >= 2 && prev[n-1] == "=" {
		return valueCandidates(e, fset, strings.TrimLeft(prev[n-2], "-"), words, cur, "")
	}
	if name, val, ok := strings.Cut(cur, "="); ok && strings.HasPrefix(name, "-") {
		return valueCandidates(e, fset, strings.TrimLeft(name, "-"), words, val, name+"=")
	}
	if n := len(prev); n > 0 && strings.HasPrefix(prev[n-1], "-") && takesValue(fset, prev[n-1]) {
		return valueCandidates(e, fset, strings.TrimLeft(prev[n-1], "-"), words, cur, "")
	}
	if strings.HasPrefix(cur, "-") {
		var out []string
		fset.VisitAll(func(f *flag.Flag) { out = append(out, "--"+f.Name) })
		if cmd == "" {
			out = append(out, "--help", "--version")
		} else {
			out = append(out, "--help")
		}
		return startingWith(out, cur)
	}
	if len(prev) == 0 {
		var out []string
		for _, c := range commands() {
			out = append(out, c.name)
		}
		return startingWith(append(out, "help", "version"), cur)
	}
	switch cmd {
	case "replace", "preview", "compare":
		if cmd != "compare" && countPositional(fset, prev[1:]) > 0 {
			return nil
		}
		return startingWith(partIDs(e, words), cur)
	case "schema":
		return startingWith(schema.Names(), cur)
	case "completion":
		return startingWith(shells, cur)
	case "import":
		return []string{completeFiles}
	case "init":
		return []string{completeDirs}
	}
	return nil
}

// commandFlags is the flag set command defines ("" the selector), got by
// running it with --help into nowhere: the flags are those its parser
// knows, never a second list. Nil for an unknown command.
func commandFlags(e *env, command string) *flag.FlagSet {
	var fset *flag.FlagSet
	quiet := &env{stdin: strings.NewReader(""), stdout: io.Discard, stderr: io.Discard, getenv: e.getenv, now: e.now,
		flagSets: func(f *flag.FlagSet) {
			if fset == nil {
				fset = f
			}
		}}
	run := runSelector
	if command != "" {
		run = nil
		for _, c := range commands() {
			if c.name == command {
				run = c.run
			}
		}
		if run == nil {
			return nil
		}
	}
	_ = run(quiet, []string{"--help"})
	if fset == nil {
		fset = flag.NewFlagSet(command, flag.ContinueOnError)
	}
	return fset
}

// takesValue reports whether the flag written as arg takes a value (is
// not a boolean flag).
func takesValue(fset *flag.FlagSet, arg string) bool {
	f := fset.Lookup(strings.TrimLeft(arg, "-"))
	if f == nil {
		return false
	}
	if b, ok := f.Value.(interface{ IsBoolFlag() bool }); ok && b.IsBoolFlag() {
		return false
	}
	return true
}

// countPositional is how many of words are not flags or flag values.
func countPositional(fset *flag.FlagSet, words []string) int {
	n := 0
	for i := 0; i < len(words); i++ {
		w := words[i]
		switch {
		case w == "=":
			i++
		case strings.HasPrefix(w, "-"):
			if !strings.Contains(w, "=") && takesValue(fset, w) {
				i++
			}
		default:
			n++
		}
	}
	return n
}

// valueCandidates completes the value of flag name: formats and sort keys
// from the flag's own help text, stages of the design, columns of the
// listing, file names for paths. prefix is put before each candidate
// ("--format=" when the value is written in the same word).
func valueCandidates(e *env, fset *flag.FlagSet, name string, words []string, cur, prefix string) []string {
	f := fset.Lookup(name)
	if f == nil {
		return nil
	}
	var vals []string
	switch name {
	case "format", "sort":
		vals = usageChoices(f.Usage)
	case "stage":
		vals = stageNames(e, words)
	case "columns":
		for _, c := range listing.Columns() {
			vals = append(vals, c.Key)
		}
	case "catalog", "design", "o", "to", "map":
		if prefix != "" {
			return nil // the shell cannot complete a file inside "--flag="
		}
		return []string{completeFiles}
	default:
		return nil
	}
	out := startingWith(vals, cur)
	for i := range out {
		out[i] = prefix + out[i]
	}
	return out
}

// usageChoices reads the choices a flag's help names after its colon:
// "output format: table, csv, json or md" → table csv json md.
func usageChoices(usage string) []string {
	_, list, ok := strings.Cut(usage, ":")
	if !ok {
		return nil
	}
	if i := strings.IndexAny(list, ";("); i >= 0 {
		list = list[:i]
	}
	var out []string
	for _, w := range strings.FieldsFunc(list, func(r rune) bool { return r == ',' || r == ' ' }) {
		if w != "or" && w != "" {
			out = append(out, w)
		}
	}
	return out
}

// flagValues are the values given to flag name in words, in order.
func flagValues(words []string, name string) []string {
	var out []string
	for i, w := range words {
		switch {
		case w == "--"+name || w == "-"+name:
			if i+1 < len(words)-1 { // not the word being completed
				v := words[i+1]
				if v == "=" && i+2 < len(words)-1 {
					v = words[i+2]
				}
				out = append(out, v)
			}
		case strings.HasPrefix(w, "--"+name+"=") && i < len(words)-1:
			out = append(out, strings.TrimPrefix(w, "--"+name+"="))
		}
	}
	return out
}

// stageNames are the stages of the design given with --design (the last
// one), else of the demo design.
func stageNames(e *env, words []string) []string {
	path := ""
	if ds := flagValues(words, "design"); len(ds) > 0 {
		path = ds[len(ds)-1]
	}
	d, _, err := readDesign(path)
	if err != nil {
		return nil
	}
	var out []string
	for _, s := range d.Stages {
		out = append(out, s.Name)
	}
	return out
}

// partIDs are the ids of the catalog given with --catalog, else of the
// default sources, through the parsed-catalog cache; parts set aside are
// left out.
func partIDs(e *env, words []string) []string {
	layers := catalogLayers(e, flagValues(words, "catalog"))
	c, _ := e.loader().Load(layers...)
	if c == nil {
		return nil
	}
	out := make([]string, 0, len(c.Parts))
	for _, p := range c.Parts {
		out = append(out, p.ID)
	}
	sort.Strings(out)
	return slices.Compact(out)
}

// startingWith keeps the words that start with prefix.
func startingWith(words []string, prefix string) []string {
	var out []string
	for _, w := range words {
		if strings.HasPrefix(w, prefix) {
			out = append(out, w)
		}
	}
	return out
}

// completionScripts are the scripts by shell; CANDIDATES stands for the
// callback command's name. Each passes the words after "opsift" up to the
// cursor, and completes file names itself when told to.
var completionScripts = map[string]string{
	"bash": `# bash completion for opsift (opsift completion bash)
_opsift() {
	local cur=${COMP_WORDS[COMP_CWORD]}
	local IFS=$'\n'
	local -a out
	out=($(opsift CANDIDATES -- "${COMP_WORDS[@]:1:COMP_CWORD}" 2>/dev/null))
	case "${out[0]}" in
	@files)
		compopt -o filenames 2>/dev/null
		COMPREPLY=($(compgen -f -- "$cur"))
		;;
	@dirs)
		compopt -o filenames 2>/dev/null
		COMPREPLY=($(compgen -d -- "$cur"))
		;;
	*)
		COMPREPLY=("${out[@]}")
		;;
	esac
}
complete -F _opsift opsift
`,
	"zsh": `#compdef opsift
# zsh completion for opsift (opsift completion zsh)
_opsift() {
	local -a out
	out=("${(@f)$(opsift CANDIDATES -- "${(@)words[2,CURRENT]}" 2>/dev/null)}")
	case "$out[1]" in
	@files) _files ;;
	@dirs) _files -/ ;;
	*) (( ${#out} )) && [[ -n "$out[1]" ]] && compadd -- "${out[@]}" ;;
	esac
}
if [[ "$funcstack[1]" = "_opsift" ]]; then
	_opsift "$@"
else
	compdef _opsift opsift
fi
`,
	"fish": `# fish completion for opsift (opsift completion fish)
function __opsift_complete
	set -l words (commandline -opc)
	set -e words[1]
	set -l cur (commandline -ct)
	set -l out (opsift CANDIDATES -- $words "$cur" 2>/dev/null)
	switch "$out[1]"
		case @files
			__fish_complete_path "$cur"
		case @dirs
			__fish_complete_directories "$cur"
		case '*'
			printf '%s\n' $out
	end
end
complete -c opsift -f -a '(__opsift_complete)'
`,
}
