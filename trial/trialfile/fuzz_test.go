package trialfile

import (
	"bytes"
	"os"
	"strings"
	"testing"

	"furlong/trial"
)

// FuzzDecode checks that Decode never panics and that whatever it accepts
// encodes and decodes again to an equal trial.
func FuzzDecode(f *testing.F) {
	var buf bytes.Buffer
	if err := Encode(&buf, richTrial()); err != nil {
		f.Fatal(err)
	}
	rich := buf.Bytes()
	f.Add(rich)
	f.Add(rich[:len(rich)/2])
	f.Add([]byte(small))
	f.Add([]byte(strings.Replace(small, `"number": 3,`, `"number": 2,`, 1)))
	f.Add([]byte(strings.Replace(small, `[10, 11, null, 13]`, `[10, 2.5, null, 13]`, 1)))
	f.Add([]byte(strings.Replace(small, `"version": 1`, `"version": 0`, 1)))
	f.Add([]byte(strings.Replace(small, `"version": 1`, `"version": 9`, 1)))
	f.Add([]byte(`{"format":"furlong-trial","version":1,"trial":{"traits":[{"key":"a","values":[1e999]}]}}`))
	f.Add([]byte(`{"format":"furlong-trial","version":1,"trial":{"created":"0000-01-01T00:00:00+01:00"}}`))
	f.Add([]byte("\xef\xbb\xbf[[[[[[[[[[{"))
	f.Add([]byte(`{"format":"furlong-trial","version":1,"trial":{"randomization":{"seed":"18446744073709551615"}}}`))
	f.Add([]byte(`{"format":"furlong-trial","version":1,"trial":{"title":"a","Title":"b","ti\u0074le":"c"}}`))
	f.Add([]byte(`{"format":"furlong-trial","version":1,"trial":{"design":{"kind":"xyz"},"plots":[{"number":1,"block":0,"row":100000000000}]}}`))
	f.Add([]byte(`{"format":"furlong-trial","version":1,"trial":{"traits":[{"key":"a","decimals":10000000,"higher_better":tru`))
	for _, kind := range []trial.DesignKind{trial.SplitPlot, trial.StripPlot} {
		buf.Reset()
		if err := Encode(&buf, factorialTrial(f, kind, 2)); err != nil {
			f.Fatal(err)
		}
		f.Add(append([]byte(nil), buf.Bytes()...))
	}
	f.Add([]byte(`{"format":"furlong-trial","version":3,"trial":{"treatments":[{"code":"a","levels":[]}]}}`))
	if v0, err := os.ReadFile("testdata/v0-sample.furlong"); err == nil {
		f.Add(v0)
	}
	f.Fuzz(func(t *testing.T, data []byte) {
		tr, err := Decode(bytes.NewReader(data))
		if err != nil {
			if tr != nil {
				t.Fatal("a trial returned with an error")
			}
			_ = err.Error()
			return
		}
		var out bytes.Buffer
		if err := Encode(&out, tr); err != nil {
			t.Fatalf("a decoded trial does not encode: %v", err)
		}
		back, err := Decode(bytes.NewReader(out.Bytes()))
		if err != nil {
			t.Fatalf("a re-encoded trial does not decode: %v\n%s", err, out.Bytes())
		}
		if d := diff(tr, back); d != "" {
			t.Fatalf("round trip changed the trial: %s", d)
		}
	})
}
