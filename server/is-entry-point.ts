import { realpathSync } from 'node:fs';
import { fileURLToPath } from 'node:url';

/** Whether the module at `moduleUrl` is the script Node was started with (`tsx file.ts`). */
export function isEntryPoint(moduleUrl: string): boolean {
  const script = process.argv[1];
  if (!script) return false;
  try {
    return realpathSync(script) === realpathSync(fileURLToPath(moduleUrl));
  } catch {
    return false;
  }
}
