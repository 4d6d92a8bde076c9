package main

import (
	"bytes"
	"encoding/json"
	"fmt"
	"io"
	"os"
	"path/filepath"
	"sort"
)

// outputs collects the files of one command and writes them all at the end, so that a failure part-way leaves
// no partial output: every file is first written into a staging directory beside the destination, then renamed
// into place.
type outputs struct {
	dir   string
	files map[string]func(path string) error
}

func newOutputs(dir string) *outputs {
	return &outputs{dir: dir, files: map[string]func(string) error{}}
}

// add registers a file name (inside dir) and the function that writes it to a given path.
func (o *outputs) add(name string, write func(path string) error) { o.files[name] = write }

// addBytes registers a file with fixed contents.
func (o *outputs) addBytes(name string, data []byte) {
	o.add(name, func(p string) error { return os.WriteFile(p, data, 0o644) })
}

// addWriter registers a file produced by a writer function.
func (o *outputs) addWriter(name string, fn func(io.Writer) error) {
	o.add(name, func(p string) error {
		var b bytes.Buffer
		if err := fn(&b); err != nil {
			return err
		}
		return os.WriteFile(p, b.Bytes(), 0o644)
	})
}

// addJSON registers an indented JSON file.
func (o *outputs) addJSON(name string, v any) {
	o.addWriter(name, func(w io.Writer) error { return writeJSON(w, v) })
}

// names lists the registered files in order.
func (o *outputs) names() []string {
	n := make([]string, 0, len(o.files))
	for k := range o.files {
		n = append(n, k)
	}
	sort.Strings(n)
	return n
}

// commit writes every file: into a staging directory first, then renamed into dir.
func (o *outputs) commit() error {
	if len(o.files) == 0 {
		return nil
	}
	parent := filepath.Dir(filepath.Clean(o.dir))
	if err := os.MkdirAll(parent, 0o755); err != nil {
		return fmt.Errorf("creating %s: %w", parent, err)
	}
	stage, err := os.MkdirTemp(parent, ".eddyrz-stage-")
	if err != nil {
		return fmt.Errorf("creating a staging directory in %s: %w", parent, err)
	}
	defer os.RemoveAll(stage)
	for _, name := range o.names() {
		if err := o.files[name](filepath.Join(stage, name)); err != nil {
			return fmt.Errorf("writing %s: %w", name, err)
		}
	}
	if err := os.MkdirAll(o.dir, 0o755); err != nil {
		return fmt.Errorf("creating %s: %w", o.dir, err)
	}
	for _, name := range o.names() {
		if err := os.Rename(filepath.Join(stage, name), filepath.Join(o.dir, name)); err != nil {
			return fmt.Errorf("moving %s into %s: %w", name, o.dir, err)
		}
	}
	return nil
}

// writeJSON writes v as indented JSON with a final newline.
func writeJSON(w io.Writer, v any) error {
	enc := json.NewEncoder(w)
	enc.SetIndent("", "  ")
	return enc.Encode(v)
}
