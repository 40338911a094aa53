// Package selection picks actual rows (documents) and columns (terms) of a
// sparse matrix and measures how well they reconstruct it: a CUR
// decomposition A ≈ C·U·R.
//
// The folder is named select, after what it does, but select is a Go
// keyword and cannot name a package, so the package clause is selection.
// Import it with an explicit name:
//
//	import selection "assay/select"
//
// # Methods
//
// [Select] runs one of five methods ([Method]):
//
//   - greedy (the default): rows are picked one at a time, each time the row
//     that adds the most to the captured share ‖A·P_S‖_F² (P_S projects on
//     the span of the rows picked so far); the denominator of each gain is
//     exact and the numerator uses the leading singular triplets as a proxy
//     of A. Columns likewise on Aᵀ. Deterministic. See greedy.go.
//   - pivot: a Gaussian sketch X = G·A with power iterations, LU with
//     partial pivoting on Xᵀ for the columns, then on C for the rows (Dong
//     and Martinsson, "Simpler is better: a comparative study of randomized
//     pivoting algorithms for CUR and interpolative decompositions", Adv.
//     Comput. Math. 49(4), 2023). Deterministic for a seed; stops cleanly
//     when the pivots reach numerical zero.
//   - top: the largest rank-k leverage scores, without repeats
//     (Papailiopoulos, Kyrillidis and Boutsidis, "Provable deterministic
//     leverage score sampling", KDD 2014).
//   - leverage: sampling with replacement with probabilities ℓ/k, where ℓ
//     are the rank-k leverage scores (squared row norms of U_k or V_k), each
//     pick scaled by 1/√(c·p) (Drineas, Mahoney and Muthukrishnan,
//     "Relative-error CUR matrix decompositions", SIAM J. Matrix Anal. Appl.
//     30(2), 2008; Mahoney and Drineas, "CUR matrix decompositions for
//     improved data analysis", PNAS 106(3), 2009).
//   - norm: the classic squared-norm sampling, p_j = ‖A(:,j)‖²/‖A‖_F², c
//     draws with replacement, each drawn column scaled by 1/√(c·p_j); rows
//     likewise (Drineas, Kannan and Mahoney, "Fast Monte Carlo algorithms
//     for matrices III", SIAM J. Comput. 36(1), 2006). Rows of an
//     L2-normalised TF-IDF matrix all have norm 1, so its row sampling is
//     uniform.
//
// For the sampling methods a row or column drawn t times appears once,
// scaled by √t/√(c·p), which leaves C·Cᵀ unchanged.
//
// # The core
//
// [CoreOptimal] (the default) sets U = C⁺·A·R⁺, the best U for the picked
// C and R, through QR factorisations of C and Rᵀ (never by inverting W);
// with [Options.CoreRank] it is truncated to that rank.
// [CoreIntersection] sets U = W⁺, the pseudo-inverse of the intersection of
// the picked rows and columns (with both scalings), with singular values at
// or below max(r, c)·ε·σ_max treated as zero (ε = 2⁻⁵², the tolerance of
// numpy's matrix_rank). On sparse TF-IDF matrices W is often rank-deficient,
// and the intersection core then reconstructs poorly.
//
// # Measuring
//
// [ErrorSq] gives ‖A − CUR‖_F² without forming any m×n matrix:
// ‖A‖² − ‖Q_Cᵀ·A·Q_R‖² for the optimal core (C·U·R is then a projection of
// A), and for the intersection core the expansion
//
//	‖A − CUR‖² = ‖A‖² − 2⟨CᵀARᵀ, U⟩ + ⟨CᵀC · U · RRᵀ, U⟩.
//
// [Measure] sets beside it the best rank-k error ‖A − A_k‖² = ‖A‖² −
// Σ_{i≤k} σ_i² (Eckart and Young, 1936), and, for the picked rows alone,
// the captured share ‖A·R⁺R‖²/‖A‖² beside the best any r-dimensional row
// space captures, Σ_{i≤r} σ_i²/‖A‖².
//
// # Determinism
//
// Randomness comes only from the seed in [Options]; the same matrix,
// options and seed give the same picks and the same bits for any
// GOMAXPROCS. Parallel loops use fixed blocks and combine them in block
// order.
package selection
