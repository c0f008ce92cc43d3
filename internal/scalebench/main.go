// Command scalebench measures opsift on large generated catalogs and prints
// each scale target with its measured figure and ratio. It is run by hand
// through .ci/bench, never by CI's test step: the figures depend on the
// machine and on what else runs on it.
//
//	go run ./internal/scalebench [-sizes 10000,100000] [-dir DIR] [-cpuprofile F] [-memprofile F]
//	go run ./internal/scalebench -generate -sizes 100000 -dir DIR   # catalogs only
//
// Catalogs are generated (internal/gencat) into a temporary directory that
// is removed afterwards, unless -dir names one to keep.
package main

import (
	"context"
	"flag"
	"fmt"
	"io"
	"io/fs"
	"os"
	"path/filepath"
	"runtime"
	"runtime/pprof"
	"slices"
	"strconv"
	"strings"
	"sync"
	"syscall"
	"time"

	"github.com/BurntSushi/toml"
	tea "github.com/charmbracelet/bubbletea"
	"github.com/charmbracelet/lipgloss"

	"github.com/opsift/opsift/catalog"
	"github.com/opsift/opsift/data"
	"github.com/opsift/opsift/filter"
	"github.com/opsift/opsift/internal/gencat"
	"github.com/opsift/opsift/tui"
)

func main() {
	sizes := flag.String("sizes", "10000,100000", "catalog sizes to measure, comma-separated")
	dir := flag.String("dir", "", "directory to generate the catalogs in and keep (default: a temporary one, removed)")
	cpu := flag.String("cpuprofile", "", "write a CPU profile of the whole run to `file`")
	mem := flag.String("memprofile", "", "write a heap profile at the end to `file`")
	genOnly := flag.Bool("generate", false, "only generate the catalogs into -dir (for trying the program by hand)")
	flag.Parse()
	if *genOnly && *dir == "" {
		fmt.Fprintln(os.Stderr, "scalebench: -generate needs -dir")
		os.Exit(2)
	}
	if err := run(*sizes, *dir, *cpu, *mem, *genOnly); err != nil {
		fmt.Fprintln(os.Stderr, "scalebench:", err)
		os.Exit(1)
	}
}

// report prints one target line: what, the measured figure, the limit
// and whether it holds.
type report struct{ failed int }

func (r *report) line(what, measured string, ratio, limit float64) {
	ok := "meets"
	if ratio > limit {
		ok = "MISSES"
		r.failed++
	}
	fmt.Printf("%-58s %-28s %8.3f  ≤ %-6g %s\n", what, measured, ratio, limit, ok)
}

func run(sizeList, keep, cpuFile, memFile string, genOnly bool) error {
	var sizes []int
	for _, s := range strings.Split(sizeList, ",") {
		n, err := strconv.Atoi(strings.TrimSpace(s))
		if err != nil || n <= 0 {
			return fmt.Errorf("bad size %q", s)
		}
		sizes = append(sizes, n)
	}
	root := keep
	if root == "" {
		var err error
		if root, err = os.MkdirTemp("", "opsift-scale-"); err != nil {
			return err
		}
		defer os.RemoveAll(root)
	}
	if cpuFile != "" {
		f, err := os.Create(cpuFile)
		if err != nil {
			return err
		}
		defer f.Close()
		if err := pprof.StartCPUProfile(f); err != nil {
			return err
		}
		defer pprof.StopCPUProfile()
	}
	fmt.Printf("opsift scale benchmark: %s/%s, %d CPUs (GOMAXPROCS %d), %s\n",
		runtime.GOOS, runtime.GOARCH, runtime.NumCPU(), runtime.GOMAXPROCS(0), runtime.Version())
	fmt.Printf("%-58s %-28s %8s  %-8s\n", "target", "measured", "ratio", "limit")
	r := &report{}
	for _, n := range sizes {
		dir := filepath.Join(root, fmt.Sprintf("cat-%d", n))
		if err := os.MkdirAll(dir, 0o755); err != nil {
			return err
		}
		files, err := gencat.Write(dir, n, gencat.PerFile, 1)
		if err != nil {
			return err
		}
		if genOnly {
			fmt.Printf("%s: %d parts in %d files\n", dir, n, len(files))
			continue
		}
		if err := measure(r, n, dir, files); err != nil {
			return err
		}
	}
	if memFile != "" {
		f, err := os.Create(memFile)
		if err != nil {
			return err
		}
		defer f.Close()
		runtime.GC()
		if err := pprof.WriteHeapProfile(f); err != nil {
			return err
		}
	}
	if r.failed > 0 {
		fmt.Printf("%d targets missed\n", r.failed)
	}
	return nil
}

// label renders a catalog size as 10k, 100k, 1M.
func label(n int) string {
	switch {
	case n >= 1_000_000 && n%1_000_000 == 0:
		return fmt.Sprintf("%dM", n/1_000_000)
	case n >= 1000 && n%1000 == 0:
		return fmt.Sprintf("%dk", n/1000)
	}
	return strconv.Itoa(n)
}

// best runs f reps times and returns its fastest run.
func best(reps int, f func() error) (time.Duration, error) {
	d := time.Duration(1<<63 - 1)
	for range reps {
		start := time.Now()
		if err := f(); err != nil {
			return 0, err
		}
		d = min(d, time.Since(start))
	}
	return d, nil
}

func measure(r *report, n int, dir string, files []string) error {
	reps := 3
	if n >= 100_000 {
		reps = 2
	}
	l := label(n)
	bare, cold, bareCPU, coldCPU, c, err := coldAndBare(reps+1, dir, files, n)
	if err != nil {
		return err
	}
	r.line("cold load "+l+" / bare parallel decode", fmt.Sprintf("%s / %s", secs(cold), secs(bare)),
		cold.Seconds()/bare.Seconds(), 1.2)
	fmt.Printf("  %-56s %s / %s = %.3f (no target)\n", "CPU time of the same, median run, GC included", secs(coldCPU), secs(bareCPU),
		coldCPU.Seconds()/bareCPU.Seconds())

	cache := &catalog.Cache{Dir: filepath.Join(dir, "..", fmt.Sprintf("cache-%d", n))}
	if _, err := (catalog.Loader{Cache: cache}).Load(catalog.PathLayer(dir)); err != nil {
		return err // builds the cache
	}
	warm, _, err := timedLoad(catalog.Loader{Cache: cache}, reps+2, dir, n)
	if err != nil {
		return err
	}
	r.line("warm (cached) load "+l+" / cold load", fmt.Sprintf("%s / %s", secs(warm), secs(cold)),
		warm.Seconds()/cold.Seconds(), 0.1)

	heap := liveHeap(func() any {
		c, _ := catalog.Load(catalog.PathLayer(dir))
		return c
	})
	r.line("live heap per part "+l, fmt.Sprintf("%.0f B", heap/float64(n)), heap/float64(n)/1536, 1)

	key, keyCPU, err := keystroke(c.Parts, false)
	if err != nil {
		return err
	}
	limit := 16 * time.Millisecond
	if n <= 10_000 {
		limit = 3 * time.Millisecond
	}
	r.line("one keystroke "+l+" (derive, evaluate, rank passing)", fmt.Sprintf("%s / %s", ms(key), ms(limit)),
		key.Seconds()/limit.Seconds(), 1)
	fmt.Printf("%-58s %s (all cores; on idle cores the wall time is about this / CPUs)\n",
		"  CPU time per keystroke "+l, ms(keyCPU))
	keyAll, _, err := keystroke(c.Parts, true)
	if err != nil {
		return err
	}
	fmt.Printf("%-58s %s (no target: failing parts are ranked after the frame unless shown)\n",
		"  keystroke "+l+" ranking every part", ms(keyAll))

	first, err := firstFrame(func() (*catalog.Catalog, error) { return catalog.Load(catalog.PathLayer(dir)) })
	if err != nil {
		return err
	}
	r.line("selector first frame "+l+" (New + View)", fmt.Sprintf("%s / 300 ms", ms(first)), first.Seconds()/0.3, 1)

	if n >= 100_000 {
		small, err := viewTime(c.Parts[:1000])
		if err != nil {
			return err
		}
		big, err := viewTime(c.Parts)
		if err != nil {
			return err
		}
		r.line("View "+l+" / View 1k", fmt.Sprintf("%s / %s", ms(big), ms(small)), big.Seconds()/small.Seconds(), 1.5)
		for _, gap := range []time.Duration{2 * time.Millisecond, 120 * time.Millisecond} {
			b, err := burst(c.Parts, 8, gap)
			if err != nil {
				return err
			}
			r.line(fmt.Sprintf("burst of 8 keys %s, %d ms apart: last key → frame", l, gap.Milliseconds()),
				fmt.Sprintf("%s / 50 ms", ms(b)), b.Seconds()/0.05, 1)
		}
	}
	return nil
}

// demoDesign decodes the embedded default design.
func demoDesign() (*filter.Design, error) {
	raw, err := fs.ReadFile(data.Designs, data.DefaultDesign)
	if err != nil {
		return nil, err
	}
	return filter.DecodeDesign(data.DefaultDesign, raw)
}

// firstFrame measures the selector's start to its first frame when the
// catalog is read after it (Config.LoadFirst): building the model and
// drawing once. Terminal output is not included.
func firstFrame(load func() (*catalog.Catalog, error)) (time.Duration, error) {
	d, err := demoDesign()
	if err != nil {
		return 0, err
	}
	start := time.Now()
	m := tui.New(tui.Config{Design: d, LoadFirst: true, Load: load, Renderer: lipgloss.NewRenderer(io.Discard)})
	m.Update(tea.WindowSizeMsg{Width: 120, Height: 40})
	_ = m.View()
	return time.Since(start), nil
}

// settle runs a command and every command its messages lead to,
// skipping ticks (none are started without LoadFirst or a watcher).
func settle(m tea.Model, cmd tea.Cmd) {
	if cmd == nil {
		return
	}
	switch msg := cmd().(type) {
	case nil:
	case tea.BatchMsg:
		for _, c := range msg {
			settle(m, c)
		}
	default:
		_, next := m.Update(msg)
		settle(m, next)
	}
}

// viewTime is the median time of drawing the selector over parts, once
// the ranking is in, moving the cursor between frames.
func viewTime(parts []*catalog.Part) (time.Duration, error) {
	d, err := demoDesign()
	if err != nil {
		return 0, err
	}
	m := tui.New(tui.Config{Design: d, Catalog: &catalog.Catalog{Parts: parts, Sources: []string{"generated"}},
		Renderer: lipgloss.NewRenderer(io.Discard)})
	m.Update(tea.WindowSizeMsg{Width: 120, Height: 40})
	settle(m, m.Init())
	m.Update(tea.KeyMsg{Type: tea.KeyTab})
	keys := []tea.KeyMsg{{Type: tea.KeyDown}, {Type: tea.KeyUp}}
	var runs []time.Duration
	for i := range 41 {
		m.Update(keys[i%2])
		start := time.Now()
		_ = m.View()
		runs = append(runs, time.Since(start))
	}
	slices.Sort(runs)
	return runs[len(runs)/2], nil
}

// burst sends keys edits in quick succession, gap apart, as a typing
// burst does, and runs for each the selector's two ranking steps: the
// passing parts, then every part; each edit cancels the steps of the one
// before, as the selector's ranking jobs do. It returns the time from the
// last edit to its passing parts ranked: the final frame while failing
// parts are hidden.
func burst(parts []*catalog.Part, keys int, gap time.Duration) (time.Duration, error) {
	d, err := demoDesign()
	if err != nil {
		return 0, err
	}
	in := filter.NewIncremental(parts, filter.Options{})
	p, err := filter.Derive(d)
	if err != nil {
		return 0, err
	}
	if _, err := in.Evaluate(context.Background(), p); err != nil {
		return 0, err
	}
	var runs []time.Duration
	for round := range 5 {
		var wg sync.WaitGroup
		cancel := func() {}
		var lastDone time.Duration
		for k := range keys {
			cancel()
			if err := d.Set("stage.gain.signal.freq", fmt.Sprintf("%d kHz", 20+round*keys+k)); err != nil {
				return 0, err
			}
			p, err := filter.Derive(d)
			if err != nil {
				return 0, err
			}
			var ctx context.Context
			ctx, cancel = context.WithCancel(context.Background())
			isLast := k == keys-1
			start := time.Now()
			wg.Go(func() {
				rk, err := in.Rank(ctx, p, filter.SortMargin)
				if err != nil {
					return // cancelled by the next key
				}
				if isLast {
					lastDone = time.Since(start)
				}
				rk.All(ctx) // the second step, until the next key cancels it
			})
			time.Sleep(gap)
		}
		wg.Wait()
		cancel()
		runs = append(runs, lastDone)
	}
	slices.Sort(runs)
	return runs[len(runs)/2], nil
}

// coldAndBare times the bare decode of files and a cold load of dir (no
// cache) in turns, reps times each, so a change in the machine's load
// between them touches both alike. It returns the fastest of each, their
// median CPU times (each with a collection after it, so the garbage each
// leaves is paid for by its own figure) and the last catalog, which must
// hold n parts.
func coldAndBare(reps int, dir string, files []string, n int) (bare, cold, bareCPU, coldCPU time.Duration, c *catalog.Catalog, err error) {
	bare, cold = time.Duration(1<<63-1), time.Duration(1<<63-1)
	var bareCPUs, coldCPUs []time.Duration
	for range reps {
		runtime.GC()
		start, cpu0 := time.Now(), cpuTime()
		if err = bareDecode(files); err != nil {
			return
		}
		bare = min(bare, time.Since(start))
		runtime.GC()
		bareCPUs = append(bareCPUs, cpuTime()-cpu0)

		c = nil
		runtime.GC()
		start, cpu0 = time.Now(), cpuTime()
		if c, err = (catalog.Loader{}).Load(catalog.PathLayer(dir)); err != nil {
			return
		}
		cold = min(cold, time.Since(start))
		runtime.GC()
		coldCPUs = append(coldCPUs, cpuTime()-cpu0)
	}
	if len(c.Parts) != n {
		err = fmt.Errorf("%d parts loaded, want %d", len(c.Parts), n)
	}
	slices.Sort(bareCPUs)
	slices.Sort(coldCPUs)
	return bare, cold, bareCPUs[len(bareCPUs)/2], coldCPUs[len(coldCPUs)/2], c, err
}

// timedLoad loads dir with ld reps times, each after a collection, and
// returns the fastest time and the catalog, which must hold n parts.
func timedLoad(ld catalog.Loader, reps int, dir string, n int) (time.Duration, *catalog.Catalog, error) {
	var c *catalog.Catalog
	d, err := best(reps, func() error {
		c = nil
		runtime.GC()
		var err error
		c, err = ld.Load(catalog.PathLayer(dir))
		return err
	})
	if err == nil && len(c.Parts) != n {
		err = fmt.Errorf("%d parts loaded, want %d", len(c.Parts), n)
	}
	return d, c, err
}

// bareDecode decodes every file into maps with the project's TOML decoder,
// files in parallel over the CPUs: the floor a catalog load is held to.
func bareDecode(files []string) error {
	var wg sync.WaitGroup
	errs := make([]error, len(files))
	sem := make(chan struct{}, runtime.GOMAXPROCS(0))
	for i, f := range files {
		wg.Go(func() {
			sem <- struct{}{}
			defer func() { <-sem }()
			b, err := os.ReadFile(f)
			if err != nil {
				errs[i] = err
				return
			}
			var doc map[string]any
			_, errs[i] = toml.Decode(string(b), &doc)
		})
	}
	wg.Wait()
	for _, err := range errs {
		if err != nil {
			return err
		}
	}
	return nil
}

// liveHeap returns the bytes of heap still in use, after a collection,
// by what load returns.
func liveHeap(load func() any) float64 {
	var before, after runtime.MemStats
	runtime.GC()
	runtime.ReadMemStats(&before)
	v := load()
	runtime.GC()
	runtime.ReadMemStats(&after)
	runtime.KeepAlive(v)
	return float64(after.HeapAlloc) - float64(before.HeapAlloc)
}

// keystroke measures the work of one edit of a stage field on the
// incremental path the selector uses: re-derive the plan, evaluate what
// the edit changed, rank the passing parts (all of them when all is true,
// as with failing parts shown), and explain the rows a screen shows. It
// returns the median of the runs.
func keystroke(parts []*catalog.Part, all bool) (wall, cpu time.Duration, err error) {
	raw, err := fs.ReadFile(data.Designs, data.DefaultDesign)
	if err != nil {
		return 0, 0, err
	}
	d, err := filter.DecodeDesign(data.DefaultDesign, raw)
	if err != nil {
		return 0, 0, err
	}
	freqs := []string{"20 kHz", "21 kHz"}
	var runs []time.Duration
	o := filter.Options{Summary: true}
	in := filter.NewIncremental(parts, o)
	var cpuTotal time.Duration
	for i := range 22 {
		start, cpu0 := time.Now(), cpuTime()
		if err := d.Set("stage.gain.signal.freq", freqs[i%2]); err != nil {
			return 0, 0, err
		}
		p, err := filter.Derive(d)
		if err != nil {
			return 0, 0, err
		}
		var rs []filter.Result
		if all {
			rs, err = in.Ranked(context.Background(), p, filter.SortMargin)
		} else {
			var rk *filter.Ranking
			if rk, err = in.Rank(context.Background(), p, filter.SortMargin); err == nil {
				rs = rk.Passing
			}
		}
		if err != nil {
			return 0, 0, err
		}
		for i := 0; i < min(len(rs), 40); i++ {
			filter.Explain(p, &rs[i], o)
		}
		if i > 0 { // the first evaluation computes everything
			runs = append(runs, time.Since(start))
			cpuTotal += cpuTime() - cpu0
		}
	}
	slices.Sort(runs)
	return runs[len(runs)/2], cpuTotal / time.Duration(len(runs)), nil
}

// cpuTime is the user and system time the process has used so far.
func cpuTime() time.Duration {
	var ru syscall.Rusage
	if syscall.Getrusage(syscall.RUSAGE_SELF, &ru) != nil {
		return 0
	}
	return time.Duration(ru.Utime.Nano() + ru.Stime.Nano())
}

func secs(d time.Duration) string { return fmt.Sprintf("%.3f s", d.Seconds()) }

func ms(d time.Duration) string { return fmt.Sprintf("%.2f ms", float64(d.Microseconds())/1000) }
