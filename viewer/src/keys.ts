// The keyboard shortcuts, one table for the handler and the help overlay alike.

export type Action =
  | 'play' | 'back' | 'forward' | 'back1s' | 'forward1s' | 'start' | 'end'
  | 'slower' | 'faster' | 'nextEvent' | 'prevEvent' | 'follow' | 'forecast' | 'pairs' | 'heat' | 'camera' | 'help' | 'close';

/** Keys (KeyboardEvent.key, with "Shift+" when shift matters), their action and help text. */
export const SHORTCUTS: readonly { keys: string[]; action: Action; text: string }[] = [
  { keys: [' '], action: 'play', text: 'play / pause' },
  { keys: ['ArrowLeft', ','], action: 'back', text: 'one frame back' },
  { keys: ['ArrowRight', '.'], action: 'forward', text: 'one frame on' },
  { keys: ['Shift+ArrowLeft'], action: 'back1s', text: 'one second back' },
  { keys: ['Shift+ArrowRight'], action: 'forward1s', text: 'one second on' },
  { keys: ['Home'], action: 'start', text: 'first frame' },
  { keys: ['End'], action: 'end', text: 'last frame' },
  { keys: ['['], action: 'slower', text: 'slower' },
  { keys: [']'], action: 'faster', text: 'faster' },
  { keys: ['n'], action: 'nextEvent', text: 'next gait event' },
  { keys: ['b'], action: 'prevEvent', text: 'previous gait event' },
  { keys: ['c'], action: 'follow', text: 'camera follows the subject on / off' },
  { keys: ['f'], action: 'forecast', text: 'forecast overlay on / off (the next second from the current time)' },
  { keys: ['p'], action: 'pairs', text: 'pair lines and legend on / off' },
  { keys: ['g'], action: 'heat', text: 'pair-line colour: distance spread, static coupling, dynamic factors at this time' },
  { keys: ['r'], action: 'camera', text: 'reset the camera' },
  { keys: ['?', 'h'], action: 'help', text: 'this list' },
  { keys: ['Escape'], action: 'close', text: 'close this list' },
];

const LABEL: Record<string, string> = { ' ': 'Space', ArrowLeft: '←', ArrowRight: '→', 'Shift+ArrowLeft': 'Shift ←', 'Shift+ArrowRight': 'Shift →', Escape: 'Esc' };

/** Returns the action bound to a key event, or null. */
export function actionOf(e: { key: string; shiftKey: boolean; ctrlKey: boolean; metaKey: boolean; altKey: boolean }): Action | null {
  if (e.ctrlKey || e.metaKey || e.altKey) return null;
  const key = e.key.length === 1 ? e.key.toLowerCase() : e.key;
  const withShift = e.shiftKey && e.key.length > 1 ? `Shift+${key}` : key;
  for (const s of SHORTCUTS) if (s.keys.includes(withShift)) return s.action;
  return null;
}

/** Returns the printable label of a key, e.g. "Shift →". */
export function keyLabel(key: string): string {
  return LABEL[key] ?? key;
}
