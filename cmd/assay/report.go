package main

import (
	"fmt"
	"math"
	"sort"

	selection "assay/select"
	"assay/sparsemat"
)

// reportSchema versions the JSON report; bump it on any change of fields.
const reportSchema = "assay.pick/1"

// Report is everything a pick run found, in the order it is printed. The
// JSON form is documented field by field in the README.
type Report struct {
	Schema    string        `json:"schema"`
	Tool      toolInfo      `json:"tool"`
	Input     inputInfo     `json:"input"`
	Options   optionsInfo   `json:"options"`
	Exemplars []exemplarOut `json:"exemplars"`
	Terms     []termOut     `json:"terms"`
	Figures   figuresOut    `json:"figures"`
	Skipped   []skipOut     `json:"skipped"`
	Warnings  []string      `json:"warnings"`
	Repeat    string        `json:"repeat"`
	Caution   string        `json:"caution"`
}

type toolInfo struct {
	Name    string `json:"name"`
	Version string `json:"version"`
}

type inputInfo struct {
	Source         string `json:"source"`
	Fingerprint    string `json:"fingerprint"`
	DocumentsRead  int    `json:"documents_read"`
	DocumentsUsed  int    `json:"documents_used"`
	FilesSkipped   int    `json:"files_skipped"`
	RepairedDocs   int    `json:"documents_repaired"`
	Vocabulary     int    `json:"vocabulary"`
	TermsKept      int    `json:"terms_kept"`
	NonZeros       int    `json:"nonzeros"`
	NumericalRank  int    `json:"numerical_rank_at_least"`
	RankIsComplete bool   `json:"numerical_rank_exact"`
}

type optionsInfo struct {
	Method     string  `json:"method"`
	Seed       uint64  `json:"seed"`
	Docs       int     `json:"docs"`
	Terms      int     `json:"terms"`
	Rank       int     `json:"rank"`
	MinDF      int     `json:"min_df"`
	MaxDF      float64 `json:"max_df"`
	TF         string  `json:"tf"`
	IDF        string  `json:"idf"`
	Norm       string  `json:"norm"`
	MaxBytes   int64   `json:"max_bytes"`
	MinLength  int     `json:"min_length"`
	Numbers    bool    `json:"keep_numbers"`
	Stemming   bool    `json:"stemming"`
	PowerIters int     `json:"power_iters"`
}

type exemplarOut struct {
	ID          string `json:"id"`
	Title       string `json:"title"`
	Picks       int    `json:"picks"`
	Weight      num    `json:"weight"`
	Probability num    `json:"probability"`
}

type termOut struct {
	Term        string `json:"term"`
	Stem        string `json:"stem"`
	DF          int    `json:"df"`
	Picks       int    `json:"picks"`
	Weight      num    `json:"weight"`
	Probability num    `json:"probability"`
}

type figuresOut struct {
	Rank              int    `json:"rank"`
	FrobeniusNorm     num    `json:"frobenius_norm"`
	RelativeError     num    `json:"relative_error"`
	Captured          num    `json:"captured"`
	BestRelativeError num    `json:"best_relative_error"`
	BestCaptured      num    `json:"best_captured"`
	Ratio             *num   `json:"ratio"`
	CoreRank          int    `json:"core_rank"`
	SingularValues    []num  `json:"singular_values"`
	SVD               string `json:"svd"`
}

type skipOut struct {
	Path   string `json:"path"`
	Reason string `json:"reason"`
}

// num is a float printed with 6 significant digits, so reports are stable
// across machines whose last bits differ.
type num float64

func (n num) MarshalJSON() ([]byte, error) {
	f := float64(n)
	if math.IsNaN(f) || math.IsInf(f, 0) {
		return nil, fmt.Errorf("non-finite number %v in report", f)
	}
	return []byte(fmt.Sprintf("%.6g", f)), nil
}

// pick runs the selection on an analysed corpus and builds the report.
func pick(an *analysis, opts pickOptions, version string) (*Report, error) {
	a := sparsemat.Weight(an.counts, opts.Weight)
	at := sparsemat.Transpose(a)
	m, n := a.Dims()
	rep := &Report{Schema: reportSchema, Tool: toolInfo{Name: "assay", Version: version}, Caution: cautionSampling, Warnings: []string{}}
	normSq := sparsemat.FrobeniusSq(a)
	if normSq == 0 {
		return nil, fmt.Errorf("%s: every weight is zero (with --idf plain, a term in every document weighs zero only when m = df; check the weighting)", opts.Source)
	}

	k := opts.Rank
	if k == 0 {
		k = min(opts.Docs, opts.Terms)
	}
	if lim := min(m, n); k > lim {
		rep.Warnings = append(rep.Warnings, fmt.Sprintf("rank %d lowered to %d, the smaller side of the %d×%d matrix", k, lim, m, n))
		k = lim
	}
	svd, err := sparsemat.TruncatedSVD(a, at, sparsemat.SVDOptions{Rank: k, PowerIters: opts.Power, Seed: opts.Seed})
	if err != nil {
		return nil, fmt.Errorf("rank-%d reference: %w", k, err)
	}
	numRank := numericalRank(svd.Values, m, n)
	if numRank < k {
		rep.Warnings = append(rep.Warnings, fmt.Sprintf("rank %d lowered to %d, the numerical rank of the matrix", k, numRank))
		k = numRank
	}

	cur, err := selection.SquaredNorm(a, selection.Options{Rows: opts.Docs, Cols: opts.Terms, Seed: opts.Seed})
	if err != nil {
		return nil, fmt.Errorf("pick: %w", err)
	}
	errSq := selection.ErrorSq(a, cur)
	fig := selection.NewFigures(normSq, errSq, svd.Values, k)

	resolved := opts
	resolved.Rank = k
	resolved.MinDF = an.minDF
	rep.Repeat = resolved.command(opts.Source == demoSource)
	rep.Options = optionsInfo{
		Method: opts.Method, Seed: opts.Seed, Docs: opts.Docs, Terms: opts.Terms, Rank: k,
		MinDF: an.minDF, MaxDF: opts.MaxDF, TF: string(opts.Weight.TF), IDF: string(opts.Weight.IDF), Norm: string(opts.Weight.Norm),
		MaxBytes: opts.MaxBytes, MinLength: opts.MinLen, Numbers: opts.Numbers, Stemming: !opts.NoStem, PowerIters: opts.Power,
	}
	repaired := 0
	for _, d := range an.docs {
		if d.Repaired > 0 {
			repaired++
		}
	}
	rep.Input = inputInfo{
		Source: opts.Source, Fingerprint: an.fingerprint,
		DocumentsRead: len(an.docs), DocumentsUsed: m, FilesSkipped: len(an.skips), RepairedDocs: repaired,
		Vocabulary: an.counts.VocabularySize, TermsKept: n, NonZeros: a.NNZ(),
		NumericalRank: numRank, RankIsComplete: svd.Exact,
	}

	for _, p := range byPicks(cur.Rows) {
		d := an.docs[an.counts.Rows[p.Index]]
		rep.Exemplars = append(rep.Exemplars, exemplarOut{ID: d.ID, Title: d.Title, Picks: p.Count, Weight: num(p.Weight), Probability: num(p.Prob)})
	}
	for _, p := range byPicks(cur.Cols) {
		stem := an.counts.Terms[p.Index]
		rep.Terms = append(rep.Terms, termOut{Term: an.display.Form(stem), Stem: stem, DF: an.counts.DF[p.Index], Picks: p.Count, Weight: num(p.Weight), Probability: num(p.Prob)})
	}

	rep.Figures = figuresOut{
		Rank: k, FrobeniusNorm: num(math.Sqrt(normSq)),
		RelativeError: num(fig.RelErr()), Captured: num(fig.Captured()),
		BestRelativeError: num(fig.BestRelErr()), BestCaptured: num(fig.BestCaptured()),
		CoreRank: cur.CoreRank, SVD: svdLabel(svd.Exact, opts.Power),
	}
	if r, ok := fig.Ratio(); ok {
		rn := num(r)
		rep.Figures.Ratio = &rn
	} else {
		rep.Warnings = append(rep.Warnings, fmt.Sprintf("the rank-%d approximation is exact, so the error ratio is undefined", k))
	}
	for _, s := range svd.Values[:k] {
		rep.Figures.SingularValues = append(rep.Figures.SingularValues, num(s))
	}

	skips := append([]skipOut{}, make([]skipOut, 0, len(an.skips))...)
	for _, s := range an.skips {
		skips = append(skips, skipOut{Path: s.Path, Reason: s.Reason})
	}
	sort.SliceStable(skips, func(i, j int) bool { return skips[i].Path < skips[j].Path })
	rep.Skipped = skips
	return rep, nil
}

// numericalRank counts the singular values above max(m, n)·ε·σ₁.
func numericalRank(values []float64, m, n int) int {
	if len(values) == 0 || values[0] == 0 {
		return 0
	}
	tol := float64(max(m, n)) * 0x1p-52 * values[0]
	r := 0
	for _, v := range values {
		if v > tol {
			r++
		}
	}
	return r
}

func svdLabel(exact bool, power int) string {
	if exact {
		return "exact"
	}
	return fmt.Sprintf("randomized, %d power iterations", power)
}

// byPicks orders picks by draw count, most first, then by index.
func byPicks(p []selection.Pick) []selection.Pick {
	out := append([]selection.Pick(nil), p...)
	sort.SliceStable(out, func(i, j int) bool {
		if out[i].Count != out[j].Count {
			return out[i].Count > out[j].Count
		}
		return out[i].Index < out[j].Index
	})
	return out
}
