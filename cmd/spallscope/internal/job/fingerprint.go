package job

import (
	"crypto/sha256"
	"encoding/hex"
	"encoding/json"
	"os"

	"spallscope/dic/frames"
	"spallscope/dic/runfolder"
)

// fingerprint hashes the JSON form of parts (SHA-256, hex).
func fingerprint(parts ...any) string {
	h := sha256.New()
	enc := json.NewEncoder(h)
	for _, p := range parts {
		enc.Encode(p)
	}
	return hex.EncodeToString(h.Sum(nil))
}

// fileHash returns the SHA-256 of a file's content ("" for no file).
func fileHash(path string) (string, error) {
	if path == "" {
		return "", nil
	}
	return runfolder.FileSHA256(path)
}

// sequenceDigest identifies a photo sequence by its frames' sources, sizes
// and modification times — cheap for thousands of photos, and it changes
// when a photo is replaced or edited.
func sequenceDigest(seq frames.Sequence) string {
	type entry struct {
		Source string
		Size   int64
		Mod    int64
	}
	var es []entry
	for i := 0; i < seq.Len(); i++ {
		e := entry{Source: seq.Source(i)}
		if st, err := os.Stat(seq.Source(i)); err == nil {
			e.Size, e.Mod = st.Size(), st.ModTime().UnixNano()
		}
		es = append(es, e)
	}
	return fingerprint(es)
}
