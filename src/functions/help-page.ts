import { ArgSpec, FunctionSpec } from './spec';

/**
 * The add-in's help page (dist/help.html), rendered from the function table at build time so it lists exactly
 * the functions the add-in registers. Each function has an anchor #NAME, the target of its metadata helpUrl.
 * Static HTML with no script; styles come from help.css on the same origin.
 */

const escapeHtml = (s: string): string =>
  s.replace(/&/g, '&amp;').replace(/</g, '&lt;').replace(/>/g, '&gt;').replace(/"/g, '&quot;');

const RESULT_TEXT: Record<FunctionSpec['result'], string> = {
  number: 'a number',
  text: 'a text',
  matrix: 'a table that spills into the cells below and to the right',
};

/** How Excel shows the call: optional arguments in brackets, a repeating one as name1, [name2], … */
export function signature(f: FunctionSpec): string {
  const parts = f.args.map((a) => {
    if (a.repeating) return a.optional ? `[${a.name}1], …` : `${a.name}1, [${a.name}2], …`;
    return a.optional ? `[${a.name}]` : a.name;
  });
  return `HC.${f.name}(${parts.join(', ')})`;
}

function argRow(a: ArgSpec): string {
  const need = a.repeating ? 'one or more' : a.optional ? 'optional' : 'required';
  return `<tr><td><code>${escapeHtml(a.name)}</code></td><td>${need}</td><td>${escapeHtml(a.help)}</td></tr>`;
}

function section(f: FunctionSpec): string {
  const args = f.args.length
    ? `<table><thead><tr><th>Argument</th><th></th><th>Meaning</th></tr></thead><tbody>${f.args.map(argRow).join('')}</tbody></table>`
    : '<p>No arguments.</p>';
  return [
    `<section id="${f.name}">`,
    `<h2><code>${escapeHtml(signature(f))}</code></h2>`,
    `<p>${escapeHtml(f.description)}</p>`,
    args,
    `<p>Returns ${RESULT_TEXT[f.result]}.</p>`,
    `<p>Example: <code class="example">${escapeHtml(f.example)}</code></p>`,
    '</section>',
  ].join('\n');
}

export function renderHelpPage(functions: readonly FunctionSpec[]): string {
  const index = functions.map((f) => `<li><a href="#${f.name}">HC.${f.name}</a></li>`).join('\n');
  return `<!DOCTYPE html>
<html lang="en">
<head>
<meta charset="UTF-8" />
<meta http-equiv="Content-Security-Policy" content="default-src 'none'; style-src 'self'; img-src 'self'" />
<meta name="viewport" content="width=device-width, initial-scale=1" />
<title>Harmonic Cells: function reference</title>
<link rel="stylesheet" href="help.css" />
<link rel="icon" type="image/png" href="assets/icon-16.png" />
</head>
<body>
<header>
<img src="assets/icon-32.png" alt="" width="32" height="32" />
<h1>Harmonic Cells: function reference</h1>
</header>
<p>Every function lives in the <code>HC</code> namespace. Optional arguments are shown in brackets. A spectrum is a
table of rows <em>n, frequency (Hz), amplitude (peak), phase (deg)</em>, as spilled by the waveform functions.
Wrong types or shapes give <code>#VALUE!</code>, numbers out of range <code>#NUM!</code>, a missing element
<code>#N/A</code>; the cell's error message says what was wrong and what is allowed.</p>
<nav><ul class="index">
${index}
</ul></nav>
<main>
${functions.map(section).join('\n')}
</main>
</body>
</html>
`;
}
