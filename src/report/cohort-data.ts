// What the cohort report and CSV draw: the scored takes of one model, the failures, and provenance.
import type { ScoreFlag } from '../score/record.js';

/** One scored take in the cohort. */
export interface CohortTake {
  subject: string | null;
  session: string | null;
  date: string | null;
  path: string;
  sha256: string;
  modelKey: string;
  toolVersion: string;
  scoredAt: string;
  options: string;
  metrics: Record<string, number | null>;
  flags: ScoreFlag[];
}

/** Everything the cohort report shows. */
export interface CohortData {
  ledger: string;
  generatedAt: string;
  toolVersion: string;
  model: { key: string; sha256: string | null; file: string | null; note: string };
  takes: CohortTake[];
  failures: { path: string; reason: string; attempts: number }[];
  /** Metric columns in order (from the stages). */
  metrics: string[];
}
