// Which role pairs the pair-line layer shows: all, within one side, left with right, or with the trunk.

/** Which pairs are drawn. */
export type PairFilter = 'all' | 'same-side' | 'across' | 'trunk';

/** Returns the body side of a role name: l, r or c (trunk). */
function sideOfRole(role: string): 'l' | 'r' | 'c' {
  return role.startsWith('l_') ? 'l' : role.startsWith('r_') ? 'r' : 'c';
}

/** Returns true when a pair labelled "roleA–roleB" passes the filter. */
export function pairPasses(label: string, filter: PairFilter): boolean {
  const [a = '', b = ''] = label.split('–');
  const sa = sideOfRole(a), sb = sideOfRole(b);
  switch (filter) {
    case 'all': return true;
    case 'same-side': return sa === sb && sa !== 'c';
    case 'across': return (sa === 'l' && sb === 'r') || (sa === 'r' && sb === 'l');
    case 'trunk': return sa === 'c' || sb === 'c';
  }
}
