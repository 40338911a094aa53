package main

import (
	"context"
	"io/fs"
	"slices"
	"testing"

	"github.com/james-bowman/sparse"

	"assay/corpus/demo"
)

func demoBytes(b *testing.B) int64 {
	var n int64
	fs.WalkDir(demo.FS(), ".", func(_ string, d fs.DirEntry, _ error) error {
		if d != nil && !d.IsDir() {
			if info, err := d.Info(); err == nil {
				n += info.Size()
			}
		}
		return nil
	})
	return n
}

func benchOptions(b *testing.B) pickOptions {
	f := defaultFlags(b)
	f.format = "json"
	opts, err := f.options(demoSource)
	if err != nil {
		b.Fatal(err)
	}
	return opts
}

// BenchmarkIngestDemo reads, analyses and builds the count matrix of the
// demo corpus; MB/s is of raw input.
func BenchmarkIngestDemo(b *testing.B) {
	opts := benchOptions(b)
	b.SetBytes(demoBytes(b))
	b.ReportAllocs()
	for b.Loop() {
		if _, err := analyze(context.Background(), demo.FS(), opts); err != nil {
			b.Fatal(err)
		}
	}
}

// BenchmarkPickDemo weights, runs the reference SVD, picks and measures on
// the analysed demo corpus.
func BenchmarkPickDemo(b *testing.B) {
	opts := benchOptions(b)
	an, err := analyze(context.Background(), demo.FS(), opts)
	if err != nil {
		b.Fatal(err)
	}
	// pick weights the counts in place: each round gets a copy of them.
	raw := an.counts.Matrix.RawMatrix()
	counts := slices.Clone(raw.Data)
	b.ReportAllocs()
	for b.Loop() {
		an.counts.Matrix = sparse.NewCSR(raw.I, raw.J, raw.Indptr, raw.Ind, slices.Clone(counts))
		if _, err := pick(an, opts, "bench"); err != nil {
			b.Fatal(err)
		}
	}
}
