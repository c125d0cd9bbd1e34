/**
 * Simple linear regression with its uncertainty, and the two distributions its statements need.
 * Formulas (ordinary least squares, y = intercept + slope x; Draper and Smith, Applied Regression Analysis,
 * chapter 1; Montgomery and Runger, Applied Statistics and Probability for Engineers, chapter 11; from memory):
 *   Sxx = sum (x - xbar)^2, Sxy = sum (x - xbar)(y - ybar), slope = Sxy / Sxx, intercept = ybar - slope xbar
 *   s^2 = sum (y - intercept - slope x)^2 / (n - 2)                (residual variance, n - 2 degrees of freedom)
 *   se(slope) = sqrt(s^2 / Sxx), se(intercept) = sqrt(s^2 (1/n + xbar^2 / Sxx))
 *   se of the fitted mean at x0: s sqrt(1/n + (x0 - xbar)^2 / Sxx)
 * Student's t CDF through the regularized incomplete beta function, evaluated by its continued fraction
 * (Press et al., Numerical Recipes, "Incomplete Beta Function"; from memory).
 */
export interface LinearFit {
  n: number;
  slope: number;
  intercept: number;
  meanX: number;
  sxx: number;
  /** Residual standard deviation s; null with fewer than three points (no degrees of freedom left). */
  residualStd: number | null;
  slopeStandardError: number | null;
  interceptStandardError: number | null;
}

export function fitLinear(x: readonly number[], y: readonly number[]): LinearFit | null {
  const n = Math.min(x.length, y.length);
  if (n < 2) return null;
  let meanX = 0;
  let meanY = 0;
  for (let i = 0; i < n; i++) {
    meanX += x[i];
    meanY += y[i];
  }
  meanX /= n;
  meanY /= n;
  let sxx = 0;
  let sxy = 0;
  for (let i = 0; i < n; i++) {
    sxx += (x[i] - meanX) ** 2;
    sxy += (x[i] - meanX) * (y[i] - meanY);
  }
  if (!(sxx > 0)) return null;
  const slope = sxy / sxx;
  const intercept = meanY - slope * meanX;
  if (n < 3) return { n, slope, intercept, meanX, sxx, residualStd: null, slopeStandardError: null, interceptStandardError: null };
  let residuals = 0;
  for (let i = 0; i < n; i++) residuals += (y[i] - intercept - slope * x[i]) ** 2;
  const variance = residuals / (n - 2);
  return {
    n, slope, intercept, meanX, sxx,
    residualStd: Math.sqrt(variance),
    slopeStandardError: Math.sqrt(variance / sxx),
    interceptStandardError: Math.sqrt(variance * (1 / n + (meanX * meanX) / sxx)),
  };
}

/** Standard error of the fitted line's value at x (the mean response), null without residual degrees of freedom. */
export function fittedStandardError(fit: LinearFit, x: number): number | null {
  if (fit.residualStd === null) return null;
  return fit.residualStd * Math.sqrt(1 / fit.n + (x - fit.meanX) ** 2 / fit.sxx);
}

function logGamma(value: number): number {
  // Lanczos approximation, g = 7, n = 9 (Numerical Recipes; from memory).
  const coefficients = [0.99999999999980993, 676.5203681218851, -1259.1392167224028, 771.32342877765313, -176.61502916214059, 12.507343278686905, -0.13857109526572012, 9.9843695780195716e-6, 1.5056327351493116e-7];
  if (value < 0.5) return Math.log(Math.PI / Math.sin(Math.PI * value)) - logGamma(1 - value);
  const shifted = value - 1;
  let sum = coefficients[0];
  for (let i = 1; i < 9; i++) sum += coefficients[i] / (shifted + i);
  const t = shifted + 7.5;
  return 0.5 * Math.log(2 * Math.PI) + (shifted + 0.5) * Math.log(t) - t + Math.log(sum);
}

function betaContinuedFraction(a: number, b: number, x: number): number {
  const tiny = 1e-300;
  let c = 1;
  let d = 1 - ((a + b) * x) / (a + 1);
  if (Math.abs(d) < tiny) d = tiny;
  d = 1 / d;
  let result = d;
  for (let m = 1; m <= 300; m++) {
    const m2 = 2 * m;
    let term = (m * (b - m) * x) / ((a + m2 - 1) * (a + m2));
    d = 1 + term * d;
    if (Math.abs(d) < tiny) d = tiny;
    c = 1 + term / c;
    if (Math.abs(c) < tiny) c = tiny;
    d = 1 / d;
    result *= d * c;
    term = (-(a + m) * (a + b + m) * x) / ((a + m2) * (a + m2 + 1));
    d = 1 + term * d;
    if (Math.abs(d) < tiny) d = tiny;
    c = 1 + term / c;
    if (Math.abs(c) < tiny) c = tiny;
    d = 1 / d;
    const change = d * c;
    result *= change;
    if (Math.abs(change - 1) < 1e-15) break;
  }
  return result;
}

/** Regularized incomplete beta I_x(a, b). */
export function incompleteBeta(x: number, a: number, b: number): number {
  if (x <= 0) return 0;
  if (x >= 1) return 1;
  const front = Math.exp(logGamma(a + b) - logGamma(a) - logGamma(b) + a * Math.log(x) + b * Math.log(1 - x));
  return x < (a + 1) / (a + b + 2) ? (front * betaContinuedFraction(a, b, x)) / a : 1 - (front * betaContinuedFraction(b, a, 1 - x)) / b;
}

/** P(T <= t) for Student's t with `degrees` degrees of freedom. */
export function studentTCdf(t: number, degrees: number): number {
  const tail = 0.5 * incompleteBeta(degrees / (degrees + t * t), degrees / 2, 0.5);
  return t >= 0 ? 1 - tail : tail;
}

/** The t with P(T <= t) = probability, by bisection on the CDF (monotone, so bisection is safe). */
export function studentTQuantile(probability: number, degrees: number): number {
  if (probability === 0.5) return 0;
  let low = -1e3;
  let high = 1e3;
  for (let i = 0; i < 200; i++) {
    const middle = (low + high) / 2;
    if (studentTCdf(middle, degrees) < probability) low = middle;
    else high = middle;
  }
  return (low + high) / 2;
}

/** Standard normal CDF, from erf by Abramowitz and Stegun 7.1.26 (|error| < 1.5e-7; from memory). */
export function normalCdf(z: number): number {
  const x = Math.abs(z) / Math.SQRT2;
  const t = 1 / (1 + 0.3275911 * x);
  const erf = 1 - (((((1.061405429 * t - 1.453152027) * t + 1.421413741) * t - 0.284496736) * t + 0.254829592) * t) * Math.exp(-x * x);
  return z >= 0 ? 0.5 * (1 + erf) : 0.5 * (1 - erf);
}
