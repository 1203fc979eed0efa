/** The headless workbook engine: the HC function table in HyperFormula (GPLv3 key), for the CLI, tests and demo. */
export { createEngine, registerFunctions, settleSpills, engineContext, ENGINE_CONFIG } from './engine';
export type { EngineOptions } from './engine';
export { engineFormula, normaliseFormula, toStoredFormula } from './formula-text';
export { readWorkbook, recalculate, writeRecalculated, sameFile, cellName } from './workbook';
export type { LoadedWorkbook, FormulaCell, Recalculated } from './workbook';
export { formulaResult, plainValue, isErrorValue, spillSize } from './results';
export type { FormulaResult, PlainValue, ErrorValue } from './results';
export { a1, columnName, parseA1, parseRange, quoteSheet } from './cells';
