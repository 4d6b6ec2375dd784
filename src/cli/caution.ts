// The caution every help page, report and README carries.

/** Returns the one-paragraph caution shown by --help and in every report. */
export const CAUTION =
  'Caution: jointloom is a research and quality aid, not a diagnostic device. Its results must be ' +
  'reviewed by a qualified clinician before they inform any decision about a person, and local ' +
  'regulations and data-protection rules apply to the takes you process. Use pseudonymous subject IDs.';
