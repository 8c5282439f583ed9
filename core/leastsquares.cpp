#include "core/leastsquares.h"

#include <stdexcept>

namespace cb {

LeastSquaresFit leastSquares(const Eigen::MatrixXd &x, const Eigen::VectorXd &y) {
  if (x.rows() != y.size())
    throw std::invalid_argument("least squares: X and y have different numbers of rows");
  LeastSquaresFit fit;
  if (x.rows() == 0 || x.cols() == 0) {
    fit.coefficients = Eigen::VectorXd::Zero(x.cols());
    fit.residualSumOfSquares = y.squaredNorm();
    return fit;
  }
  Eigen::ColPivHouseholderQR<Eigen::MatrixXd> qr(x);
  fit.rank = qr.rank();
  fit.coefficients = qr.solve(y);
  fit.residualSumOfSquares = (y - x * fit.coefficients).squaredNorm();
  return fit;
}

} // namespace cb
