package jsonout

import (
	"bytes"
	"math"
	"strings"
	"testing"
)

// elementsDoc writes a document with a long list through writeElements
// (after two elements written directly) and returns its bytes.
func elementsDoc(t *testing.T, n int, bad int) ([]byte, error) {
	t.Helper()
	var b bytes.Buffer
	w := New(&b)
	w.BeginObject()
	w.Key("list")
	w.BeginArray()
	w.String("first")
	w.Int(-1)
	writeElements(w, n, func(sw *Writer, lo, hi int) {
		for i := lo; i < hi; i++ {
			sw.BeginCompactObject()
			sw.IntField("i", i)
			v := 1 / float64(i+3)
			if i == bad {
				v = math.NaN()
			}
			sw.NumberField("x", v)
			sw.EndObject()
		}
	})
	w.String("last")
	w.EndArray()
	w.EndObject()
	err := w.Flush()
	return b.Bytes(), err
}

// TestWriteElementsParallelSameBytes: the chunked, parallel form of a long
// list must give the same bytes as one loop (common practice for a
// parallel rewrite: compare it with the sequential form).
func TestWriteElementsParallelSameBytes(t *testing.T) {
	// Not parallel: it changes the package's chunk sizes.
	oldChunk, oldMin := chunkElements, parallelElements
	defer func() { chunkElements, parallelElements = oldChunk, oldMin }()
	for _, n := range []int{0, 1, 7, 100, 1001} {
		chunkElements, parallelElements = 1<<30, 1<<30
		seq, err := elementsDoc(t, n, -1)
		if err != nil {
			t.Fatal(err)
		}
		chunkElements, parallelElements = 13, 1
		par, err := elementsDoc(t, n, -1)
		if err != nil {
			t.Fatal(err)
		}
		if !bytes.Equal(seq, par) {
			t.Errorf("n = %d: parallel output differs:\n%s\nwant\n%s", n, par, seq)
		}
		// A NaN in a late chunk stops the document with an error.
		if n > 50 {
			if _, err := elementsDoc(t, n, n-3); err == nil || !strings.Contains(err.Error(), `"x"`) {
				t.Errorf("n = %d: a NaN element gave error %v", n, err)
			}
		}
	}
}
