import { Spectrum } from '../../src/core/spectrum';

/**
 * Time-domain references for the steady-state tests, independent of the harmonic method: a fixed-step RK4
 * integrator of a circuit's state equations and a shooting solve for the periodic steady state.
 */

/** x(t) = Re Σ C_n e^{jnωt} at each time, by Horner's rule in z = e^{jωt} (stable on the unit circle). */
export function sampleSpectrum(s: Spectrum, times: ArrayLike<number>): Float64Array {
  const N = s.re.length - 1;
  const w = 2 * Math.PI * s.f0;
  const out = new Float64Array(times.length);
  for (let m = 0; m < times.length; m++) {
    const zr = Math.cos(w * times[m]), zi = Math.sin(w * times[m]);
    let ar = 0, ai = 0;
    for (let n = N; n >= 1; n--) {
      const r = ar * zr - ai * zi + s.re[n];
      ai = ar * zi + ai * zr + s.im[n];
      ar = r;
    }
    out[m] = s.re[0] + (ar * zr - ai * zi); // one more factor z: the sum starts at n = 1
  }
  return out;
}

export interface LinearCircuit {
  states: number;
  /** dx/dt for state x with the source at value u, written into dx. */
  deriv(x: Float64Array, u: number, dx: Float64Array): void;
}

/** One fixed RK4 step of length h with the source held at u. */
function rk4(c: LinearCircuit, x: Float64Array, u: number, h: number, work: Float64Array[]): void {
  const [k1, k2, k3, k4, y] = work;
  const n = c.states;
  c.deriv(x, u, k1);
  for (let i = 0; i < n; i++) y[i] = x[i] + 0.5 * h * k1[i];
  c.deriv(y, u, k2);
  for (let i = 0; i < n; i++) y[i] = x[i] + 0.5 * h * k2[i];
  c.deriv(y, u, k3);
  for (let i = 0; i < n; i++) y[i] = x[i] + h * k3[i];
  c.deriv(y, u, k4);
  for (let i = 0; i < n; i++) x[i] += (h / 6) * (k1[i] + 2 * k2[i] + 2 * k3[i] + k4[i]);
}

/** Integrate one period from x0; source(k) is the source value during step k. Returns the states at every step. */
export function integratePeriod(
  c: LinearCircuit, x0: ArrayLike<number>, period: number, steps: number, source: (k: number) => number,
): Float64Array[] {
  const h = period / steps;
  const work = Array.from({ length: 5 }, () => new Float64Array(c.states));
  const x = Float64Array.from(x0);
  const path = [Float64Array.from(x)];
  for (let k = 0; k < steps; k++) {
    rk4(c, x, source(k), h, work);
    path.push(Float64Array.from(x));
  }
  return path;
}

/** Solve A·x = b (small, dense, partial pivoting); A and b are overwritten. */
function solveDense(A: number[][], b: number[]): number[] {
  const n = b.length;
  for (let c = 0; c < n; c++) {
    let p = c;
    for (let r = c + 1; r < n; r++) if (Math.abs(A[r][c]) > Math.abs(A[p][c])) p = r;
    [A[c], A[p]] = [A[p], A[c]];
    [b[c], b[p]] = [b[p], b[c]];
    for (let r = c + 1; r < n; r++) {
      const m = A[r][c] / A[c][c];
      for (let k = c; k < n; k++) A[r][k] -= m * A[c][k];
      b[r] -= m * b[c];
    }
  }
  const x = new Array<number>(n).fill(0);
  for (let r = n - 1; r >= 0; r--) {
    let s = b[r];
    for (let k = r + 1; k < n; k++) s -= A[r][k] * x[k];
    x[r] = s / A[r][r];
  }
  return x;
}

/**
 * Periodic steady state by shooting: for a linear circuit the state after one period is x(T) = Φ·x(0) + g.
 * g is one period integrated from rest, column j of Φ is one unforced period from unit state j; then
 * x(0) = (I − Φ)⁻¹·g, and the trajectory is integrated once more from there. `closure` = max |x(T) − x(0)|
 * shows that the result really repeats.
 */
export function periodicSteadyState(
  c: LinearCircuit, period: number, steps: number, source: (k: number) => number,
): { path: Float64Array[]; closure: number } {
  const n = c.states;
  const g = integratePeriod(c, new Float64Array(n), period, steps, source)[steps];
  const A: number[][] = Array.from({ length: n }, () => new Array<number>(n).fill(0));
  for (let j = 0; j < n; j++) {
    const unit = new Float64Array(n);
    unit[j] = 1;
    const col = integratePeriod(c, unit, period, steps, () => 0)[steps];
    for (let i = 0; i < n; i++) A[i][j] = (i === j ? 1 : 0) - col[i];
  }
  const x0 = solveDense(A, Array.from(g));
  const path = integratePeriod(c, x0, period, steps, source);
  let closure = 0;
  for (let i = 0; i < n; i++) closure = Math.max(closure, Math.abs(path[steps][i] - path[0][i]));
  return { path, closure };
}

/**
 * Mean of q² over the period by the trapezoid rule within each step, using that step's source value at both
 * ends, so a quantity that jumps with the source is integrated without smearing the jump.
 */
export function meanSquare(
  path: Float64Array[], source: (k: number) => number, q: (x: Float64Array, u: number) => number,
): number {
  const steps = path.length - 1;
  let s = 0;
  for (let k = 0; k < steps; k++) {
    const u = source(k);
    const a = q(path[k], u), b = q(path[k + 1], u);
    s += 0.5 * (a * a + b * b);
  }
  return s / steps;
}
