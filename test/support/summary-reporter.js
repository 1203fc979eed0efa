// Prints one plain closing line, "jest: N passed, N failed, N skipped", after jest's own summary, so a CI log
// reader that does not know jest's format still sees the counts.
class SummaryLineReporter {
  onRunComplete(_contexts, results) {
    const skipped = results.numPendingTests + results.numTodoTests;
    process.stdout.write(
      `jest: ${results.numPassedTests} passed, ${results.numFailedTests} failed, ${skipped} skipped\n`,
    );
  }
}
module.exports = SummaryLineReporter;
