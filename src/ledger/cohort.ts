// Building the cohort report's data from the ledger, and writing the report and its CSV.
import { join } from 'node:path';
import { cohortCsv } from '../report/cohort-csv.js';
import type { CohortData } from '../report/cohort-data.js';
import { cohortHtml } from '../report/cohort-html.js';
import { metricNames } from '../score/columns.js';
import { writeFilesAtomic } from '../util/atomic.js';
import type { Ledger } from './open.js';
import { listFailures, listScores } from './query.js';

/** Returns the cohort data of every score under `modelKey`. */
export function cohortData(db: Ledger, ledger: string, modelKey: string, toolVersion: string, generatedAt = new Date().toISOString()): CohortData {
  const m = (db.prepare('SELECT key, sha256, file, note FROM models WHERE key = ?').get(modelKey) as CohortData['model'] | undefined) ?? { key: modelKey, sha256: null, file: null, note: 'unknown model' };
  const takes = listScores(db, { modelKey }).map((r) => ({
    subject: r.subject, session: r.session, date: r.date, path: r.path, sha256: r.sha256, modelKey: r.modelKey,
    toolVersion: r.toolVersion, scoredAt: r.scoredAt, options: r.options, metrics: r.metrics, flags: r.flags,
  }));
  const known = metricNames();
  const extra = [...new Set(takes.flatMap((t) => Object.keys(t.metrics)))].filter((k) => !known.includes(k)).sort();
  return { ledger, generatedAt, toolVersion, model: m, takes, failures: listFailures(db, modelKey), metrics: [...known, ...extra] };
}

/** Writes cohort-report.html and cohort.csv into `dir`; returns their paths. */
export function writeCohortReport(data: CohortData, dir: string, caution: string): { html: string; csv: string } {
  const html = join(dir, 'cohort-report.html'), csv = join(dir, 'cohort.csv');
  writeFilesAtomic([{ path: html, data: cohortHtml(data, caution) }, { path: csv, data: cohortCsv(data.takes, data.metrics) }]);
  return { html, csv };
}
