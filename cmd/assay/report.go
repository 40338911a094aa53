package main

import (
	"fmt"
	"math"
	"runtime/debug"
	"sort"
	"time"

	"github.com/james-bowman/sparse"

	"assay/corpus"
	"assay/textproc"

	selection "assay/select"
	"assay/sparsemat"
)

// numericGCPercent is the collector's GOGC during the numerical phase.
const numericGCPercent = 20

// reportSchema versions the JSON report; bump it on any change of fields.
const reportSchema = "assay.pick/3"

// Report is everything a pick run found, in the order it is printed. The
// JSON form is documented field by field in the README.
type Report struct {
	Schema    string        `json:"schema"`
	Tool      toolInfo      `json:"tool"`
	Input     inputInfo     `json:"input"`
	Options   optionsInfo   `json:"options"`
	Exemplars []exemplarOut `json:"exemplars"`
	Terms     []termOut     `json:"terms"`
	Missed    []missedOut   `json:"missed"`
	Curve     []curveOut    `json:"curve"`
	Figures   figuresOut    `json:"figures"`
	Skipped   []skipOut     `json:"skipped"`
	Warnings  []string      `json:"warnings"`
	Timings   *timingsOut   `json:"timings,omitempty"`
	// Assignments lists every document with its exemplar, for the CSV
	// groups table; it is not part of the JSON report (it is as long as
	// the corpus).
	Assignments []assignOut `json:"-"`
	Repeat      string      `json:"repeat"`
	Caution     string      `json:"caution"`
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
	Distinct       int    `json:"documents_distinct"`
	FilesSkipped   int    `json:"files_skipped"`
	RepairedDocs   int    `json:"documents_repaired"`
	Vocabulary     int    `json:"vocabulary"`
	TermsKept      int    `json:"terms_kept"`
	NonZeros       int    `json:"nonzeros"`
	NumericalRank  int    `json:"numerical_rank_at_least"`
	RankIsComplete bool   `json:"numerical_rank_exact"`
	// Languages counts the documents read by language of analysis.
	Languages []langCount `json:"languages"`
}

// langCount is how many documents were analysed in one language.
type langCount struct {
	Language  string `json:"language"`
	Documents int    `json:"documents"`
}

type optionsInfo struct {
	Method       string   `json:"method"`
	Core         string   `json:"core"`
	TruncateCore bool     `json:"truncate_core"`
	Seed         uint64   `json:"seed"`
	Docs         int      `json:"docs"`
	Terms        int      `json:"terms"`
	Rank         int      `json:"rank"`
	Accuracy     *float64 `json:"accuracy"`
	TargetShare  *float64 `json:"target_share"`
	MinDF        int      `json:"min_df"`
	MaxDF        float64  `json:"max_df"`
	TF           string   `json:"tf"`
	IDF          string   `json:"idf"`
	Norm         string   `json:"norm"`
	MaxBytes     int64    `json:"max_bytes"`
	MinLength    int      `json:"min_length"`
	Numbers      bool     `json:"keep_numbers"`
	Stemming     bool     `json:"stemming"`
	PowerIters   int      `json:"power_iters"`
	GroupBy      string   `json:"group_by"`
	NearDup      *float64 `json:"near_dup"`
	Missed       int      `json:"missed"`
	CurveMax     int      `json:"curve_max"`
}

type exemplarOut struct {
	ID         string   `json:"id"`
	Title      string   `json:"title"`
	Picks      int      `json:"picks"`
	Weight     num      `json:"weight"`
	Score      num      `json:"score"`
	Duplicates []string `json:"duplicates"`
	// NearCopies are the documents merged with this one before picking
	// (cosine at least --near-dup), with their exact copies.
	NearCopies []string `json:"near_copies"`
	Group      groupOut `json:"group"`
	Format     string   `json:"format"`
	Language   string   `json:"language"`
	Mail       *mailOut `json:"mail,omitempty"`
}

// mailOut holds the headers of a message, for documents read from e-mail.
type mailOut struct {
	From      string `json:"from,omitempty"`
	To        string `json:"to,omitempty"`
	Cc        string `json:"cc,omitempty"`
	Date      string `json:"date,omitempty"`
	MessageID string `json:"message_id,omitempty"`
}

// mailOf returns the mail headers of a document, nil when it has none.
func mailOf(d docInfo) *mailOut {
	m := d.Meta
	if m == (corpus.Meta{}) {
		return nil
	}
	return &mailOut{From: m.From, To: m.To, Cc: m.Cc, Date: m.Date, MessageID: m.MessageID}
}

// groupOut describes the documents an exemplar stands for.
type groupOut struct {
	// Size counts the documents in the group, the exemplar and exact
	// copies included.
	Size int `json:"size"`
	// Share is the group's part of ‖A‖_F².
	Share num `json:"share"`
	// KeyTerms are the group's heaviest terms (display words).
	KeyTerms []string `json:"key_terms"`
	// Members are up to three other members, closest first.
	Members []string `json:"members"`
}

// assignOut is one document and the exemplar it is attached to.
type assignOut struct {
	ID       string
	Language string
	Exemplar string
	Score    num
	Coverage num
}

// missedOut is a document the exemplars cover least.
type missedOut struct {
	ID       string   `json:"id"`
	Title    string   `json:"title"`
	Language string   `json:"language"`
	Coverage num      `json:"coverage"`
	TopTerms []string `json:"top_terms"`
	Group    string   `json:"group"`
}

// curveOut is one point of the how-many-to-read curve.
type curveOut struct {
	Docs         int `json:"docs"`
	Captured     num `json:"captured"`
	BestCaptured num `json:"best_captured"`
}

type termOut struct {
	Term     string `json:"term"`
	Stem     string `json:"stem"`
	Language string `json:"language"`
	DF       int    `json:"df"`
	Picks    int    `json:"picks"`
	Weight   num    `json:"weight"`
	Score    num    `json:"score"`
	Coverage num    `json:"coverage"`
}

type figuresOut struct {
	Rank           int         `json:"rank"`
	FrobeniusNorm  num         `json:"frobenius_norm"`
	Documents      docsFigure  `json:"documents"`
	Joint          jointFig    `json:"joint"`
	CoreRank       int         `json:"core_rank"`
	SingularValues []num       `json:"singular_values"`
	SVD            string      `json:"svd"`
	Coverage       coverageFig `json:"coverage"`
}

// coverageFig summarises how well the exemplars cover each document.
type coverageFig struct {
	Mean   num `json:"mean"`
	Median num `json:"median"`
	// Histogram counts documents (with their exact copies) whose coverage
	// falls in [0, 0.1), [0.1, 0.2), …, [0.9, 1].
	Histogram []int `json:"histogram"`
}

type docsFigure struct {
	Count        int  `json:"count"`
	Captured     num  `json:"captured"`
	BestCaptured num  `json:"best_captured"`
	Eta          *num `json:"eta"`
}

type jointFig struct {
	RelativeError     num  `json:"relative_error"`
	Captured          num  `json:"captured"`
	BestRelativeError num  `json:"best_relative_error"`
	BestCaptured      num  `json:"best_captured"`
	Ratio             *num `json:"ratio"`
	Eta               *num `json:"eta"`
}

// timingsOut holds wall-clock seconds of each stage, with --timings only.
type timingsOut struct {
	Read num `json:"read"`
	SVD  num `json:"svd"`
	// NearCopies is the near-copy search after the reading (candidates,
	// cosines, the merged matrix and its SVD); the signatures are made
	// while reading, inside Read.
	NearCopies num `json:"near_copies"`
	// Curve is the run of curve_max picks behind the capture curve.
	Curve   num `json:"curve"`
	Select  num `json:"select"`
	Measure num `json:"measure"`
	// RandomizedSVD is one randomized SVD of rank k (q power iterations),
	// timed for comparison whatever SVD the run used.
	RandomizedSVD num `json:"randomized_svd_rank_k"`
}

func seconds(d time.Duration) num { return num(d.Seconds()) }

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

// pick runs the selection on an analysed corpus and builds the report. It
// weights an's count matrix in place (an.counts.Matrix is nil afterwards),
// so an can be picked from only once.
func pick(an *analysis, opts pickOptions, version string) (*Report, error) {
	// The numerical phase allocates few, large, pointer-free blocks, which
	// the collector frees cheaply; collecting sooner keeps the peak down
	// (bench/scale, 100,000×50,000: peak resident 476 MiB at the default
	// GOGC of 100, 453 MiB at 20, with no measurable change in time).
	defer debug.SetGCPercent(debug.SetGCPercent(numericGCPercent))
	full := sparsemat.WeightInPlace(an.counts, opts.Weight)
	m, n := full.Dims()
	rep := &Report{Schema: reportSchema, Tool: toolInfo{Name: "assay", Version: version}, Caution: cautionSampling, Warnings: []string{}}
	if sparsemat.FrobeniusSq(full) == 0 {
		return nil, fmt.Errorf("%s: every weight is zero; check the weighting options", opts.Source)
	}
	// Exact duplicates are merged before selection (figures are unchanged:
	// see sparsemat.CollapseRows), so no two picks are the same text.
	a, groups := sparsemat.CollapseRows(full)
	md, _ := a.Dims()
	survivor := func(row int) int { return row }
	if groups != nil {
		survivor = func(row int) int { return groups[row][0] }
	}

	k := opts.Rank
	if k == 0 {
		k = min(opts.Docs, opts.Terms)
	}
	docs, terms := opts.Docs, opts.Terms
	if opts.Accuracy > 0 {
		// c = r = ⌈k·ln k/ε²⌉, capped by the matrix.
		c := int(math.Ceil(float64(k) * math.Log(float64(max(k, 2))) / (opts.Accuracy * opts.Accuracy)))
		docs, terms = min(c, md), min(c, n)
		rep.Warnings = append(rep.Warnings, fmt.Sprintf("--accuracy %g sets %d document and %d term picks (⌈k·ln k/ε²⌉ = %d, capped by the matrix)", opts.Accuracy, docs, terms, c))
	}
	if lim := min(md, n); k > lim {
		rep.Warnings = append(rep.Warnings, fmt.Sprintf("rank %d lowered to %d, the smaller side of the %d×%d matrix of distinct documents", k, lim, md, n))
		k = lim
	}
	curveMax := opts.CurveMax
	if curveMax <= 0 {
		curveMax = 3 * docs
	}
	curveMax = min(curveMax, md)
	svdRank := min(selection.ReferenceRank(k, max(docs, curveMax), terms), md, n)
	if opts.TargetShare > 0 {
		svdRank = min(md, n, max(svdRank, 2*svdRank)) // room for the search below
	}
	tSVD := time.Now()
	svd, err := sparsemat.TruncatedSVD(a, sparsemat.SVDOptions{Rank: svdRank, PowerIters: opts.Power, Seed: opts.Seed})
	if err != nil {
		return nil, fmt.Errorf("reference SVD: %w", err)
	}
	svdTime := time.Since(tSVD)
	numRank := selection.NumericalRank(svd.Values, md, n)
	if numRank < k {
		rep.Warnings = append(rep.Warnings, fmt.Sprintf("rank %d lowered to %d, the numerical rank of the matrix", k, numRank))
		k = max(numRank, 1)
	}

	// Near-copies are merged for the picking only: each cluster is one
	// row carrying the cluster's share of the corpus, and no two picks may
	// be closer than the threshold. The figures, groups and coverage are
	// computed on the matrix with every document (a), so they stay honest.
	tNear := time.Now()
	nd := nearDupsOf(a, an, func(row int) int { return an.counts.Rows[survivor(row)] }, opts)
	selSVD := svd
	if nd.sel != a {
		// The picking uses at most ReferenceRank(k, docs, terms) triplets
		// of a randomized SVD (ProxyRank below; the other methods use k),
		// so a merged matrix too large for the exact SVD gets only those:
		// the triplets for the curve are on the full matrix's SVD, which
		// the figures use. An exact SVD is used whole, so it keeps the
		// full rank.
		selRank := min(svdRank, len(nd.from))
		if min(len(nd.from), n) > sparsemat.ExactLimit && opts.TargetShare == 0 {
			selRank = min(selRank, selection.ReferenceRank(k, docs, terms))
		}
		selSVD, err = sparsemat.TruncatedSVD(nd.sel, sparsemat.SVDOptions{Rank: selRank, PowerIters: opts.Power, Seed: opts.Seed})
		if err != nil {
			return nil, fmt.Errorf("SVD of the merged matrix: %w", err)
		}
		if opts.TargetShare == 0 {
			// Only the full matrix's values are needed from here on
			// (figures and curve); its vectors can go.
			svd.U, svd.V = nil, nil
		}
		rep.Warnings = append(rep.Warnings, fmt.Sprintf("%d near-copies merged into %d clusters before picking (cosine ≥ %g)", nd.copies, len(nd.clusters), opts.NearDup))
	}
	nearTime := time.Since(tNear)
	selOpts := selection.Options{
		Method: selection.Method(opts.Method), Rows: docs, Cols: terms, Rank: min(k, len(selSVD.Values)), Seed: opts.Seed,
		Core: selection.Core(opts.Core), SVD: selSVD, PowerIters: 1, MaxCosine: opts.NearDup,
	}
	if !selSVD.Exact {
		// A randomized SVD sized for the curve holds more triplets than
		// the main run needs; greedy's steps cost in proportion to the
		// triplets it uses, so it uses as many as the main run alone would
		// have (the same for the curve's run, so that the main picks stay
		// the curve's first ones). An exact SVD costs nothing more to use
		// whole.
		selOpts.ProxyRank = selection.ReferenceRank(k, docs, terms)
	}
	if opts.TruncateCore {
		selOpts.CoreRank = k
	}
	if opts.TargetShare > 0 {
		r, err := smallestDocs(a, nd, selOpts, opts.TargetShare)
		if err != nil {
			return nil, err
		}
		if r < 0 {
			rep.Warnings = append(rep.Warnings, fmt.Sprintf("no number of documents up to %d reaches the target share %g with method %s; showing %d", md, opts.TargetShare, opts.Method, md))
			r = md
		}
		selOpts.Rows, docs = r, r
		if need := min(max(k, r, terms), md, n); need > len(svd.Values) {
			svd, err = sparsemat.TruncatedSVD(a, sparsemat.SVDOptions{Rank: need, PowerIters: opts.Power, Seed: opts.Seed})
			if err != nil {
				return nil, fmt.Errorf("reference SVD: %w", err)
			}
			if nd.sel == a {
				selSVD, selOpts.SVD = svd, svd
			}
		}
	}
	// The curve: the first t of curveMax picks, for t = 1 … curveMax, with
	// the same singular triplets as the main run (so for greedy the main
	// run's picks are the first docs of these).
	tCurve := time.Now()
	curveOpts := selOpts
	curveOpts.Rows, curveOpts.Cols = curveMax, 1
	// The curve needs the picked rows only (PrefixShares); no method's
	// picks depend on the core, so the curve's run gets the cheap one
	// (the optimal core of curve_max rows is a QR of an n×curve_max matrix).
	curveOpts.Core, curveOpts.CoreRank = selection.CoreIntersection, 0
	curveCur, err := nd.pick(a, curveOpts)
	if err != nil {
		return nil, fmt.Errorf("curve: %w", err)
	}
	curve := selection.PrefixShares(a, curveCur)
	curveCur = nil
	curveTime := time.Since(tCurve)

	tSelect := time.Now()
	// Hand Select the only reference to the singular vectors: it drops it
	// once the picks are made, so they can be freed before the core is
	// built. The figures need only the values.
	final := selOpts
	final.SVD = &sparsemat.SVD{Values: selSVD.Values, U: selSVD.U, V: selSVD.V, Exact: selSVD.Exact}
	svd.U, svd.V, selSVD.U, selSVD.V, selOpts.SVD = nil, nil, nil, nil, nil
	cur, err := nd.pick(a, final)
	if err != nil {
		return nil, fmt.Errorf("pick: %w", err)
	}
	selectTime := time.Since(tSelect)
	tMeasure := time.Now()
	q := selection.Measure(a, cur, svd, k)
	if opts.Timings {
		rep.Timings = &timingsOut{SVD: seconds(svdTime), NearCopies: seconds(nearTime), Curve: seconds(curveTime), Select: seconds(selectTime), Measure: seconds(time.Since(tMeasure))}
		tRand := time.Now()
		if _, err := sparsemat.TruncatedSVD(a, sparsemat.SVDOptions{Rank: k, PowerIters: opts.Power, Seed: opts.Seed, Randomized: true}); err == nil {
			rep.Timings.RandomizedSVD = seconds(time.Since(tRand))
		}
	}

	resolved := opts
	resolved.Rank = k
	resolved.MinDF = an.minDF
	resolved.CurveMax = curveMax
	rep.Repeat = resolved.command(opts.Source == demoSource)
	rep.Options = optionsInfo{
		Method: opts.Method, Core: opts.Core, TruncateCore: opts.TruncateCore, Seed: opts.Seed, Docs: docs, Terms: terms, Rank: k,
		Accuracy: optFloat(opts.Accuracy), TargetShare: optFloat(opts.TargetShare),
		MinDF: an.minDF, MaxDF: opts.MaxDF, TF: string(opts.Weight.TF), IDF: string(opts.Weight.IDF), Norm: string(opts.Weight.Norm),
		MaxBytes: opts.MaxBytes, MinLength: opts.MinLen, Numbers: opts.Numbers, Stemming: !opts.NoStem, PowerIters: opts.Power,
		GroupBy: opts.GroupBy, Missed: opts.Missed, CurveMax: curveMax,
		NearDup: optFloat(opts.NearDup),
	}
	repaired := 0
	for _, d := range an.docs {
		if d.Repaired > 0 {
			repaired++
		}
	}
	rep.Input = inputInfo{
		Source: opts.Source, Fingerprint: an.fingerprint,
		DocumentsRead: len(an.docs), DocumentsUsed: m, Distinct: md, FilesSkipped: len(an.skips), RepairedDocs: repaired,
		Vocabulary: an.counts.VocabularySize, TermsKept: n, NonZeros: full.NNZ(),
		NumericalRank: numRank, RankIsComplete: svd.Exact,
		Languages: languageCounts(an.docs),
	}

	ex, err := selection.Explain(a, cur, selection.GroupRule(opts.GroupBy))
	if err != nil {
		return nil, err
	}
	v := view{an: an, a: a, groups: groups, survivor: survivor}
	gs := v.groupsOf(cur, ex)
	for _, p := range byPicks(cur.Rows) {
		d := an.docs[an.counts.Rows[survivor(p.Index)]]
		e := exemplarOut{ID: d.ID, Title: d.Title, Picks: p.Count, Weight: num(p.Weight), Score: num(p.Score), Duplicates: v.copies(p.Index), Format: d.Format, Language: string(d.Lang), Mail: mailOf(d)}
		e.Group = gs[pickPos(cur.Rows, p.Index)]
		e.NearCopies = v.nearCopies(nd.clusterOf[p.Index])
		rep.Exemplars = append(rep.Exemplars, e)
	}
	colIdx := make([]int, len(cur.Cols))
	for i, p := range cur.Cols {
		colIdx[i] = p.Index
	}
	termCov := selection.TermCoverage(a, cur, colIdx)
	for _, p := range byPicks(cur.Cols) {
		term := an.counts.Terms[p.Index]
		lang, stem := textproc.SplitTerm(term)
		rep.Terms = append(rep.Terms, termOut{
			Term: an.display.Form(term), Stem: stem, Language: string(lang), DF: an.counts.DF[p.Index], Picks: p.Count,
			Weight: num(p.Weight), Score: num(p.Score), Coverage: num(termCov[pickPos(cur.Cols, p.Index)]),
		})
	}
	rep.Missed = v.missed(cur, ex, opts.Missed)
	rep.Assignments = v.assignments(cur, ex)
	for t, share := range curve {
		rep.Curve = append(rep.Curve, curveOut{Docs: t + 1, Captured: num(share), BestCaptured: num(sumSq(svd.Values, t+1) / q.NormSq)})
	}

	rep.Figures = figuresOut{
		Rank: k, FrobeniusNorm: num(math.Sqrt(q.NormSq)),
		Documents: docsFigure{Count: q.DocsCount, Captured: num(q.DocsShare()), BestCaptured: num(q.DocsBestShare())},
		Joint: jointFig{
			RelativeError: num(q.RelErr()), Captured: num(q.Captured()),
			BestRelativeError: num(q.BestRelErr()), BestCaptured: num(q.BestCaptured()),
		},
		CoreRank: cur.CoreRank, SVD: svdLabel(svd.Exact, opts.Power),
		Coverage: v.coverage(ex),
	}
	if v, ok := q.EtaDocs(); ok {
		rep.Figures.Documents.Eta = numPtr(v)
	}
	if v, ok := q.Ratio(); ok {
		rep.Figures.Joint.Ratio = numPtr(v)
	} else {
		rep.Warnings = append(rep.Warnings, fmt.Sprintf("the rank-%d approximation is exact, so the error ratio is undefined", k))
	}
	if v, ok := q.Eta(); ok {
		rep.Figures.Joint.Eta = numPtr(v)
	}
	for _, s := range svd.Values {
		rep.Figures.SingularValues = append(rep.Figures.SingularValues, num(s))
	}

	skips := make([]skipOut, 0, len(an.skips))
	for _, s := range an.skips {
		skips = append(skips, skipOut{Path: s.Path, Reason: s.Reason})
	}
	sort.SliceStable(skips, func(i, j int) bool { return skips[i].Path < skips[j].Path })
	rep.Skipped = skips
	return rep, nil
}

// smallestDocs finds the smallest number of documents whose picks capture
// the target share of the corpus, by bisection over r (it assumes the
// share grows with r, as it does for the greedy, pivot and top methods up
// to rounding, and checks the answer it returns). It returns -1 when even
// every document falls short.
func smallestDocs(a *sparse.CSR, nd nearDups, opts selection.Options, target float64) (int, error) {
	m, _ := nd.sel.Dims()
	total := sparsemat.FrobeniusSq(a)
	share := func(r int) (float64, error) {
		o := opts
		o.Rows = r
		cur, err := nd.pick(a, o)
		if err != nil {
			return 0, err
		}
		return selection.RowSpaceSq(a, cur) / total, nil
	}
	hi := m
	s, err := share(hi)
	if err != nil {
		return 0, err
	}
	if s < target {
		return -1, nil
	}
	lo := 0 // share(lo) < target, share(hi) ≥ target
	for hi-lo > 1 {
		mid := (lo + hi) / 2
		s, err := share(mid)
		if err != nil {
			return 0, err
		}
		if s >= target {
			hi = mid
		} else {
			lo = mid
		}
	}
	return hi, nil
}

func numPtr(v float64) *num {
	n := num(v)
	return &n
}

func optFloat(v float64) *float64 {
	if v <= 0 {
		return nil
	}
	return &v
}

// languageCounts counts the documents by language, most first (ties by
// name).
func languageCounts(docs []docInfo) []langCount {
	n := map[string]int{}
	for _, d := range docs {
		n[string(d.Lang)]++
	}
	out := make([]langCount, 0, len(n))
	for l, c := range n {
		out = append(out, langCount{Language: l, Documents: c})
	}
	sort.Slice(out, func(i, j int) bool {
		if out[i].Documents != out[j].Documents {
			return out[i].Documents > out[j].Documents
		}
		return out[i].Language < out[j].Language
	})
	return out
}

func svdLabel(exact bool, power int) string {
	if exact {
		return "exact"
	}
	return fmt.Sprintf("randomized, %d power iterations", power)
}

// byPicks orders picks by draw count, most first, then in the order the
// method chose them.
func byPicks(p []selection.Pick) []selection.Pick {
	out := append([]selection.Pick(nil), p...)
	sort.SliceStable(out, func(i, j int) bool {
		if out[i].Count != out[j].Count {
			return out[i].Count > out[j].Count
		}
		return out[i].Order < out[j].Order
	})
	return out
}
