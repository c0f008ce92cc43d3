package catalog

import (
	"bytes"
	"crypto/sha256"
	"encoding/binary"
	"encoding/hex"
	"errors"
	"hash/crc32"
	"math"
	"os"
	"path/filepath"
	"sync/atomic"
)

// Cache keeps catalog files parsed, one entry per source file, in a
// compact binary form under a directory of the user's cache (see
// CacheDir). An entry is keyed by the file's absolute path, size,
// modification time and SHA-256; it is used only when all four match the
// file as read now and its own version and checksum are right. Anything
// else — a stale, truncated, corrupt or foreign entry — is ignored and
// rebuilt, never trusted. Entries are written to a temporary file and
// renamed into place, so two processes building the same entry at once
// each leave a whole one. Only files without problems are cached: a file
// with a problem is decoded afresh every time, so its problems are always
// reported. Writing an entry is best effort: a cache that cannot be
// written makes loading no slower than without one.
type Cache struct {
	Dir string // the directory holding the entries

	hits atomic.Int64 // entries used, for tests
}

// CacheDir returns the directory the parsed-catalog cache lives in:
// $XDG_CACHE_HOME/opsift, else $HOME/.cache/opsift, or "" when neither
// variable gives an absolute path (the XDG Base Directory Specification
// says a relative $XDG_CACHE_HOME is to be ignored).
func CacheDir(getenv func(string) string) string {
	if x := getenv("XDG_CACHE_HOME"); x != "" && filepath.IsAbs(x) {
		return filepath.Join(x, "opsift")
	}
	if h := getenv("HOME"); h != "" && filepath.IsAbs(h) {
		return filepath.Join(h, ".cache", "opsift")
	}
	return ""
}

// cacheMagic starts every entry; cacheVersion changes whenever the layout
// of an entry or the meaning of a Part field does.
const (
	cacheMagic   = "opsift parsed catalog\n"
	cacheVersion = 1
)

// entryPath is the file of the entry for the catalog file at abs.
func (c *Cache) entryPath(abs string) string {
	h := sha256.Sum256([]byte(abs))
	return filepath.Join(c.Dir, "catalog", hex.EncodeToString(h[:16])+".bin")
}

// cacheKey is what an entry must match: the file as it is now.
type cacheKey struct {
	path  string
	size  int64
	mtime int64 // modification time, ns since the epoch
	sum   [sha256.Size]byte
}

// fileKey returns the key of the file at path whose contents are data,
// with SHA-256 sum, or false when the file is not the data (changed while
// it was read).
func fileKey(path string, data []byte, sum [sha256.Size]byte) (cacheKey, bool) {
	abs, err := filepath.Abs(path)
	if err != nil {
		return cacheKey{}, false
	}
	st, err := os.Stat(abs)
	if err != nil || st.Size() != int64(len(data)) {
		return cacheKey{}, false
	}
	return cacheKey{path: abs, size: st.Size(), mtime: st.ModTime().UnixNano(), sum: sum}, true
}

// get returns the cached parts of the catalog file at path, read as data
// (whose SHA-256 is sum) and shown as file in positions; false when there
// is no valid entry.
func (c *Cache) get(path, file string, data []byte, sum [sha256.Size]byte) ([]*Part, bool) {
	k, ok := fileKey(path, data, sum)
	if !ok {
		return nil, false
	}
	raw, err := os.ReadFile(c.entryPath(k.path))
	if err != nil {
		return nil, false
	}
	parts, err := decodeEntry(raw, k, file)
	if err != nil {
		return nil, false
	}
	c.hits.Add(1)
	return parts, true
}

// put stores the parts of the catalog file at path, read as data (whose
// SHA-256 is sum).
func (c *Cache) put(path string, data []byte, sum [sha256.Size]byte, parts []*Part) {
	k, ok := fileKey(path, data, sum)
	if !ok {
		return
	}
	_ = writeEntry(c.entryPath(k.path), encodeEntry(k, parts))
}

// writeEntry writes an entry through a temporary file in the same
// directory and renames it into place.
func writeEntry(path string, b []byte) error {
	dir := filepath.Dir(path)
	if err := os.MkdirAll(dir, 0o700); err != nil {
		return err
	}
	f, err := os.CreateTemp(dir, ".entry-*")
	if err != nil {
		return err
	}
	_, err = f.Write(b)
	if cerr := f.Close(); err == nil {
		err = cerr
	}
	if err == nil {
		err = os.Rename(f.Name(), path)
	}
	if err != nil {
		os.Remove(f.Name())
	}
	return err
}

// optSlots lists every optional number of a part in the entry's order,
// in buf (reused from part to part).
func optSlots(p *Part, buf []*Opt) []*Opt {
	s := append(buf[:0], &p.UnitCost, &p.Temp[0], &p.Temp[1], &p.Supply.Min, &p.Supply.Max,
		&p.InputCM.Low, &p.InputCM.High, &p.Output.Low, &p.Output.High, &p.Output.Load)
	for _, f := range figures {
		sp := f.spec(p)
		s = append(s, &sp.Typ, &sp.Min, &sp.Max, &sp.MinOT, &sp.MaxOT)
	}
	for _, sc := range scalars {
		s = append(s, sc.opt(p))
	}
	return s
}

// sourceSlots lists every Source of a part in the entry's order, in buf.
func sourceSlots(p *Part, buf []*Source) []*Source {
	s := append(buf[:0], &p.InputCM.Source, &p.Output.Source)
	for _, f := range figures {
		s = append(s, &f.spec(p).Source)
	}
	return s
}

var crcTable = crc32.MakeTable(crc32.Castagnoli)

// encodeEntry lays out an entry: magic, version, key, parts, and a CRC-32C
// of everything before it.
func encodeEntry(k cacheKey, parts []*Part) []byte {
	b := make([]byte, 0, 64+len(parts)*400)
	b = append(b, cacheMagic...)
	b = binary.AppendUvarint(b, cacheVersion)
	b = appendString(b, k.path)
	b = binary.AppendVarint(b, k.size)
	b = binary.AppendVarint(b, k.mtime)
	b = append(b, k.sum[:]...)
	b = binary.AppendUvarint(b, uint64(len(parts)))
	var opts []*Opt
	var srcs []*Source
	for _, p := range parts {
		for _, s := range []string{p.ID, p.Name, string(p.Tech), p.Pinout, string(p.Lifecycle), p.Datasheet, p.Notes} {
			b = appendString(b, s)
		}
		b = binary.AppendVarint(b, int64(p.Channels))
		b = binary.AppendUvarint(b, uint64(p.Pos.Line))
		b = binary.AppendUvarint(b, uint64(len(p.Packages)))
		for _, s := range p.Packages {
			b = appendString(b, s)
		}
		opts = optSlots(p, opts)
		slots := opts
		mask := make([]byte, (len(slots)+7)/8)
		for i, o := range slots {
			if o.Known() {
				mask[i/8] |= 1 << (i % 8)
			}
		}
		b = append(b, mask...)
		for _, o := range slots {
			if o.Known() {
				b = binary.LittleEndian.AppendUint64(b, math.Float64bits(o.V()))
			}
		}
		srcs = sourceSlots(p, srcs)
		for _, s := range srcs {
			b = appendString(b, string(*s))
		}
	}
	return binary.LittleEndian.AppendUint32(b, crc32.Checksum(b, crcTable))
}

func appendString(b []byte, s string) []byte {
	b = binary.AppendUvarint(b, uint64(len(s)))
	return append(b, s...)
}

var errEntry = errors.New("not a valid cache entry")

// entryReader reads an entry's fields, remembering the first failure.
type entryReader struct {
	b   []byte
	err error
	// intern shares the strings that repeat from part to part (technology,
	// pinout, packages, sources) instead of holding a copy in each.
	intern map[string]string
}

func (r *entryReader) uvarint() uint64 { return readVarint(r, binary.Uvarint) }

func (r *entryReader) varint() int64 { return readVarint(r, binary.Varint) }

// readVarint reads one number with read (binary.Uvarint or Varint).
func readVarint[T uint64 | int64](r *entryReader, read func([]byte) (T, int)) T {
	v, n := read(r.b)
	if n <= 0 {
		r.fail()
		return 0
	}
	r.b = r.b[n:]
	return v
}

func (r *entryReader) bytes(n uint64) []byte {
	if r.err != nil || n > uint64(len(r.b)) {
		r.fail()
		return nil
	}
	v := r.b[:n]
	r.b = r.b[n:]
	return v
}

func (r *entryReader) str() string { return string(r.bytes(r.uvarint())) }

// shared reads a string that many parts hold.
func (r *entryReader) shared() string {
	b := r.bytes(r.uvarint())
	if s, ok := r.intern[string(b)]; ok {
		return s
	}
	s := string(b)
	r.intern[s] = s
	return s
}

func (r *entryReader) fail() {
	if r.err == nil {
		r.err = errEntry
	}
	r.b = nil
}

// decodeEntry reads an entry made by encodeEntry, failing unless it is
// whole, of this version and for exactly key k.
func decodeEntry(raw []byte, k cacheKey, file string) ([]*Part, error) {
	if len(raw) < len(cacheMagic)+4 || !bytes.HasPrefix(raw, []byte(cacheMagic)) {
		return nil, errEntry
	}
	body := raw[:len(raw)-4]
	if crc32.Checksum(body, crcTable) != binary.LittleEndian.Uint32(raw[len(raw)-4:]) {
		return nil, errEntry
	}
	r := &entryReader{b: body[len(cacheMagic):], intern: map[string]string{}}
	if r.uvarint() != cacheVersion || r.str() != k.path || r.varint() != k.size || r.varint() != k.mtime ||
		!bytes.Equal(r.bytes(sha256.Size), k.sum[:]) {
		return nil, errEntry
	}
	n := r.uvarint()
	if n > uint64(len(r.b)) { // every part takes more than a byte
		return nil, errEntry
	}
	parts := make([]*Part, 0, n)
	block := make([]Part, n) // one allocation for all the parts of the file
	var opts []*Opt
	var srcs []*Source
	for i := range block {
		p := &block[i]
		p.ID, p.Name = r.str(), r.str()
		p.Tech, p.Pinout, p.Lifecycle = Tech(r.shared()), r.shared(), Lifecycle(r.shared())
		p.Datasheet, p.Notes = r.str(), r.str()
		p.Channels = int(r.varint())
		p.Pos = Pos{File: file, Line: int(r.uvarint())}
		if np := r.uvarint(); np > 0 && np <= uint64(len(r.b)) {
			p.Packages = make([]string, np)
			for j := range p.Packages {
				p.Packages[j] = r.shared()
			}
		}
		opts = optSlots(p, opts)
		slots := opts
		mask := r.bytes(uint64(len(slots)+7) / 8)
		for j, o := range slots {
			if r.err == nil && mask[j/8]&(1<<(j%8)) != 0 {
				if v := r.bytes(8); r.err == nil {
					*o = Some(math.Float64frombits(binary.LittleEndian.Uint64(v)))
				}
			}
		}
		srcs = sourceSlots(p, srcs)
		for _, s := range srcs {
			*s = Source(r.shared())
		}
		if r.err != nil {
			return nil, r.err
		}
		parts = append(parts, p)
	}
	if len(r.b) != 0 {
		return nil, errEntry
	}
	return parts, nil
}
