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
// # Squared-norm sampling
//
// [SquaredNorm] is the classic sampling method: column j is drawn with
// probability p_j = ‖A(:,j)‖² / ‖A‖_F², c times independently with
// replacement, and each drawn column is scaled by 1/√(c·p_j); rows likewise
// with r draws (Drineas, Kannan and Mahoney, "Fast Monte Carlo algorithms
// for matrices III: computing a compressed approximate matrix
// decomposition", SIAM J. Comput. 36(1), 2006). A column drawn t times
// appears once, scaled by √t/√(c·p_j), which leaves C·Cᵀ unchanged. W is the
// intersection of the picked rows and columns, with both scalings, and
// U = W⁺, the Moore–Penrose pseudo-inverse (Penrose, 1955) computed from
// the SVD of W with the reciprocals of singular values above
// max(rows, cols)·ε·σ_max and zero below (ε = 2⁻⁵², the tolerance numpy's
// matrix_rank uses).
//
// Rows of an L2-normalised TF-IDF matrix all have norm 1, so squared-norm
// row sampling is uniform over the documents.
//
// # Measuring
//
// [ErrorSq] computes ‖A − CUR‖_F² without forming any m×n matrix, by
// expanding the square:
//
//	‖A − CUR‖² = ‖A‖² − 2⟨CᵀARᵀ, U⟩ + ⟨CᵀC · U · RRᵀ, U⟩
//
// where every matrix on the right is c×c, r×r or c×r, and A·Rᵀ is one
// sparse-times-dense product. [Figures] sets the result beside the best
// rank-k error ‖A − A_k‖² = ‖A‖² − Σ_{i≤k} σ_i² (Eckart and Young, 1936).
//
// # Determinism
//
// Randomness comes only from the seed in [Options]; the same matrix,
// options and seed give the same picks and the same bits on any machine
// with the same floating-point arithmetic, for any GOMAXPROCS.
package selection
