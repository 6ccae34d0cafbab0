/**
 * Natural cubic spline (second derivative zero at both ends) through (x, y), x strictly ascending.
 * Second derivatives M from the usual tridiagonal system solved by the Thomas algorithm; on
 * [x_i, x_{i+1}] with h = x_{i+1} − x_i, a = (x_{i+1} − x)/h, b = 1 − a:
 *   S(x) = a·y_i + b·y_{i+1} + ((a³ − a)·M_i + (b³ − b)·M_{i+1})·h²/6
 * (e.g. Press et al., Numerical Recipes, §3.3). Two points give the straight line.
 */
export function naturalSplineSecondDerivatives(x: ArrayLike<number>, y: ArrayLike<number>): Float64Array {
  const n = x.length;
  const m = new Float64Array(n);
  if (n < 3) return m;
  const c = new Float64Array(n); // modified super-diagonal
  const d = new Float64Array(n); // modified right-hand side
  for (let i = 1; i < n - 1; i++) {
    const h0 = x[i] - x[i - 1];
    const h1 = x[i + 1] - x[i];
    const diag = 2 * (h0 + h1);
    const rhs = 6 * ((y[i + 1] - y[i]) / h1 - (y[i] - y[i - 1]) / h0);
    const denom = diag - h0 * c[i - 1];
    c[i] = h1 / denom;
    d[i] = (rhs - h0 * d[i - 1]) / denom;
  }
  for (let i = n - 2; i >= 1; i--) m[i] = d[i] - c[i] * m[i + 1];
  return m;
}

/** Value on interval i (x[i] ≤ t ≤ x[i+1]) given second derivatives m. */
export function evaluateSplineInterval(x: ArrayLike<number>, y: ArrayLike<number>, m: ArrayLike<number>, i: number, t: number): number {
  const h = x[i + 1] - x[i];
  const a = (x[i + 1] - t) / h;
  const b = 1 - a;
  return a * y[i] + b * y[i + 1] + ((a * a * a - a) * m[i] + (b * b * b - b) * m[i + 1]) * (h * h) / 6;
}
