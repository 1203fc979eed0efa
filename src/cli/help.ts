/** Usage text of `hc` and of each command (`hc COMMAND --help`). */

export const MAIN_HELP = `hc — Harmonic Cells on the command line: evaluate HC formulas and recalculate workbooks
without Excel, with the same function table as the add-in.

Usage:
  hc eval '=FORMULA'                               evaluate one formula
  hc calc BOOK.xlsx [--sheet NAME] [--json] [--out FILE]
                                                   recalculate a workbook, print its formula cells
  hc check BOOK.xlsx [--json]                      run the workbook's Checks sheet
  hc COMMAND --help                                help for one command
  hc --version

Exit codes: 0 success; 1 a check failed (hc check); 2 usage or file error;
3 the formula's result is an error (hc eval).
`;

export const EVAL_HELP = `Usage: hc eval [--json] '=FORMULA'

Evaluates one formula in an empty workbook and prints the result:
  a number at full precision (the shortest text that reads back as the same double),
  text as is, TRUE/FALSE, or an array as tab-separated rows.
An error result prints its code and message on stderr and exits 3.
The leading "=" may be left out. Inline arrays use "," between columns and ";" between rows: {1;2;3}.

Options:
  --json   print the result as JSON ({"value": …} or {"error": "#NUM!", "message": …})

Examples:
  hc eval '=HC.VALUE("4k7")'
  hc eval '=HC.PULSE(0, 12, 0.25, 400000, 5)'
  hc eval '=HC.RMS(HC.PULSE(0, 12, 0.25, 400000, 199))'
`;

export const CALC_HELP = `Usage: hc calc BOOK.xlsx [--sheet NAME] [--json] [--out FILE]

Reads the workbook, recalculates every formula (HC functions and the standard ones) and prints each
formula cell with its value; a spilled result prints its range and rows. Saved-file prefixes
(_xldudf_ for add-in functions, _xlfn. and _xlfn._xlws. for newer built-ins) are understood.
The input file is never written.

Options:
  --sheet NAME   print only this sheet's formula cells (all sheets are still recalculated)
  --json         print JSON: {"file", "sheets", "cells": [{sheet, address, formula, value, spill?}], "warnings"}
  --out FILE     also write a recalculated copy to FILE (written to a temporary file beside it, then
                 renamed; refused if FILE is the input workbook)
`;

export const CHECK_HELP = `Usage: hc check BOOK.xlsx [--json]

Recalculates the workbook and runs its checks. The convention: a sheet named "Checks" whose first row
is a header, then one check per row:

  Label                        | Check              | Note (optional)
  Output ripple within 60 mV   | =ripple_pp<=0.06   | 0.5 % of 12 V

A check passes when its Check cell evaluates to TRUE. FALSE, an error, a number or text fails it.
Rows with neither a label nor a check are skipped.

Exit codes: 0 every check passed; 1 a check failed (each failing check is listed with its label and
value); 2 usage or file error (including a workbook with no Checks sheet or no checks).

Options:
  --json   print JSON: {"file", "passed", "failed", "checks": [{label, cell, value, pass, note}]}
`;
