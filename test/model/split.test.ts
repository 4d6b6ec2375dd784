// The held-out split of training (src/model/split.ts): whole subjects when there are several; with one
// subject, each take's last quarter in time, so that no training window's future reaches the cut and every
// held-out forecast is made after it with its full causal history. Also: the batch builder's cache of
// stride priors gives the same bits as computing them afresh. Hand-checked step counts; invented walkers.
import { describe, expect, it } from 'vitest';
import { BatchBuilder, windowRefs } from '../../src/model/batch.js';
import { resolveModelConfig } from '../../src/model/config.js';
import { createModel } from '../../src/model/model.js';
import { heldOutSplit, sliceTrack, tailCut, HELD_OUT_TAIL } from '../../src/model/split.js';
import { prepareTraining, statsOfTakes } from '../../src/model/train.js';
import { forecastProbe } from '../../src/model/validate.js';
import { SMALL, synthTrainingTake } from './takes.js';

const config = resolveModelConfig(SMALL);

describe('held-out split', () => {
  it('holds out whole subjects when the takes hold two or more', () => {
    const takes = [1, 2, 3].map((s) => synthTrainingTake(s, 8));
    const split = heldOutSplit(takes, config, ['walker-2'], 8, 3);
    expect(split.kind).toBe('subjects');
    expect(split.valid.map((t) => t.subject)).toEqual(['walker-2']);
    expect(split.train.map((t) => t.subject)).toEqual(['walker-1', 'walker-3']);
    // Without a list: every fifth subject, at least one of two or more.
    expect(heldOutSplit(takes, config, undefined, 8, 3).validSubjects).toEqual(['walker-3']);
  });

  it('with one subject holds out the last quarter of each take in time', () => {
    const take = synthTrainingTake(5, 20);
    take.phase = Float64Array.from({ length: take.track.steps }, (_, i) => i);
    const steps = take.track.steps, cut = tailCut(take.track);
    // Hand count: 20 s at 30 Hz is 600 steps; the cut is at 600 · (1 − 0.25) = 450.
    expect(steps).toBe(600);
    expect(HELD_OUT_TAIL).toBe(0.25);
    expect(cut).toBe(450);
    const split = heldOutSplit([take], config, undefined, 8, 3);
    expect(split.kind).toBe('tail');
    const head = split.train[0]!, tail = split.valid[0]!, history = config.priorHistory;
    expect(head.track.steps).toBe(cut);
    expect(tail.track.steps).toBe(steps - (cut - history));
    // The slices are the take's own steps, phase included.
    const W = take.track.nodeCount * 3;
    expect(Array.from(tail.track.positions.subarray(0, W))).toEqual(Array.from(take.track.positions.subarray((cut - history) * W, (cut - history + 1) * W)));
    expect(tail.phase![0]).toBe(cut - history);
    // No training window's future reaches the cut.
    const ends = windowRefs(split.train, config, 1).map((r) => r.end);
    expect(Math.max(...ends) + config.forecast).toBeLessThan(cut);
    // The first held-out forecast is made at the cut, with its full history.
    const model = createModel(config, statsOfTakes(split.train, config), { seed: 1 });
    const probe = forecastProbe(model, split.valid.map((t) => t.track), { everyS: 0.5 });
    expect(probe.cases[0]!.end + (cut - history)).toBe(cut);
    expect(probe.cases.every((c) => c.end >= history)).toBe(true);
  });

  it('holds nothing out when a single take is too short for a tail and enough training windows', () => {
    const take = synthTrainingTake(6, 4);
    const split = heldOutSplit([take], config, undefined, 64, 3);
    expect(split.kind).toBe('subjects');
    expect(split.valid).toHaveLength(0);
    expect(split.train[0]!.track).toBe(take.track);
  });

  it('is the split training uses', () => {
    const ctx = prepareTraining([synthTrainingTake(5, 20)], { config: SMALL, batchSize: 8, shards: 2 });
    expect(ctx.split).toBe('tail');
    expect(ctx.validTakes).toHaveLength(1);
    expect(ctx.trainTakes[0]!.track.steps).toBe(450);
  });

  it('sliceTrack refuses steps outside the track', () => {
    const t = synthTrainingTake(7, 4).track;
    expect(() => sliceTrack(t, 0, t.steps + 1)).toThrow(RangeError);
    expect(() => sliceTrack(t, 5, 5)).toThrow(RangeError);
  });
});

describe('stride prior cache of the batch builder', () => {
  it('fills a batch from the cache with the same bits as a fresh builder', () => {
    const take = synthTrainingTake(8, 10);
    const c = resolveModelConfig({ ...SMALL, stridePrior: true, priorHistory: 90 });
    const model = createModel(c, statsOfTakes([take], c), { seed: 2 });
    const refs = [{ take: 0, end: 120, mirrored: false }, { take: 0, end: 150, mirrored: true }];
    const reused = new BatchBuilder(c, model.stats, [take], 2, model.store);
    reused.fill(refs, [0, 0]);
    reused.fill([refs[1]!, refs[0]!], [0, 0]);
    const again = Float32Array.from(reused.fill(refs, [0, 0]).prior!), againRecon = Float32Array.from(reused.batch.priorRecon!);
    const fresh = new BatchBuilder(c, model.stats, [take], 2, model.store).fill(refs, [0, 0]);
    expect(Buffer.from(again.buffer).equals(Buffer.from(Float32Array.from(fresh.prior!).buffer))).toBe(true);
    expect(Buffer.from(againRecon.buffer).equals(Buffer.from(Float32Array.from(fresh.priorRecon!).buffer))).toBe(true);
  });
});
