// Role-map override files: a JSON object from role name to the joint's name in the take,
// e.g. { "l_knee": "JointNameInFile", "neck": null }. A null value marks a role the skeleton lacks.
import { readFileSync } from 'node:fs';
import type { Take } from '../bvh/take.js';
import { InputError } from '../errors/index.js';
import { ROLE_NAMES, type RoleName, type RoleOverrides } from './roles.js';

/** Returns the roles fixed by a role-map JSON text, checked against the take; `file` names it in errors. */
export function parseRoleMap(text: string, file: string, take: Take): RoleOverrides {
  let data: unknown;
  try {
    data = JSON.parse(text);
  } catch (e) {
    throw new InputError(`${file}: the role-map file is not valid JSON (${(e as Error).message}).`);
  }
  if (typeof data !== 'object' || data === null || Array.isArray(data))
    throw new InputError(`${file}: the role-map file must hold one JSON object such as { "l_knee": "JointName" }.`);
  const known = new Set<string>(ROLE_NAMES);
  const roles: Partial<Record<RoleName, number | null>> = {};
  const used = new Map<number, string>();
  for (const [key, value] of Object.entries(data as Record<string, unknown>)) {
    if (!known.has(key)) throw new InputError(`${file}: unknown role "${key}"; known roles are ${ROLE_NAMES.join(', ')}.`);
    if (value === null) {
      roles[key as RoleName] = null;
      continue;
    }
    if (typeof value !== 'string') throw new InputError(`${file}: role "${key}" must name a joint as a string (or be null), not ${JSON.stringify(value)}.`);
    const j = take.joints.findIndex((jt) => jt.name === value);
    if (j < 0) {
      const low = value.toLowerCase();
      const near = take.joints.filter((jt) => jt.name.toLowerCase().includes(low) || low.includes(jt.name.toLowerCase())).map((jt) => `'${jt.name}'`).slice(0, 5);
      throw new InputError(`${file}: role "${key}" names joint "${value}", which the take does not have${near.length ? ` (similar: ${near.join(', ')})` : ''}.`);
    }
    const prior = used.get(j);
    if (prior) throw new InputError(`${file}: joint "${value}" is given to two roles, "${prior}" and "${key}".`);
    used.set(j, key);
    roles[key as RoleName] = j;
  }
  return { file, roles };
}

/** Returns the roles fixed by the role-map file at `path`, checked against the take. */
export function loadRoleMapFile(path: string, take: Take): RoleOverrides {
  let text: string;
  try {
    text = readFileSync(path, 'utf8');
  } catch (e) {
    throw new InputError(`${path}: cannot read the role-map file (${(e as NodeJS.ErrnoException).code ?? (e as Error).message}).`);
  }
  return parseRoleMap(text, path, take);
}
