package api

import (
	"bytes"
	"context"
	"encoding/json"
	"strings"
	"sync/atomic"
	"testing"
	"time"
)

// expiring is a context whose deadline passes when its test says so (an
// event, not a clock).
type expiring struct {
	context.Context
	done chan struct{}
	over atomic.Bool
}

func newExpiring() *expiring {
	return &expiring{Context: context.Background(), done: make(chan struct{})}
}

func (c *expiring) expire() {
	if c.over.CompareAndSwap(false, true) {
		close(c.done)
	}
}
func (c *expiring) Done() <-chan struct{}       { return c.done }
func (c *expiring) Deadline() (time.Time, bool) { return time.Time{}, false }
func (c *expiring) Err() error {
	if c.over.Load() {
		return context.DeadlineExceeded
	}
	return nil
}

const batchOsm = `{"op":"osmotic","body":{"solute":"NaCl","concentration":1,"unit":"mol/kg"}}`

func batchOf(n int) string {
	return "[" + strings.TrimSuffix(strings.Repeat(batchOsm+",", n), ",") + "]"
}

// countingWriter records, at each write, how many items the batch had
// finished.
type countingWriter struct {
	buf    bytes.Buffer
	done   *atomic.Int64
	writes []int64
}

func (w *countingWriter) Write(p []byte) (int, error) {
	w.writes = append(w.writes, w.done.Load())
	return w.buf.Write(p)
}

// TestBatchStreamHoldsOneAnswer: the streamed batch is Dispatch's answer
// byte for byte, and each answer is written as soon as it is computed
// (item k is written when k items are done), so the host never holds the
// whole batch.
func TestBatchStreamHoldsOneAnswer(t *testing.T) {
	body := []byte(batchOf(5))
	want, e := Dispatch(context.Background(), OpBatch, body)
	if e != nil {
		t.Fatal(e)
	}
	var done atomic.Int64
	w := &countingWriter{done: &done}
	started, e := BatchStream(context.Background(), body, w, func(d, _ int) { done.Store(int64(d)) })
	if !started || e != nil {
		t.Fatalf("started %v, error %v", started, e)
	}
	if w.buf.String() != string(want) {
		t.Errorf("stream differs from Dispatch:\n got %.200s\nwant %.200s", w.buf.String(), want)
	}
	// Writes: "[" + item 0 after 0 done (progress follows the write),
	// then "," + item k after k done, then "]".
	for k := 0; k < 5; k++ {
		if got := w.writes[2*k+1]; got != int64(k) {
			t.Errorf("item %d written after %d items were done, want %d", k, got, k)
		}
	}
}

// TestBatchDeadlineKeepsAnsweredItems: a deadline before the first answer
// is the batch's error (field "deadline", kind timeout); one that passes
// mid-batch keeps the answers already given and makes the rest answer
// ok false with the deadline error, in a complete array.
func TestBatchDeadlineKeepsAnsweredItems(t *testing.T) {
	ctx := newExpiring()
	ctx.expire()
	if _, e := Dispatch(ctx, OpBatch, []byte(batchOf(3))); e == nil || e.Field != "deadline" || e.Kind != KindTimeout {
		t.Fatalf("expired before the first item: error %+v, want field deadline, kind timeout", e)
	}
	var buf bytes.Buffer
	if started, e := BatchStream(ctx, []byte(batchOf(3)), &buf, nil); started || e == nil || e.Field != "deadline" || buf.Len() != 0 {
		t.Fatalf("stream expired before the first item: started %v, error %+v, wrote %q", started, e, buf.String())
	}

	ctx = newExpiring()
	buf.Reset()
	started, e := BatchStream(ctx, []byte(batchOf(4)), &buf, func(d, _ int) {
		if d == 2 {
			ctx.expire()
		}
	})
	if !started || e != nil {
		t.Fatalf("started %v, error %v", started, e)
	}
	var res []BatchResult
	if err := json.Unmarshal(buf.Bytes(), &res); err != nil {
		t.Fatalf("the stream is not a complete array: %v\n%s", err, buf.String())
	}
	if len(res) != 4 || !res[0].OK || !res[1].OK || res[2].OK || res[3].OK {
		t.Fatalf("want two answers then two failures, got %s", buf.String())
	}
	var eb struct{ Error Error }
	if err := json.Unmarshal(res[3].Result, &eb); err != nil || eb.Error.Field != "deadline" {
		t.Errorf("item past the deadline: %s, want the deadline error", res[3].Result)
	}
	// Batch (in memory) answers the same.
	ctx2 := newExpiring()
	out, e := DispatchProgress(ctx2, OpBatch, []byte(batchOf(4)), func(d, _ int) {
		if d == 2 {
			ctx2.expire()
		}
	})
	if e != nil || string(out) != buf.String() {
		t.Errorf("Batch past the deadline differs from the stream (error %v):\n%s\n%s", e, out, buf.String())
	}
}
