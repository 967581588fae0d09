package trialfile

import (
	"bytes"
	"io"
	"testing"
)

// A 24,000-plot trial with 10 traits (240,000 values).
func BenchmarkEncode(b *testing.B) {
	tr := bigTrial("bench", 24000, 10, 3)
	var buf bytes.Buffer
	if err := Encode(&buf, tr); err != nil {
		b.Fatal(err)
	}
	b.SetBytes(int64(buf.Len()))
	b.ReportAllocs()
	for b.Loop() {
		if err := Encode(io.Discard, tr); err != nil {
			b.Fatal(err)
		}
	}
}

func BenchmarkDecode(b *testing.B) {
	var buf bytes.Buffer
	if err := Encode(&buf, bigTrial("bench", 24000, 10, 3)); err != nil {
		b.Fatal(err)
	}
	data := buf.Bytes()
	b.SetBytes(int64(len(data)))
	b.ReportAllocs()
	for b.Loop() {
		if _, err := Decode(bytes.NewReader(data)); err != nil {
			b.Fatal(err)
		}
	}
}

// The duplicate-member scan of Decode alone, on the same file.
func BenchmarkDuplicateKeyScan(b *testing.B) {
	var buf bytes.Buffer
	if err := Encode(&buf, bigTrial("bench", 24000, 10, 3)); err != nil {
		b.Fatal(err)
	}
	data := buf.Bytes()
	b.SetBytes(int64(len(data)))
	for b.Loop() {
		if pe := duplicateKey(data); pe != nil {
			b.Fatal(pe)
		}
	}
}
