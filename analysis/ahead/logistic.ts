import { CholeskyDecomposition, Matrix } from "ml-matrix";

/**
 * A logistic regression fitted on standardised features: coefficients apply to
 * (x - mean) / scale, so the ridge penalty treats every feature alike and a
 * feature's contribution to one row's log-odds is coefficient x standardised value.
 */
export interface LogisticModel {
  intercept: number;
  coefficients: number[];
  means: number[];
  scales: number[];
  iterations: number;
  converged: boolean;
}

export interface LogisticOptions {
  /** L2 penalty on the standardised coefficients (never on the intercept). 0 = plain maximum likelihood. */
  ridge?: number;
  /** Case weights (a row standing for that many identical cases); default 1 each. */
  weights?: readonly number[];
  maxIterations?: number;
  /** Stop when no coefficient moves by more than this in one Newton step. */
  tolerance?: number;
  /** Coefficients to start from (a fit on nearly the same rows), which saves iterations. */
  start?: LogisticModel;
}

const sigmoid = (eta: number) => (eta >= 0 ? 1 / (1 + Math.exp(-eta)) : Math.exp(eta) / (1 + Math.exp(eta)));

function standardisation(rows: readonly (readonly number[])[], weights: readonly number[] | undefined, width: number) {
  const means = new Array<number>(width).fill(0);
  const scales = new Array<number>(width).fill(0);
  let total = 0;
  rows.forEach((row, i) => {
    const w = weights?.[i] ?? 1;
    total += w;
    for (let j = 0; j < width; j++) means[j]! += w * row[j]!;
  });
  for (let j = 0; j < width; j++) means[j]! /= total;
  rows.forEach((row, i) => {
    const w = weights?.[i] ?? 1;
    for (let j = 0; j < width; j++) scales[j]! += w * (row[j]! - means[j]!) ** 2;
  });
  // A constant feature keeps scale 1: its standardised value is 0 everywhere and the penalty holds it at 0.
  for (let j = 0; j < width; j++) scales[j] = Math.sqrt(scales[j]! / total) || 1;
  return { means, scales };
}

/**
 * Penalised maximum likelihood by iteratively reweighted least squares
 * (Newton-Raphson on the log-likelihood, with step halving when a step would
 * lower the penalised likelihood). Each step solves the p x p system with
 * ml-matrix's Cholesky decomposition.
 */
export function fitLogistic(rows: readonly (readonly number[])[], outcomes: readonly number[], options: LogisticOptions = {}): LogisticModel {
  if (rows.length === 0) throw new Error("no rows to fit");
  if (rows.length !== outcomes.length) throw new Error("rows and outcomes differ in length");
  const width = rows[0]!.length;
  const ridge = options.ridge ?? 1;
  const weights = options.weights;
  const maxIterations = options.maxIterations ?? 50;
  const tolerance = options.tolerance ?? 1e-8;
  const { means, scales } = standardisation(rows, weights, width);
  const size = width + 1;
  const z = rows.map((row) => {
    const out = new Float64Array(size);
    out[0] = 1;
    for (let j = 0; j < width; j++) out[j + 1] = (row[j]! - means[j]!) / scales[j]!;
    return out;
  });

  let beta = new Float64Array(size);
  if (options.start && options.start.coefficients.length === width) {
    // Re-express the earlier fit on this standardisation.
    const s = options.start;
    let intercept = s.intercept;
    for (let j = 0; j < width; j++) {
      const raw = s.coefficients[j]! / s.scales[j]!;
      beta[j + 1] = raw * scales[j]!;
      intercept += raw * (means[j]! - s.means[j]!);
    }
    beta[0] = intercept;
  }

  const pass = (b: Float64Array) => {
    let logLikelihood = 0;
    const gradient = new Float64Array(size);
    const lower = new Float64Array(size * size);
    for (let i = 0; i < z.length; i++) {
      const zi = z[i]!;
      let eta = 0;
      for (let j = 0; j < size; j++) eta += zi[j]! * b[j]!;
      const w = weights?.[i] ?? 1;
      const mu = sigmoid(eta);
      // log(1 + e^eta) computed without overflow.
      const softplus = eta > 0 ? eta + Math.log1p(Math.exp(-eta)) : Math.log1p(Math.exp(eta));
      logLikelihood += w * (outcomes[i]! * eta - softplus);
      const residual = w * (outcomes[i]! - mu);
      const curvature = w * mu * (1 - mu);
      for (let j = 0; j < size; j++) {
        gradient[j]! += zi[j]! * residual;
        const cj = curvature * zi[j]!;
        const offset = j * size;
        for (let k = 0; k <= j; k++) lower[offset + k]! += cj * zi[k]!;
      }
    }
    for (let j = 1; j < size; j++) {
      logLikelihood -= (ridge / 2) * b[j]! ** 2;
      gradient[j]! -= ridge * b[j]!;
      lower[j * size + j]! += ridge;
    }
    // A tiny ridge on the diagonal keeps the decomposition defined when a feature never varies.
    const hessian = Array.from({ length: size }, (_, j) =>
      Array.from({ length: size }, (_, k) => (j >= k ? lower[j * size + k]! : lower[k * size + j]!) + (j === k ? 1e-10 : 0)),
    );
    return { logLikelihood, gradient, hessian };
  };

  // Each pass over the rows gives the penalised log-likelihood at the current
  // coefficients with its gradient and Hessian; a step that lowered the
  // likelihood is halved and the pass repeated from the earlier point.
  let iterations = 0;
  let converged = false;
  let accepted = -Infinity;
  let previousBeta: Float64Array | null = null;
  let lastStep: number[] | null = null;
  let stepScale = 1;
  while (iterations < maxIterations) {
    iterations++;
    const { logLikelihood, gradient, hessian } = pass(beta);
    if (previousBeta && lastStep && logLikelihood < accepted - 1e-9 * Math.abs(accepted) && stepScale > 1e-6) {
      stepScale /= 2;
      const from = previousBeta;
      const step = lastStep;
      beta = from.map((b, j) => b + stepScale * step[j]!);
      continue;
    }
    accepted = logLikelihood;
    if (lastStep && Math.max(...lastStep.map((s) => Math.abs(s * stepScale))) < tolerance) {
      converged = true;
      break;
    }
    const step = new CholeskyDecomposition(new Matrix(hessian)).solve(Matrix.columnVector(Array.from(gradient))).to1DArray();
    previousBeta = beta;
    lastStep = step;
    stepScale = 1;
    beta = beta.map((b, j) => b + step[j]!);
  }
  return { intercept: beta[0]!, coefficients: Array.from(beta.subarray(1)), means, scales, iterations, converged };
}

/** Each feature's share of one row's log-odds, relative to the fitted rows' average (standardised value x coefficient). */
export function contributions(model: LogisticModel, row: readonly number[]): number[] {
  return model.coefficients.map((c, j) => (c * (row[j]! - model.means[j]!)) / model.scales[j]!);
}

/** The fitted probability of one row. */
export function predictProbability(model: LogisticModel, row: readonly number[]): number {
  let eta = model.intercept;
  const parts = contributions(model, row);
  for (const part of parts) eta += part;
  return sigmoid(eta);
}

/** The fit on the features' own scales: log-odds = intercept + sum of slope x feature. */
export function rawCoefficients(model: LogisticModel): { intercept: number; slopes: number[] } {
  const slopes = model.coefficients.map((c, j) => c / model.scales[j]!);
  const intercept = model.intercept - slopes.reduce((sum, slope, j) => sum + slope * model.means[j]!, 0);
  return { intercept, slopes };
}
