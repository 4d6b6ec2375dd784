// Bias corrections of the event detectors, in seconds added to each raw detection.
//
// How they were obtained: scripts/calibrate-events.ts detects events with no correction on a fixed
// synthetic cohort (src/synth walker, seeds 1000-1039, straight walking at 120 Hz, a spread of heights,
// speeds and cadences, a few one-sided impairments), matches them to the walker's ground-truth events,
// and takes minus the robust mean error (mean of the central 80 %, sub-frame) per event kind and method.
// Bias in seconds, so it carries across frame rates. Refit with:
//
//   npx tsx scripts/calibrate-events.ts --write
//
// The numbers below are that script's output; they depend only on the detector and the walker model.

/** Seconds added to the coordinate method's initial contact (heel farthest forward of the pelvis). */
export const CONTACT_BIAS_S = 0.025;
/** Seconds added to the coordinate method's toe-off (toe farthest behind the pelvis). */
export const TOE_OFF_BIAS_S = -0.0123;
/** Seconds added to the foot-velocity cross-check's initial contact. */
export const CONTACT_CHECK_BIAS_S = -0.0145;
/** Seconds added to the foot-velocity cross-check's toe-off. */
export const TOE_OFF_CHECK_BIAS_S = 0.0203;
