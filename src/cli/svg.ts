/**
 * A line chart as a standalone SVG document, written by hand (no chart library): axes with "nice" ticks,
 * grid lines, one polyline, a title and axis labels.
 */
export interface LineChart {
  title: string;
  xLabel: string;
  yLabel: string;
  x: ArrayLike<number>;
  y: ArrayLike<number>;
  width?: number;
  height?: number;
}

const escapeXml = (s: string): string =>
  s.replace(/&/g, '&amp;').replace(/</g, '&lt;').replace(/>/g, '&gt;').replace(/"/g, '&quot;');

/** Round tick steps of 1, 2 or 5 × 10^k covering [lo, hi] with about `count` intervals. */
export function niceTicks(lo: number, hi: number, count = 6): number[] {
  if (!(hi > lo)) {
    const pad = Math.abs(lo) > 0 ? Math.abs(lo) * 0.1 : 1;
    lo -= pad;
    hi += pad;
  }
  const raw = (hi - lo) / count;
  const mag = 10 ** Math.floor(Math.log10(raw));
  const step = [1, 2, 5, 10].map((m) => m * mag).find((s) => s >= raw) ?? 10 * mag;
  const ticks: number[] = [];
  for (let t = Math.floor(lo / step) * step; t <= hi + step * 1e-9; t += step) ticks.push(Math.abs(t) < step * 1e-9 ? 0 : t);
  if (ticks[ticks.length - 1] < hi) ticks.push(ticks[ticks.length - 1] + step);
  return ticks;
}

const label = (v: number): string => String(Number(v.toPrecision(6)));

export function lineChartSvg(c: LineChart): string {
  const W = c.width ?? 760;
  const H = c.height ?? 420;
  const m = { left: 70, right: 20, top: 40, bottom: 56 };
  const n = Math.min(c.x.length, c.y.length);
  let xMin = Infinity, xMax = -Infinity, yMin = Infinity, yMax = -Infinity;
  for (let i = 0; i < n; i++) {
    xMin = Math.min(xMin, c.x[i]);
    xMax = Math.max(xMax, c.x[i]);
    yMin = Math.min(yMin, c.y[i]);
    yMax = Math.max(yMax, c.y[i]);
  }
  const xt = niceTicks(xMin, xMax);
  const yt = niceTicks(yMin, yMax);
  const x0 = xt[0], x1 = xt[xt.length - 1], y0 = yt[0], y1 = yt[yt.length - 1];
  const px = (x: number): number => m.left + ((x - x0) / (x1 - x0)) * (W - m.left - m.right);
  const py = (y: number): number => H - m.bottom - ((y - y0) / (y1 - y0)) * (H - m.top - m.bottom);
  const f = (v: number): string => v.toFixed(2);
  const out: string[] = [];
  out.push(`<svg xmlns="http://www.w3.org/2000/svg" width="${W}" height="${H}" viewBox="0 0 ${W} ${H}" font-family="sans-serif" font-size="12">`);
  out.push(`<rect width="${W}" height="${H}" fill="white"/>`);
  out.push(`<text x="${W / 2}" y="22" text-anchor="middle" font-size="15">${escapeXml(c.title)}</text>`);
  out.push('<g stroke="#ddd" stroke-width="1">');
  for (const t of xt) out.push(`<line x1="${f(px(t))}" y1="${f(py(y0))}" x2="${f(px(t))}" y2="${f(py(y1))}"/>`);
  for (const t of yt) out.push(`<line x1="${f(px(x0))}" y1="${f(py(t))}" x2="${f(px(x1))}" y2="${f(py(t))}"/>`);
  out.push('</g>');
  out.push(`<rect x="${f(px(x0))}" y="${f(py(y1))}" width="${f(px(x1) - px(x0))}" height="${f(py(y0) - py(y1))}" fill="none" stroke="#333"/>`);
  out.push('<g text-anchor="middle">');
  for (const t of xt) out.push(`<text x="${f(px(t))}" y="${f(py(y0) + 18)}">${label(t)}</text>`);
  out.push('</g><g text-anchor="end">');
  for (const t of yt) out.push(`<text x="${f(px(x0) - 6)}" y="${f(py(t) + 4)}">${label(t)}</text>`);
  out.push('</g>');
  out.push(`<text x="${f((px(x0) + px(x1)) / 2)}" y="${H - 14}" text-anchor="middle">${escapeXml(c.xLabel)}</text>`);
  out.push(`<text transform="translate(18 ${f((py(y0) + py(y1)) / 2)}) rotate(-90)" text-anchor="middle">${escapeXml(c.yLabel)}</text>`);
  const pts: string[] = [];
  for (let i = 0; i < n; i++) pts.push(`${f(px(c.x[i]))},${f(py(c.y[i]))}`);
  out.push(`<polyline fill="none" stroke="#1f5fbf" stroke-width="1.6" points="${pts.join(' ')}"/>`);
  out.push('</svg>');
  return `${out.join('\n')}\n`;
}
