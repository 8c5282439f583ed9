// Ordinary least squares with Eigen, for the regression forecast (and anyone needing OLS).
#pragma once

#include <Eigen/Dense>

namespace cb {

/// Result of an ordinary least-squares fit y ≈ X β.
struct LeastSquaresFit {
  Eigen::VectorXd coefficients; ///< β, one per column of X (0 for columns dropped as collinear)
  Eigen::Index rank = 0;        ///< numerical rank of X
  double residualSumOfSquares = 0.0;
};

/// Minimises ‖y − Xβ‖² by column-pivoting Householder QR, which stays accurate when columns are
/// nearly collinear (a weekday that never occurs in a short training window, a flat STLY
/// column). For a rank-deficient X the coefficients are a basic solution: columns the QR found
/// dependent get 0. Example: `auto fit = cb::leastSquares(X, y); double b1 = fit.coefficients(1);`
/// Throws std::invalid_argument when X.rows() != y.size().
LeastSquaresFit leastSquares(const Eigen::MatrixXd &x, const Eigen::VectorXd &y);

} // namespace cb
