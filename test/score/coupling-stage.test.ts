// The coupling stage's flag on two demo takes of the fictional clinic (made by the project's own
// synthesizer), with the shipped model: a stiff right knee is flagged at the knee; a shorter left stance
// and step, which the discriminant's side-only class fits best, is flagged as such beside the nearest
// joint class. Tied to the shipped model's discriminant (behaviour, not a reference figure).
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';
import { SHIPPED_NORMS } from '../../src/cli/gait.js';
import { defaultModelPath } from '../../src/model/default-model.js';
import { scoreTake, type ScoreOptions } from '../../src/score/compose.js';
import { COUPLING_STAGE } from '../../src/score/coupling-stage.js';

const ROOT = fileURLToPath(new URL('../..', import.meta.url));
const options: ScoreOptions = {
  tool: 'jointloom', toolVersion: '0.0.0-test', lowpassHz: 6, steadyOnly: true,
  normsFile: SHIPPED_NORMS, normsSha256: null, model: { file: defaultModelPath(), file_sha256: 'x', used: false },
};
const couplingFlag = (name: string) => {
  const file = join(ROOT, 'demo-takes', name);
  const r = scoreTake(readFileSync(file), file, options, [COUPLING_STAGE]);
  return { flags: r.flags.filter((f) => f.stage === 'coupling'), pattern: (r.detail.coupling as { pattern?: unknown } | undefined)?.pattern };
};

describe('coupling stage flag', () => {
  it('names the joint of a joint-class take and the side-only pattern of a shorter stance', () => {
    const knee = couplingFlag('S02-1-walk.bvh');
    expect(knee.flags).toHaveLength(1);
    expect(knee.flags[0]!.text).toMatch(/: right side, around the knee$/);
    expect(knee.pattern).toBeNull();
    const stance = couplingFlag('S03-1-walk.bvh');
    expect(stance.flags).toHaveLength(1);
    expect(stance.flags[0]!.text).toMatch(/: left side, like a shorter stance \(nearest joint class: (hip|knee|ankle|shoulder\/arm)\)$/);
    expect(stance.pattern).toBe('a shorter stance');
  }, 60_000);
});
