package api

import (
	"context"
	"io"

	"drawsift/engine/internal/jsonx"
	"drawsift/engine/library"
	"drawsift/engine/scenario"
	"drawsift/engine/screen"
)

// ScreenStream answers a screen request exactly as Dispatch(ctx,
// OpScreen, body) does — the same bytes — but computes and writes a
// sweep a few candidates at a time (as many as it may use cores), so a
// host holds those candidates' series in memory, never the whole sweep.
// Until the first byte is written it returns any error (started false,
// nothing written) for the host to answer with the error's status: the
// sweep's own checks and its first block run before anything is written,
// so an error of the scenario at a sweep point still comes as an error.
// Once started, the answer is always completed; should a later block
// fail (the deadline passing), its series carry the error as every
// point's reason. An error with started true means w failed.
func ScreenStream(ctx context.Context, body []byte, w io.Writer, progress func(done, total int)) (started bool, e *Error) {
	defer func() {
		if r := recover(); r != nil && !started {
			e = &Error{Message: "internal error", Kind: KindInternal}
		}
	}()
	var req ScreenRequest
	if e = decode(body, &req); e != nil {
		return false, e
	}
	if req.Sweep == nil {
		resp, e := Screen(ctx, &req, progress)
		if e != nil {
			return false, e
		}
		out, e := encodeResponse(resp)
		if e != nil {
			return false, e
		}
		return writeAll(w, out)
	}
	resp, sc, e := screenRanked(ctx, &req, progress)
	if e != nil {
		return false, e
	}
	spec, err := scenario.ResolveSweep(req.Sweep)
	if err != nil {
		return false, fromEngine("", err)
	}
	if err := screen.CheckSweep(sc, spec); err != nil {
		return false, fromEngine("", err)
	}
	lib, _ := library.Default()
	block := screen.Cores(ctx)
	part := func(lo int) ([]SweepSeries, error) {
		local := *sc
		local.Candidates = sc.Candidates[lo:min(lo+block, len(sc.Candidates))]
		series, err := screen.Sweep(ctx, &local, lib, spec)
		if err != nil {
			return nil, err
		}
		return sweepSeries(series, req.Sweep), nil
	}
	first, err := part(0)
	if err != nil {
		return false, fromEngine("", err)
	}
	head, e := encodeResponse(resp) // Sweep is nil: the answer up to its last '}'
	if e != nil {
		return false, e
	}
	sw := &stickyWriter{w: w}
	write := sw.write
	sep := []byte(`,"sweep":[`)
	emit := func(series []SweepSeries) {
		for i := range series {
			b, e := encodeResponse(&series[i])
			if e != nil {
				b, _ = jsonx.Marshal(failedSeries(&series[i], e.Message))
			}
			write(sep, b)
			sep = []byte{','}
		}
	}
	started = true // from here on the answer is completed, never replaced by an error
	write(head[:len(head)-1])
	emit(first)
	for lo := block; lo < len(sc.Candidates) && sw.err == nil; lo += block {
		series, err := part(lo)
		if err != nil {
			series = notComputed(sc, lo, block, req.Sweep, spec.Points, err.Error())
		}
		emit(series)
	}
	write([]byte("]}"))
	if sw.err != nil {
		return true, &Error{Field: "sweep", Message: "writing the answer: " + sw.err.Error(), Kind: KindInvalid}
	}
	return true, nil
}

// stickyWriter writes until the first error and keeps it, for the
// streamed answers (BatchStream, ScreenStream).
type stickyWriter struct {
	w   io.Writer
	err error
}

func (s *stickyWriter) write(b ...[]byte) {
	for _, p := range b {
		if s.err == nil {
			_, s.err = s.w.Write(p)
		}
	}
}

func writeAll(w io.Writer, b []byte) (bool, *Error) {
	if _, err := w.Write(b); err != nil {
		return true, &Error{Message: "writing the answer: " + err.Error(), Kind: KindInvalid}
	}
	return true, nil
}

// notComputed stands for the series of candidates lo… that a failed
// block left out: every point carries the reason.
func notComputed(sc *screen.Scenario, lo, block int, sw *SweepSpec, points int, reason string) []SweepSeries {
	var in []screen.SweepSeries
	for _, c := range sc.Candidates[lo:min(lo+block, len(sc.Candidates))] {
		for _, o := range sc.Orientations {
			s := screen.SweepSeries{Solute: c, Orientation: o, Points: make([]screen.SweepPoint, points)}
			for i := range s.Points {
				s.Points[i].Reason = "not computed: " + reason
			}
			in = append(in, s)
		}
	}
	return sweepSeries(in, sw)
}

// failedSeries is s with every point replaced by the reason (x kept).
func failedSeries(s *SweepSeries, reason string) *SweepSeries {
	out := &SweepSeries{Solute: s.Solute, Orientation: s.Orientation, Variable: s.Variable, Unit: s.Unit, Points: make([]SweepPoint, len(s.Points))}
	for i, p := range s.Points {
		out.Points[i] = SweepPoint{X: p.X, Reason: "not computed: " + reason}
	}
	return out
}
