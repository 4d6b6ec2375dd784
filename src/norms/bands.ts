// Which band of a reference a take is scored against: its own speed stratum when the reference holds it with
// enough strides, else the band of all speeds, with a note saying why.
import { GPS_MIN_STRIDES } from './build.js';
import type { BandName, NormsBand, NormsFile } from './format.js';
import { STRATUM_LABELS, stratumOf, type StratumName } from './strata.js';

/** The band chosen for a take, with its stratum and the note when it is not the take's own. */
export interface BandChoice {
  name: BandName;
  band: NormsBand;
  stratum: StratumName | null;
  note: string | null;
}

/** Returns the band a take of dimensionless speed `v` is scored against. */
export function chooseBand(norms: NormsFile, v: number | null): BandChoice {
  const all = norms.bands.all!;
  const stratum = stratumOf(v);
  if (stratum === null) return { name: 'all', band: all, stratum, note: 'the take has no usable stride speed, so it is scored against the band of all speeds.' };
  const own = norms.bands[stratum];
  if (own && own.strides >= GPS_MIN_STRIDES) return { name: stratum, band: own, stratum, note: null };
  const why = own
    ? `its ${own.strides} strides are fewer than ${GPS_MIN_STRIDES}`
    : norms.skipped_bands.some((b) => b.band === stratum) ? 'it had too few control strides' : Object.keys(norms.bands).length === 1 ? 'the reference was built without speed bands' : 'the reference holds no take at that speed';
  return { name: 'all', band: all, stratum, note: `the take walks at ${STRATUM_LABELS[stratum]} speed but the reference has no such band (${why}); scored against the band of all speeds.` };
}
