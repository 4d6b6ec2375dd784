// The malformed-input table shared by malformed.test.ts. Each case names the
// place a reader of the file would point at: line and column (1-based, columns in bytes) of the
// offending token, or of the end of file for truncation; positions counted by hand on the text.

// A valid take; line numbers below are counted on this text by hand.
export const GOOD = [
  'HIERARCHY', // 1
  'ROOT Hips', // 2
  '{', // 3
  '\tOFFSET 0 0 0', // 4
  '\tCHANNELS 6 Xposition Yposition Zposition Zrotation Xrotation Yrotation', // 5
  '\tJOINT Knee', // 6
  '\t{', // 7
  '\t\tOFFSET 0 -40 0', // 8
  '\t\tCHANNELS 3 Zrotation Xrotation Yrotation', // 9
  '\t\tEnd Site', // 10
  '\t\t{', // 11
  '\t\t\tOFFSET 0 -40 0', // 12
  '\t\t}', // 13
  '\t}', // 14
  '}', // 15
  'MOTION', // 16
  'Frames: 2', // 17
  'Frame Time: 0.01', // 18
  '0 90 0 0 0 0 1 2 3', // 19
  '0 90 0 0 0 0 4 5 6', // 20
];

/** Returns GOOD with 1-based line `n` replaced by `text` (or removed when text is null), LF-joined with a final newline. */
export function edit(changes: Record<number, string | null>, finalNewline = true): string {
  const out: string[] = [];
  GOOD.forEach((l, i) => {
    const c = changes[i + 1];
    if (c === null) return;
    out.push(c === undefined ? l : c);
  });
  return out.join('\n') + (finalNewline ? '\n' : '');
}

/** Returns the first `n` lines of GOOD, each ending in a newline. */
export function head(n: number): string {
  return GOOD.slice(0, n).join('\n') + '\n';
}

export interface Case {
  name: string;
  input: string | Uint8Array;
  line: number;
  column: number;
  /** Text the error's `expected` field must contain. */
  expected: string;
  /** Text the `found` field must contain, when it matters. */
  found?: string;
  hint?: string;
}

/** Returns a root followed by `n` sibling JOINTs (4 lines each), to pass the joint-count limit. */
export function manyJoints(n: number): string {
  const parts = ['HIERARCHY\nROOT r\n{\nOFFSET 0 0 0\nCHANNELS 1 Xrotation\n'];
  for (let k = 0; k < n; k++) parts.push(`JOINT j${k}\n{\nOFFSET 0 1 0\n}\n`);
  parts.push('}\nMOTION\nFrames: 1\nFrame Time: 0.1\n0\n');
  return parts.join('');
}

export const CASES: Case[] = [
  { name: 'truncated mid-hierarchy (after an OFFSET line)', input: head(8), line: 9, column: 1, expected: '"}" to close joint "Knee"', found: 'end of file', hint: 'truncated' },
  { name: 'truncated inside an OFFSET', input: GOOD.slice(0, 7).join('\n') + '\n\t\tOFFSET 0', line: 8, column: 11, expected: 'an OFFSET number', found: 'end of file' },
  { name: 'truncated mid-frame', input: edit({ 20: '0 90 0 0' }, false), line: 20, column: 9, expected: '9 values on frame 2', found: '4 before the end of file', hint: 'truncated' },
  { name: 'truncated on a line boundary by many frames', input: edit({ 17: 'Frames: 50' }), line: 21, column: 1, expected: '50 frames as the header says', found: '2 frame lines', hint: 'truncated' },
  { name: 'truncated by two frames, no final newline', input: edit({ 17: 'Frames: 4' }, false), line: 20, column: 19, expected: '4 frames as the header says', found: '2 frame lines', hint: 'truncated' },
  { name: 'frame line with fewer values than channels', input: edit({ 19: '0 90 0 0 0 0 1 2' }), line: 19, column: 17, expected: '9 values on frame 1', found: '8' },
  { name: 'frame line with more values than channels', input: edit({ 19: '0 90 0 0 0 0 1 2 3 7' }), line: 19, column: 20, expected: '9 values on frame 1', found: 'more' },
  { name: 'non-numeric value', input: edit({ 20: '0 90 0 0 0 0 4 five 6' }), line: 20, column: 16, expected: 'a number (frame 2, value 8 of 9)', found: '"five"' },
  { name: 'number with two points', input: edit({ 19: '0 90 0 0 0 0 1.2.3 2 3' }), line: 19, column: 14, expected: 'a number (frame 1, value 7 of 9)', found: '"1.2.3"' },
  { name: 'NaN token', input: edit({ 19: '0 90 NaN 0 0 0 1 2 3' }), line: 19, column: 6, expected: 'a number (frame 1, value 3 of 9)', found: '"NaN"' },
  { name: 'inf token', input: edit({ 19: '0 90 0 inf 0 0 1 2 3' }), line: 19, column: 8, expected: 'a number (frame 1, value 4 of 9)', found: '"inf"' },
  { name: 'Infinity token', input: edit({ 20: '-Infinity 90 0 0 0 0 4 5 6' }), line: 20, column: 1, expected: 'a number (frame 2, value 1 of 9)', found: '"-Infinity"' },
  { name: 'number overflowing to infinity (1e999)', input: edit({ 19: '0 1e999 0 0 0 0 1 2 3' }), line: 19, column: 3, expected: 'a finite number', found: '"1e999"' },
  { name: 'OFFSET overflowing to infinity', input: edit({ 8: '\t\tOFFSET 0 -4e400 0' }), line: 8, column: 12, expected: 'a finite OFFSET number', found: '"-4e400"' },
  { name: 'unbalanced braces: missing close', input: edit({ 15: null }), line: 15, column: 1, expected: 'OFFSET, CHANNELS, JOINT, End Site or "}"', found: '"MOTION"' },
  { name: 'unbalanced braces: missing close at end of file', input: head(14), line: 15, column: 1, expected: '"}" to close joint "Hips"', found: 'end of file', hint: 'truncated' },
  { name: 'unbalanced braces: extra close', input: edit({ 15: '}\n}' }), line: 16, column: 1, expected: 'ROOT or MOTION after the hierarchy', found: '"}"' },
  { name: 'missing opening brace', input: edit({ 7: null }), line: 7, column: 3, expected: '"{" to open joint "Knee"', found: '"OFFSET"' },
  { name: 'missing HIERARCHY', input: edit({ 1: null }), line: 1, column: 1, expected: 'HIERARCHY', found: '"ROOT"' },
  { name: 'missing ROOT', input: 'HIERARCHY\nMOTION\nFrames: 1\nFrame Time: 0.1\n1\n', line: 2, column: 1, expected: 'ROOT after HIERARCHY', found: '"MOTION"' },
  { name: 'JOINT where ROOT belongs', input: edit({ 2: 'JOINT Hips' }), line: 2, column: 1, expected: 'ROOT after HIERARCHY', found: '"JOINT"' },
  { name: 'missing joint name', input: edit({ 2: 'ROOT' }), line: 2, column: 5, expected: 'a joint name' },
  { name: 'missing MOTION', input: edit({ 16: null }), line: 16, column: 1, expected: 'ROOT or MOTION after the hierarchy', found: '"Frames:"' },
  { name: 'missing Frames:', input: edit({ 17: null }), line: 17, column: 1, expected: '"Frames:" after MOTION', found: '"Frame"' },
  { name: 'missing Frame Time:', input: edit({ 18: null }), line: 18, column: 1, expected: '"Frame Time:"', found: '"0"' },
  { name: 'empty MOTION', input: edit({ 17: 'Frames: 0', 19: null, 20: null }), line: 19, column: 1, expected: 'at least one frame line', found: 'end of file', hint: 'MOTION section is empty' },
  { name: 'zero frame time', input: edit({ 18: 'Frame Time: 0' }), line: 18, column: 13, expected: 'a positive frame time', found: '0' },
  { name: 'zero frame time written 0.000', input: edit({ 18: 'Frame Time: 0.000' }), line: 18, column: 13, expected: 'a positive frame time', found: '0' },
  { name: 'zero frame time written -0', input: edit({ 18: 'Frame Time: -0' }), line: 18, column: 13, expected: 'a positive frame time', found: '0' },
  { name: 'zero frame time on the next line', input: edit({ 18: 'Frame Time:\n0.0' }), line: 19, column: 1, expected: 'a positive frame time', found: '0' },
  { name: 'frame time below the limit (1e-9 s)', input: edit({ 18: 'Frame Time: 1e-9' }), line: 18, column: 13, expected: 'a frame time between', found: '1e-9' },
  { name: 'frame time above the limit (61 s)', input: edit({ 18: 'Frame Time: 61' }), line: 18, column: 13, expected: 'a frame time between', found: '61' },
  { name: 'negative frame time', input: edit({ 18: 'Frame Time: -0.01' }), line: 18, column: 13, expected: 'a positive frame time', found: '-0.01' },
  { name: 'non-numeric frame time', input: edit({ 18: 'Frame Time: fast' }), line: 18, column: 13, expected: 'a frame time in seconds', found: '"fast"' },
  { name: 'text after the frame time', input: edit({ 18: 'Frame Time: 0.01 s' }), line: 18, column: 18, expected: 'the end of the Frame Time line', found: '"s"' },
  { name: 'unknown channel name', input: edit({ 9: '\t\tCHANNELS 3 Zrotation Xrotation Wrotation' }), line: 9, column: 34, expected: 'a channel name', found: '"Wrotation"' },
  { name: 'CHANNELS count greater than 6', input: edit({ 5: '\tCHANNELS 7 Xposition Yposition Zposition Zrotation Xrotation Yrotation Xrotation' }), line: 5, column: 11, expected: 'channel count', found: '7' },
  { name: 'negative CHANNELS count', input: edit({ 9: '\t\tCHANNELS -3 Zrotation Xrotation Yrotation' }), line: 9, column: 12, expected: 'a channel count from 0 to 6', found: '-3' },
  { name: 'CHANNELS count larger than the names listed', input: edit({ 9: '\t\tCHANNELS 4 Zrotation Xrotation Yrotation' }), line: 10, column: 3, expected: 'a channel name', found: '"End"', hint: 'CHANNELS 4 lists 3 names' },
  { name: 'duplicated channel', input: edit({ 9: '\t\tCHANNELS 3 Zrotation Xrotation Zrotation' }), line: 9, column: 34, expected: 'each channel once per joint', found: 'a second Zrotation' },
  { name: 'second CHANNELS line in a joint', input: edit({ 9: '\t\tCHANNELS 3 Zrotation Xrotation Yrotation\n\t\tCHANNELS 0' }), line: 10, column: 3, expected: 'one CHANNELS line per joint' },
  { name: 'missing OFFSET in a joint', input: edit({ 8: null }), line: 13, column: 2, expected: 'an OFFSET in joint "Knee"', found: '"}"' },
  { name: 'missing OFFSET in an End Site', input: edit({ 12: null }), line: 12, column: 3, expected: 'an OFFSET in the End Site', found: '"}"' },
  { name: 'OFFSET with two numbers', input: edit({ 8: '\t\tOFFSET 0 -40' }), line: 9, column: 3, expected: 'an OFFSET number', found: '"CHANNELS"' },
  { name: 'second OFFSET in a joint', input: edit({ 8: '\t\tOFFSET 0 -40 0\n\t\tOFFSET 1 2 3' }), line: 9, column: 3, expected: 'one OFFSET per joint' },
  { name: 'CHANNELS inside an End Site', input: edit({ 12: '\t\t\tOFFSET 0 -40 0\n\t\t\tCHANNELS 0' }), line: 13, column: 4, expected: 'OFFSET or "}" in an End Site', found: '"CHANNELS"' },
  { name: '"End" without "Site"', input: edit({ 10: '\t\tEnd Sight' }), line: 10, column: 7, expected: '"Site" after "End"', found: '"Sight"' },
  { name: 'unknown keyword in a joint', input: edit({ 8: '\t\tOFSET 0 -40 0' }), line: 8, column: 3, expected: 'OFFSET, CHANNELS, JOINT, End Site or "}"', found: '"OFSET"' },
  { name: 'absurd frame count (1e12 written out)', input: edit({ 17: 'Frames: 1000000000000' }), line: 17, column: 9, expected: 'a whole frame count of at most 100000000', found: '1000000000000', hint: 'absurdly large' },
  { name: 'absurd frame count (1e12 in exponent form)', input: edit({ 17: 'Frames: 1e12' }), line: 17, column: 9, expected: 'a whole frame count of at most', hint: 'absurdly large' },
  { name: 'fractional frame count', input: edit({ 17: 'Frames: 2.5' }), line: 17, column: 9, expected: 'a whole frame count', found: '2.5' },
  { name: 'frame count on the line after "Frames:"', input: edit({ 17: 'Frames:\n2.5' }), line: 18, column: 1, expected: 'a whole frame count', found: '2.5' },
  { name: 'negative frame count after trailing spaces', input: edit({ 17: 'Frames:      \n  -2' }), line: 18, column: 3, expected: 'a whole frame count', found: '-2' },
  { name: 'absurd joint count (10,001 joints)', input: manyJoints(10_000), line: 6 + 4 * 9999, column: 6, expected: 'at most 10000 joints', hint: 'absurdly large' },
  { name: 'empty file', input: '', line: 1, column: 1, expected: 'HIERARCHY', found: 'end of file' },
  { name: 'white space only', input: '\n\r\n  \t', line: 3, column: 4, expected: 'HIERARCHY', found: 'end of file' },
  { name: 'UTF-8 BOM then a misspelt keyword (column counts after the BOM)', input: '\ufeffHIERARCHX\n', line: 1, column: 1, expected: 'HIERARCHY', found: '"HIERARCHX"' },
  {
    name: 'binary file (PNG signature and zero bytes)',
    input: new Uint8Array([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a, 0, 0, 0, 0x0d, 0x49, 0x48, 0x44, 0x52, 0xff, 0xfe]),
    line: 1,
    column: 1,
    expected: 'HIERARCHY',
  },
  { name: 'binary bytes after HIERARCHY', input: new Uint8Array([...Buffer.from('HIERARCHY\n'), 0, 1, 2, 3, 0xff, 0x80, 10]), line: 2, column: 1, expected: 'ROOT after HIERARCHY' },
  { name: 'binary bytes in the frame data', input: Buffer.concat([Buffer.from(edit({ 20: null })), Buffer.from([0, 0xff, 10])]), line: 20, column: 1, expected: 'a number (frame 2, value 1 of 9)' },
];

