package trial

import (
	"errors"
	"strings"
	"testing"
)

func panicsWith(v any) { panic(v) }

func TestCatchReturnsThePanicWithItsStack(t *testing.T) {
	t.Parallel()
	if p := Catch(func() {}); p != nil {
		t.Fatalf("a function that returns normally gave %v", p)
	}
	p := Catch(func() { panicsWith("boom") })
	if p == nil || p.Value != "boom" {
		t.Fatalf("got %+v, want the value boom", p)
	}
	// The stack is the panicking goroutine's (runtime/debug.Stack, Go standard library).
	if !strings.Contains(string(p.Stack), "panicsWith") {
		t.Errorf("the stack does not show the panicking function:\n%s", p.Stack)
	}
	// Forwarded again it keeps the first stack.
	q := Catch(func() { panic(p) })
	if q != p {
		t.Errorf("a forwarded panic was wrapped again: %+v", q)
	}
}

func TestWorkersRaiseAWorkerPanicOnTheWaiter(t *testing.T) {
	t.Parallel()
	var w Workers
	done := make(chan int, 4)
	for i := 0; i < 4; i++ {
		w.Go(func() {
			if i == 2 {
				panicsWith(errors.New("worker 2 failed"))
			}
			done <- i
		})
	}
	got := Catch(w.Wait)
	if got == nil {
		t.Fatal("Wait did not raise the worker's panic")
	}
	if err, ok := got.Value.(error); !ok || err.Error() != "worker 2 failed" {
		t.Errorf("raised %v, want the worker's error", got.Value)
	}
	if !strings.Contains(string(got.Stack), "panicsWith") {
		t.Errorf("the stack is not the worker's:\n%s", got.Stack)
	}
	if len(done) != 3 {
		t.Errorf("%d other workers finished, want 3", len(done))
	}
	// Without a panic Wait returns.
	var ok Workers
	ok.Go(func() {})
	if p := Catch(ok.Wait); p != nil {
		t.Errorf("Wait panicked without a worker panic: %v", p)
	}
}
