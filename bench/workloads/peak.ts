/**
 * `peak`: HC.PEAK (core `peak`) of a 2,000-harmonic spectrum — the inductor current of the demo filter, a
 * continuous ripple — against the straightforward alternative: evaluate the waveform densely, at 2^20
 * (≥ 10^6) points per period by one inverse FFT with fft.js, and take the largest sample. Both values are
 * compared with a reference found independently: direct sums (one cosine per harmonic) maximised by golden
 * section around the largest local maxima of the dense samples.
 */
import FFT from 'fft.js';
import { peak } from '../../src/core/extremes-scaled';
import { response } from '../../src/core/response';
import { Spectrum } from '../../src/core/spectrum';
import { consume, LADDER, source } from '../fixtures';
import { benchLine, pair } from '../timing';

const HARMONICS = 2000;
const DENSE = 1 << 20;

/** Dense samples x(2πk/M), k = 0…M−1, by fft.js (inverse transform of the Hermitian spectrum). */
function denseSamples(s: Spectrum, f: FFT, spectrum: number[], out: number[]): void {
  const M = f.size;
  spectrum.fill(0);
  spectrum[0] = s.re[0] * M; // inverseTransform divides by M
  for (let n = 1; n < s.re.length; n++) {
    const r = 0.5 * M * s.re[n], i = 0.5 * M * s.im[n];
    spectrum[2 * n] = r;
    spectrum[2 * n + 1] = i;
    spectrum[2 * (M - n)] = r;
    spectrum[2 * (M - n) + 1] = -i;
  }
  f.inverseTransform(out, spectrum);
}

function denseMax(s: Spectrum, f: FFT, spectrum: number[], out: number[]): number {
  denseSamples(s, f, spectrum, out);
  let best = -Infinity;
  for (let k = 0; k < 2 * f.size; k += 2) if (out[k] > best) best = out[k];
  return best;
}

/** x(θ) by direct summation with compensated addition: independent of the FFTs and of extremes.ts. */
function direct(s: Spectrum, theta: number): number {
  let sum = s.re[0];
  let comp = 0;
  for (let n = 1; n < s.re.length; n++) {
    const v = s.re[n] * Math.cos(n * theta) - s.im[n] * Math.sin(n * theta);
    const u = sum + v;
    comp += Math.abs(sum) >= Math.abs(v) ? sum - u + v : v - u + sum;
    sum = u;
  }
  return sum + comp;
}

/** Largest value: golden section on direct sums around the 8 largest local maxima of the dense samples. */
function reference(s: Spectrum, f: FFT, spectrum: number[], out: number[]): number {
  denseSamples(s, f, spectrum, out);
  const M = f.size;
  const h = (2 * Math.PI) / M;
  const peaks: { k: number; v: number }[] = [];
  for (let k = 0; k < M; k++) {
    const v = out[2 * k];
    if (v >= out[2 * ((k + M - 1) % M)] && v >= out[2 * ((k + 1) % M)]) peaks.push({ k, v });
  }
  peaks.sort((a, b) => b.v - a.v);
  let best = -Infinity;
  const g = (Math.sqrt(5) - 1) / 2;
  for (const { k } of peaks.slice(0, 8)) {
    let a = (k - 1) * h, b = (k + 1) * h;
    let c = b - g * (b - a), d = a + g * (b - a);
    let fc = direct(s, c), fd = direct(s, d);
    for (let it = 0; it < 80; it++) {
      if (fc > fd) {
        b = d; d = c; fd = fc; c = b - g * (b - a); fc = direct(s, c);
      } else {
        a = c; c = d; fc = fd; d = a + g * (b - a); fd = direct(s, d);
      }
    }
    best = Math.max(best, fc, fd);
  }
  return best;
}

export function runPeak(log: (s: string) => void): void {
  const s = response(source(HARMONICS), LADDER, { quantity: 'I' });
  const f = new FFT(DENSE);
  const spectrum = f.createComplexArray();
  const out = f.createComplexArray();
  const ours = peak(s);
  const truncated = peak(s, { truncated: true });
  const dense = denseMax(s, f, spectrum, out);
  const ref = reference(s, f, spectrum, out);
  const rel = (x: number): string => (Math.abs(x - ref) / Math.abs(ref)).toExponential(2);
  log(`INFO peak harmonics=${HARMONICS} ours=${ours} (truncated ${truncated}) dense_2^20=${dense} reference=${ref}`);
  log(`INFO peak error_rel ours=${rel(ours)} dense=${rel(dense)} ours_at_least_as_accurate=${Math.abs(ours - ref) <= Math.abs(dense - ref)}`);
  const r = pair(() => consume(peak(s)), () => consume(denseMax(s, f, spectrum, out)), { reps: 11 });
  log(benchLine('peak', r));
}
