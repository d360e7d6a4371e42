// Ids of the commands the extension contributes (package.json mirrors them; a test keeps both equal).
export const commandIds = {
  /** The pair under the cursor, or one picked from the file's pairs; opens its report. */
  checkObjective: 'slopecheck.checkObjective',
  /** Args [uri, objective] from a code lens, or the pair under the cursor. */
  openReport: 'slopecheck.openReport',
  /** Args [uri] or the active editor's document. */
  checkAgain: 'slopecheck.checkAgain',
  restartServer: 'slopecheck.restartServer',
  showLog: 'slopecheck.showLog',
} as const;

/** VS Code's own page for Workspace Trust. */
export const manageTrustCommand = 'workbench.trust.manage';
