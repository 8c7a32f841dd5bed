/**
 * The Levenberg–Marquardt iteration of a fit, from a checked problem and residuals at the
 * start to a status, with p moved in place to the best point found.
 *
 * Method: Levenberg–Marquardt as a trust-region method (J. J. Moré, "The Levenberg–Marquardt
 * algorithm: implementation and theory", in Numerical Analysis (G. A. Watson, ed.), Springer
 * LNM 630, 1977). Each iteration forms the Jacobian J and looks for the step s that
 * minimises the linear model ½‖r + J·s‖² within ‖D·s‖ ≤ Δ:
 * s = −(JᵀJ + λ·DᵀD)⁻¹·Jᵀr, with λ ≥ 0 chosen so that ‖D·s‖ ≈ Δ (within 10%, as Moré
 * allows) unless the Gauss–Newton step (λ = 0) is already shorter. The step comes from the
 * singular value decomposition of J·D⁻¹, which makes ‖D·s(λ)‖ a closed form in λ; λ is found
 * by the safeguarded Newton iteration on 1/‖D·s(λ)‖ − 1/Δ (Hebden 1973; Moré 1977), and a
 * rank-deficient J gives the minimum-norm step. The radius Δ follows the ratio ρ of the actual
 * to the predicted reduction of the sum of squares (Moré's rules): below 1/4 it shrinks by a
 * factor in [1/10, 1/2] from a quadratic interpolation along the step; above 3/4 (or on a
 * Gauss–Newton step) it becomes twice the step. A step is accepted when ρ ≥ 1e-4. The first
 * radius is ‖D·p0‖ (Moré suggests up to 100 times that; a first step no longer than the
 * parameters themselves keeps a saturating model such as b1·(1 − e^(−b2·x)) from leaping to
 * where it is flat, as from the first start of NIST's BoxBOD problem).
 *
 * Differences: with the model's accuracy eps_f known (`modelAccuracy`), the Jacobian is by
 * forward differences (step √eps_f, n model calls) while the steps are long, and by central
 * ones (2n calls, `fit-model.ts`) once an accepted step is shorter than √eps_f·‖D·p‖ (the
 * forward differences' relative error, which then steers the step as much as the model does)
 * or the iteration converges on forward differences; it then goes on, from a radius of at
 * least ‖D·p‖, until it converges on central ones. Measured on NIST Misra1a and BoxBOD from
 * their starts (`npm run bench -- fit`): 1.27 times the model runs of forward differences
 * alone, against 1.7–1.9 times with central differences throughout, with as many digits.
 *
 * Scaling D: without `scale`, Moré's running maximum of the column norms of J, which makes
 * the iteration invariant to the parameters' units; with `scale`, D = 1/scale.
 *
 * Bounds: projection with an active set (the projected Levenberg–Marquardt idea of Kanzow,
 * Yamashita & Fukushima, J. Comput. Appl. Math. 172, 2004). A parameter on a bound whose
 * gradient pushes it outwards is held fixed for the iteration; the trust-region step is taken
 * in the others, and the trial point is clipped into the box. The predicted reduction is that
 * of the clipped step, so the radius logic stays honest, and every trial point is feasible: the
 * model is never called outside the bounds, differences included. `atBound` reports the
 * parameters that end exactly on a bound.
 */
import type { CheckedInput } from './fit-input.ts';
import type { CountedModel, ForwardJacobian } from './fit-model.ts';
import type { FitStatus } from './fit-types.ts';
import { jacobiSvd } from './linear-algebra-small.ts';
import { norm2, scaledNorm, trustRegionStep } from './trust-region.ts';

const EPS = Number.EPSILON;

// Tuning constants (Moré 1977 and common practice).
/** Initial radius as a multiple of ‖D·p0‖ (Moré's "factor"; he suggests 100, we take 1: see above). */
const INITIAL_RADIUS_FACTOR = 1;
/** A trial step is accepted when actual/predicted reduction is at least this (Moré 1977). */
const ACCEPT_RATIO = 1e-4;
/** Below this ratio the radius shrinks; at or above GOOD_RATIO it grows. */
const POOR_RATIO = 0.25;
const GOOD_RATIO = 0.75;
/** Bounds of the shrink factor chosen by interpolation (Moré 1977). */
const MIN_SHRINK = 0.1;
const MAX_SHRINK = 0.5;
/** Shrink factor after a trial where the model failed. */
const FAILED_SHRINK = 0.25;
/** The statuses after which forward differences give way to central ones (an exact fit needs none). */
const CONVERGED_HERE: ReadonlySet<FitStatus> = new Set<FitStatus>(['converged-ftol', 'converged-xtol', 'converged-gtol', 'precision-limit']);
/** Rejections in a row that need no evaluation (the clipped step vanished) before giving up. */
const MAX_EMPTY_STEPS = 200;

/** Where the iteration stopped. */
export interface IterationEnd {
  readonly status: FitStatus;
  /** Residuals at p (the buffer may differ from the one passed in). */
  readonly r: Float64Array;
  /** ½·Σ r² at p. */
  readonly cost: number;
  readonly iterations: number;
  readonly rejectedSteps: number;
  /** True when `jacobian.values` holds J at the final p. */
  readonly jacobianAtP: boolean;
}

/**
 * Iterates from p (moved in place) with r = residuals at p until a stopping rule holds. Cost:
 * per iteration n + 1 (central differences: 2n + 1) or more model evaluations, an SVD of m×n (about 3·m·n² multiply-adds
 * per sweep) and O(m·n) work per trial step.
 */
export function levenbergMarquardt(
  input: CheckedInput, model: CountedModel, jacobian: ForwardJacobian, aborted: () => boolean,
  p: Float64Array, r0: Float64Array,
): IterationEnd {
  const { n, m, lower, upper, scale, maxIterations, maxEvaluations, ftol, xtol, gtol } = input;
  const jac = jacobian.values;
  let r = r0;
  let cost = 0.5 * norm2(r) ** 2;
  const d = new Float64Array(n);
  const colNorm = new Float64Array(n);
  const g = new Float64Array(n);
  const free: number[] = [];
  const pTrial = new Float64Array(n);
  let rTrial: Float64Array = new Float64Array(m);
  const step = new Float64Array(n);
  const js = new Float64Array(m);
  let delta = 0;
  let iterations = 0;
  let rejectedSteps = 0;
  let jacobianAtP = false;
  let status: FitStatus | null = null;

  // with the model's accuracy: forward differences, then central ones (see the module comment)
  const refineBelow = input.modelAccuracy === null ? 0 : Math.sqrt(input.modelAccuracy);
  stages: for (;;) {
    outer: for (;;) {
      if (cost === 0) { status = 'exact-fit'; break; }
      if (iterations >= maxIterations) { status = 'max-iterations'; break; }
      if (model.evaluations + jacobian.callsPerForm > maxEvaluations) { status = 'max-evaluations'; break; }
      const formed = jacobian.form(p, r);
      if (formed === 'cancelled') { status = 'cancelled'; break; }
      if (formed === 'failed') { status = 'model-failed-jacobian'; break; }
      jacobianAtP = true;
      iterations++;

      for (let j = 0; j < n; j++) {
        let acc = 0, gj = 0;
        for (let i = 0; i < m; i++) {
          const v = jac[i * n + j];
          acc += v * v;
          gj += v * r[i];
        }
        colNorm[j] = Math.sqrt(acc);
        g[j] = gj;
      }
      if (iterations === 1) {
        for (let j = 0; j < n; j++) d[j] = scale ? 1 / scale[j] : colNorm[j] > 0 ? colNorm[j] : 1;
        const xn = scaledNorm(d, p);
        delta = xn > 0 ? INITIAL_RADIUS_FACTOR * xn : INITIAL_RADIUS_FACTOR;
      } else if (!scale) {
        for (let j = 0; j < n; j++) d[j] = Math.max(d[j], colNorm[j]);
      }

      // Active set: a parameter on a bound with the gradient pushing it out stays there.
      free.length = 0;
      for (let j = 0; j < n; j++) {
        const pinned = (p[j] <= lower[j] && g[j] > 0) || (p[j] >= upper[j] && g[j] < 0);
        if (!pinned) free.push(j);
      }
      // Gradient test on the free parameters: |cos| of the angle between r and each column, zero at a stationary point.
      const rNorm = Math.sqrt(2 * cost);
      let gMax = 0;
      for (const j of free) if (colNorm[j] > 0) gMax = Math.max(gMax, Math.abs(g[j]) / (colNorm[j] * rNorm));
      if (gMax <= gtol) { status = 'converged-gtol'; break; }

      // SVD of the scaled free columns Ĵ = J_F·D_F⁻¹ and a = Uᵀr.
      const k = free.length;
      const jHat = new Float64Array(m * k);
      for (let i = 0; i < m; i++) for (let c = 0; c < k; c++) jHat[i * k + c] = jac[i * n + free[c]] / d[free[c]];
      const svd = jacobiSvd(jHat, m, k);
      const a = new Float64Array(k);
      for (let c = 0; c < k; c++) {
        let acc = 0;
        for (let i = 0; i < m; i++) acc += svd.u[i * k + c] * r[i];
        a[c] = acc;
      }
      const z = new Float64Array(k);
      let firstTrial = true;
      let emptySteps = 0;

      for (;;) {
        const lambda = trustRegionStep(svd.s, a, svd.v, k, delta, z);
        // Trial point: the step in the free parameters, clipped into the box.
        pTrial.set(p);
        let clipped = false;
        for (let c = 0; c < k; c++) {
          const j = free[c];
          const want = p[j] + z[c] / d[j];
          const got = Math.min(Math.max(want, lower[j]), upper[j]);
          if (got !== want) clipped = true;
          pTrial[j] = got;
        }
        for (let j = 0; j < n; j++) step[j] = pTrial[j] - p[j];
        const stepNorm = scaledNorm(d, step);
        if (iterations === 1 && firstTrial && stepNorm > 0) delta = Math.min(delta, stepNorm);
        firstTrial = false;
        // Predicted reduction of the linear model for the step actually taken.
        let gs = 0;
        for (let j = 0; j < n; j++) gs += g[j] * step[j];
        let js2 = 0;
        for (let i = 0; i < m; i++) {
          let acc = 0;
          for (let j = 0; j < n; j++) acc += jac[i * n + j] * step[j];
          js[i] = acc;
          js2 += acc * acc;
        }
        const predicted = -gs - 0.5 * js2;
        const xNorm = scaledNorm(d, p);

        if (!(stepNorm > 0) || !(predicted > 0)) {
          // Nothing to try (the clipped step vanished or does not descend): shrink and retry.
          rejectedSteps++;
          emptySteps++;
          delta = MAX_SHRINK * Math.min(delta, stepNorm > 0 ? stepNorm : delta);
          if (delta <= xtol * xNorm) { status = 'converged-xtol'; break outer; }
          if (!(delta > EPS * xNorm) || emptySteps >= MAX_EMPTY_STEPS) { status = 'precision-limit'; break outer; }
          continue;
        }
        emptySteps = 0;
        if (model.evaluations + 1 > maxEvaluations) { status = 'max-evaluations'; break outer; }
        if (aborted()) { status = 'cancelled'; break outer; }
        const ok = model.evaluate(pTrial, rTrial);
        const trialCost = ok ? 0.5 * norm2(rTrial) ** 2 : Infinity;
        const actualRel = ok ? 1 - trialCost / cost : -Infinity;
        const predictedRel = predicted / cost;
        const ratio = ok ? actualRel / predictedRel : -1;

        // Radius update (Moré 1977).
        if (ratio < POOR_RATIO) {
          let shrink: number;
          if (!ok) shrink = FAILED_SHRINK;
          else if (actualRel >= 0) shrink = MAX_SHRINK;
          else {
            // minimiser of the quadratic through cost(0), cost'(0) = gs and cost(1) along the step
            const curvature = trialCost - cost - gs;
            shrink = curvature > 0 ? -gs / (2 * curvature) : MIN_SHRINK;
            shrink = Math.min(Math.max(shrink, MIN_SHRINK), MAX_SHRINK);
          }
          delta = shrink * Math.min(delta, stepNorm);
        } else if (ratio >= GOOD_RATIO || lambda === 0) {
          delta = clipped ? Math.max(delta, 2 * stepNorm) : 2 * stepNorm;
        }

        const accepted = ok && ratio >= ACCEPT_RATIO;
        if (accepted) {
          p.set(pTrial);
          const tr = r; r = rTrial; rTrial = tr;
          cost = trialCost;
          jacobianAtP = false;
        } else {
          rejectedSteps++;
        }

        const xNormNow = scaledNorm(d, p);
        if (ok && Math.abs(actualRel) <= ftol && predictedRel <= ftol && ratio <= 2) { status = 'converged-ftol'; break outer; }
        if (delta <= xtol * xNormNow || !(delta > EPS * xNormNow)) {
          // the radius collapsed: convergence, unless it collapsed because the model kept failing
          status = !ok ? 'model-failed-steps' : delta <= xtol * xNormNow ? 'converged-xtol' : 'precision-limit';
          break outer;
        }
        if (cost === 0) { status = 'exact-fit'; break outer; }
        if (ok && Math.abs(actualRel) <= EPS && predictedRel <= EPS && ratio <= 2) { status = 'precision-limit'; break outer; }
        if (accepted) {
          // a step shorter than the forward differences' own error is steered by that error: central from here
          if (!jacobian.central && stepNorm < refineBelow * xNormNow) jacobian.refine?.();
          continue outer;
        }
      }
    }
    // converged on forward differences: go on with central ones, from a radius that allows a step again
    if (status !== null && CONVERGED_HERE.has(status) && jacobian.refine?.()) {
      status = null;
      jacobianAtP = false;
      delta = Math.max(delta, INITIAL_RADIUS_FACTOR * scaledNorm(d, p));
      continue stages;
    }
    break;
  }
  return { status: status as FitStatus, r, cost, iterations, rejectedSteps, jacobianAtP };
}
