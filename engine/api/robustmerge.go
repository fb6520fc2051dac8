package api

import (
	"bytes"
	"fmt"

	"drawsift/engine/internal/jsonx"
	"drawsift/engine/screen"
)

// OpRobustnessMerge adds up the parts of a robustness run split by
// uncertainty.shard into the whole run's screen answer.
const OpRobustnessMerge = "robustness-merge"

// RobustnessMergeRequest holds the screen answers of every part of one
// run, in any order.
type RobustnessMergeRequest struct {
	Parts []ScreenResponse `json:"parts"`
}

// candidateRobustness is a candidate's figures as they travel.
func candidateRobustness(rb *screen.Robustness) *CandidateRobustness {
	return &CandidateRobustness{ProbabilityFirst: rb.PFirst, ProbabilityTop3: rb.PTop3,
		RankP05: rb.RankP05, RankMedian: rb.RankMedian, RankP95: rb.RankP95, FailedFraction: rb.FailedFraction,
		RankCounts: rb.RankCounts}
}

// RobustnessMerge checks that the parts are every part of one run, each
// once (the same screen apart from its part of the samples), adds their
// rank counts and answers what the unsplit run answers, byte for byte:
// the counts are integers, and the figures follow from them alone
// (screen.RobustnessOf).
func RobustnessMerge(req *RobustnessMergeRequest) (*ScreenResponse, *Error) {
	if len(req.Parts) == 0 {
		return nil, Invalid("parts", "1–64 screen answers", "no parts to merge")
	}
	first := &req.Parts[0]
	if first.Robustness == nil || first.Robustness.Shard == nil {
		return nil, Invalid("parts[0].robustness.shard", "a screen answer run with uncertainty.shard", "not a part of a split robustness run")
	}
	count := first.Robustness.Shard.Count
	if len(req.Parts) != count {
		return nil, Invalid("parts", fmt.Sprintf("%d parts (robustness.shard.count)", count), "%d parts given for a run split into %d", len(req.Parts), count)
	}
	base, e := withoutShard(first)
	if e != nil {
		return nil, e
	}
	n := len(first.Candidates)
	seen := make([]bool, count)
	sums := make([][]int, n)
	samples := 0
	for i := range req.Parts {
		p := &req.Parts[i]
		field := fmt.Sprintf("parts[%d]", i)
		sh := (*RobustnessShard)(nil)
		if p.Robustness != nil {
			sh = p.Robustness.Shard
		}
		if sh == nil || sh.Count != count || sh.Index < 0 || sh.Index >= count {
			return nil, Invalid(field+".robustness.shard", fmt.Sprintf("index 0–%d of %d parts", count-1, count), "not a part of the same split run as parts[0]")
		}
		if seen[sh.Index] {
			return nil, Invalid(field+".robustness.shard.index", fmt.Sprintf("each of 0–%d once", count-1), "part %d given twice", sh.Index)
		}
		seen[sh.Index] = true
		if i > 0 {
			b, e := withoutShard(p)
			if e != nil {
				return nil, e
			}
			if !bytes.Equal(b, base) {
				return nil, Invalid(field, "parts of one screen (the same request but for uncertainty.shard.index)", "not a part of the same screen as parts[0]")
			}
		}
		for k := range p.Candidates {
			rb := p.Candidates[k].Robustness
			if rb == nil || len(rb.RankCounts) != n+1 {
				return nil, Invalid(fmt.Sprintf("%s.candidates[%d].robustness.rank_counts", field, k), fmt.Sprintf("%d counts", n+1), "missing or of the wrong length")
			}
			if sums[k] == nil {
				sums[k] = make([]int, n+1)
			}
			total := 0
			for r, c := range rb.RankCounts {
				if c < 0 || c > p.Robustness.Samples {
					return nil, Invalid(fmt.Sprintf("%s.candidates[%d].robustness.rank_counts[%d]", field, k, r), fmt.Sprintf("0–%d (the part's samples)", p.Robustness.Samples), "a count out of range")
				}
				sums[k][r] += c
				total += c
			}
			if total != p.Robustness.Samples {
				return nil, Invalid(fmt.Sprintf("%s.candidates[%d].robustness.rank_counts", field, k), fmt.Sprintf("adding to %d (the part's samples)", p.Robustness.Samples), "the counts add to %d", total)
			}
		}
		samples += p.Robustness.Samples
	}
	out := *first
	out.Candidates = append([]ScreenCandidate(nil), first.Candidates...)
	for k := range out.Candidates {
		rb := screen.RobustnessOf(sums[k])
		out.Candidates[k].Robustness = candidateRobustness(&rb)
	}
	rep := *first.Robustness
	if rep.Samples, rep.Shard = samples, nil; samples != first.Robustness.Shard.SamplesAll {
		return nil, Invalid("parts", fmt.Sprintf("%d samples (robustness.shard.samples_all)", first.Robustness.Shard.SamplesAll), "the parts ran %d samples", samples)
	}
	out.Robustness = &rep
	out.Scenario = unsharded(first.Scenario)
	return &out, nil
}

// withoutShard encodes what makes a part's answer, with its part of the
// samples left out: the echoed request without its shard, the engine
// version and the candidates' order. Two parts that agree on it are
// parts of one screen (the same request on the same engine gives the
// same answer), which the comparison checks without encoding the whole
// answers.
func withoutShard(p *ScreenResponse) ([]byte, *Error) {
	order := make([]string, len(p.Candidates))
	for k, c := range p.Candidates {
		order[k] = c.Solute
	}
	b, err := jsonx.Marshal(struct {
		Scenario *ScreenRequest `json:"scenario"`
		Version  string         `json:"engine_version"`
		Order    []string       `json:"order"`
	}{unsharded(p.Scenario), p.EngineVersion, order})
	if err != nil {
		return nil, Invalid("parts", "screen answers", "a part could not be read: %v", err)
	}
	return b, nil
}

// unsharded is the echoed request without its uncertainty.shard (the
// unsplit run's request).
func unsharded(req *ScreenRequest) *ScreenRequest {
	if req == nil || req.Uncertainty == nil || req.Uncertainty.Shard == nil {
		return req
	}
	r := *req
	u := *req.Uncertainty
	u.Shard = nil
	r.Uncertainty = &u
	return &r
}
