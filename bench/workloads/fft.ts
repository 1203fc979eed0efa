/**
 * `fft`: HC.SAMPLED's transform (core `realSpectrum`: finiteness check, real FFT of any length, scaling to peak
 * phasors) on 2^16 and on 3·2^15 samples, against fft.js's realTransform on the same data (2^16), and on 3·2^15 against
 * fft.js on the next power of two (2^17, zero-padded: not the same transform, but what a power-of-two library
 * makes a user pay). mathjs's fft, which takes any length, is timed once on 3·2^15 for reference.
 * HC.SAMPLED returns at most LIMITS.harmonics rows, so ours is asked for that many; the transform is full size.
 * The whole core call `sampled` (which first copies and checks the values) is reported on an INFO line.
 */
import FFT from 'fft.js';
import { fft as mathFft } from 'mathjs';
import { performance } from 'perf_hooks';
import { LIMITS } from '../../src/core/limits';
import { realSpectrum } from '../../src/core/fft';
import { sampled } from '../../src/core/waveforms';
import { consume, rng } from '../fixtures';
import { benchLine, pair } from '../timing';

function capture(M: number): Float64Array {
  const rand = rng(M);
  const x = new Float64Array(M);
  for (let k = 0; k < M; k++) x[k] = Math.sin((2 * Math.PI * 3 * k) / M) + 0.2 * Math.sign(Math.sin((2 * Math.PI * 40 * k) / M)) + 0.01 * (rand() - 0.5);
  return x;
}

export function runFft(log: (s: string) => void): void {
  const rate = 1e6;
  for (const [name, M, P] of [['fft_65536', 1 << 16, 1 << 16], ['fft_98304', 3 << 15, 1 << 17]] as const) {
    const x = capture(M);
    const harmonics = Math.min(M / 2, LIMITS.harmonics);
    const f = new FFT(P);
    const input = new Float64Array(P);
    input.set(x);
    const out = f.createComplexArray();
    // same data, same scale: fft.js gives X[n], ours 2·X[n]/M
    const s = sampled(x, rate, harmonics);
    if (P === M) {
      f.realTransform(out, input);
      let worst = 0;
      for (let n = 1; n <= harmonics; n++) {
        const dr = s.re[n] - (2 * out[2 * n]) / M, di = s.im[n] - (2 * out[2 * n + 1]) / M;
        worst = Math.max(worst, Math.hypot(dr, di));
      }
      log(`INFO ${name} ours vs fft.js max |difference| of the phasors = ${worst.toExponential(2)} (amplitudes up to 1)`);
    }
    const f0 = rate / M;
    const baseline = (): void => {
      f.realTransform(out, input);
      consume(out[6]);
    };
    const whole = pair(() => consume(sampled(x, rate, harmonics).re[3]), baseline, { reps: 9 });
    log(`INFO ${name} core sampled (copy and checks included) ms=${whole.oursMs.toFixed(3)} ratio=${whole.ratio.toFixed(2)}`);
    const r = pair(() => consume(realSpectrum(x, harmonics, f0).re[3]), baseline, { reps: 15 });
    log(`${benchLine(name, r)}  (baseline: fft.js realTransform on ${P === M ? 'the same' : `${P} zero-padded`} samples)`);
    if (P !== M) {
      const arr = Array.from(x);
      const t0 = performance.now();
      consume((mathFft(arr) as unknown as number[]).length);
      log(`INFO ${name} mathjs fft (any length, one run) ms=${(performance.now() - t0).toFixed(0)}`);
    }
  }
}
