// Where the default coupling model shipped with the package lives (src/model/default-model.json, written
// by `npm run train:default`): the same path from the TypeScript sources and from the built dist/.
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';

/** Returns the path of the model shipped with the package. */
export function defaultModelPath(): string {
  return join(dirname(fileURLToPath(import.meta.url)), '..', '..', 'src', 'model', 'default-model.json');
}
