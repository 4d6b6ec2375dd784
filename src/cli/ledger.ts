// `jointloom ledger history|export|report|forget|merge`: reading, exporting, forgetting and merging ledgers.
import type { Command } from 'commander';
import { cohortData, writeCohortReport } from '../ledger/cohort.js';
import { checkOutputFolder } from '../ledger/batch.js';
import { forgetSubject } from '../ledger/forget.js';
import { TREND_METRICS, subjectHistory, type SubjectHistory } from '../ledger/history.js';
import { mergeLedgers } from '../ledger/merge.js';
import { InputError } from '../errors/index.js';
import { DEFAULT_LEDGER, openLedger } from '../ledger/open.js';
import { listScores, modelKeysByRecency } from '../ledger/query.js';
import { cohortCsv } from '../report/cohort-csv.js';
import { metricLabel, metricNames } from '../score/columns.js';
import { CAUTION } from './caution.js';
import { VERSION, emit, newCommand } from './program.js';

const ledgerOption = ['--ledger <file>', `ledger file (default ./${DEFAULT_LEDGER})`, DEFAULT_LEDGER] as const;
const fx = (v: number | null, d = 3) => (v === null ? '–' : String(+v.toFixed(d)));

/** Returns the history as a text table: session means, changes, and the MDC95 that a change must pass. */
export function historyText(h: SubjectHistory): string {
  const lines = [`subject ${h.subject}: ${h.sessions.length} sessions, model ${h.modelKey}${h.otherModels.length ? ` (scores of other models left out: ${h.otherModels.join(', ')})` : ''}`];
  for (const m of TREND_METRICS) {
    const rel = h.reliability[m]!;
    if (h.sessions.every((s) => s.values[m]!.mean === null)) continue;
    lines.push(`  ${metricLabel(m)}  (MDC95 ${rel.mdc95 === null ? 'unknown: needs a session with two or more takes' : fx(rel.mdc95)})`);
    for (const s of h.sessions) {
      const v = s.values[m]!;
      const ch = v.change === null ? '' : `  change ${v.change >= 0 ? '+' : ''}${fx(v.change)}${v.beyondMdc ? '  beyond MDC95' : v.beyondMdc === false ? '  within MDC95' : ''}`;
      lines.push(`    session ${s.label}${s.date ? ` (${s.date})` : ''}: ${fx(v.mean)} from ${v.n} take${v.n === 1 ? '' : 's'}${ch}`);
    }
  }
  return lines.join('\n');
}

/** Registers `ledger` and its sub-commands on the program. */
export function register(program: Command): void {
  const cmd = newCommand('ledger').description(`read, export, forget and merge batch ledgers (SQLite; default ./${DEFAULT_LEDGER})`);
  cmd.addCommand(newCommand('history')
    .description('trend of a subject\'s key numbers across sessions; a change is flagged only beyond the minimal detectable change (MDC95 = 1.96 × √2 × SEM, SEM from repeated takes within sessions), and only between scores of one model')
    .argument('<subject>', 'subject code')
    .option(...ledgerOption)
    .option('--model <key>', 'model key (model file SHA-256, or "none"; default: the model of the latest score)')
    .option('--json', 'machine-readable output')
    .action((subject: string, f: { ledger: string; model?: string; json?: boolean }) => {
      const db = openLedger(f.ledger, { mustExist: true });
      try {
        const h = subjectHistory(db, subject, f.model);
        emit(f.json ? JSON.stringify(h) : historyText(h));
      } finally { db.close(); }
    }));
  cmd.addCommand(newCommand('export')
    .description('every score as CSV: subject, session, take, take SHA-256, model, tool version, options and each score column')
    .requiredOption('--csv <file>', 'CSV file to write (- for stdout)')
    .option(...ledgerOption)
    .option('--model <key>', 'only scores of this model key')
    .action((f: { ledger: string; csv: string; model?: string }) => {
      const db = openLedger(f.ledger, { mustExist: true });
      try {
        const rows = listScores(db, f.model === undefined ? {} : { modelKey: f.model });
        const known = metricNames();
        const extra = [...new Set(rows.flatMap((r) => Object.keys(r.metrics)))].filter((k) => !known.includes(k)).sort();
        emit(cohortCsv(rows, [...known, ...extra]), f.csv);
      } finally { db.close(); }
    }));
  cmd.addCommand(newCommand('report')
    .description('write the cohort report (cohort-report.html and cohort.csv) of one model\'s scores')
    .requiredOption('--out <dir>', 'folder to write into')
    .option(...ledgerOption)
    .option('--model <key>', 'model key (model file SHA-256, or "none"; default: the model of the latest score)')
    .action((f: { ledger: string; out: string; model?: string }) => {
      checkOutputFolder(f.out);
      const db = openLedger(f.ledger, { mustExist: true });
      try {
        const keys = modelKeysByRecency(db);
        if (!keys.length) throw new InputError(`${f.ledger}: the ledger holds no scores yet; run jointloom batch first.`);
        const key = f.model ?? keys[0]!;
        if (!keys.includes(key)) throw new InputError(`${f.ledger}: no scores under model ${key}; the ledger holds ${[...keys].sort().join(', ')}.`);
        const r = writeCohortReport(cohortData(db, f.ledger, key, VERSION), f.out, CAUTION);
        emit(`cohort report: ${r.html}; CSV: ${r.csv}`);
      } finally { db.close(); }
    }));
  cmd.addCommand(newCommand('forget')
    .description('remove every row of a subject (takes, sessions, scores, failures) and compact the file (VACUUM) so the data does not linger')
    .argument('<subject>', 'subject code')
    .option(...ledgerOption)
    .action((subject: string, f: { ledger: string }) => {
      const db = openLedger(f.ledger, { mustExist: true });
      try {
        const n = forgetSubject(db, subject);
        emit(`forgot subject ${subject}: ${n.takes} takes, ${n.sessions} sessions, ${n.scores} scores, ${n.failures} failures removed; file compacted.`);
      } finally { db.close(); }
    }));
  cmd.addCommand(newCommand('merge')
    .description('combine ledgers (e.g. the shards of one batch) into one; a take scored under the same model in several keeps its first score')
    .argument('<ledgers...>', 'ledger files to read (left unchanged)')
    .requiredOption('-o, --out <file>', 'ledger to write (created when missing)')
    .action((inputs: string[], f: { out: string }) => {
      const c = mergeLedgers(inputs, f.out);
      emit(`merged ${c.inputs} ledgers into ${f.out}: ${c.scores} scores added, ${c.already} already there, ${c.failures} failures carried.`);
    }));
  for (const c of cmd.commands) c.exitOverride(); // usage errors of sub-commands reach runProgram too
  program.addCommand(cmd);
}
