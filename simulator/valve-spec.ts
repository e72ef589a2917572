import { findValveType, VALVE_TYPES } from '../shared/catalog/valve-types';

/** Which valve sits in the socket: a type with a published model and the seed of the individual. */
export interface ValveSpec {
  /** Catalog designation, e.g. "12AX7". */
  typeName: string;
  /** Which individual valve of the type; 0 is the nominal valve (data-sheet model, no spread). */
  seed: number;
}

/** Designations of the catalog types the simulator can put in the socket (those with a model). */
export function simulatedTypeNames(): string[] {
  return VALVE_TYPES.filter((t) => t.model !== null).map((t) => t.designation);
}

/** Checks a type and seed and returns the spec with the catalog's spelling; throws with a reason. */
export function makeValveSpec(typeName: string, seed: number): ValveSpec {
  const type = findValveType(typeName);
  if (!type) {
    throw new Error(
      `unknown valve type "${typeName}"; simulated types: ${simulatedTypeNames().join(', ')}`,
    );
  }
  if (!type.model) {
    throw new Error(
      `valve type ${type.designation} has no published model, so it cannot be simulated; simulated types: ${simulatedTypeNames().join(', ')}`,
    );
  }
  if (!Number.isInteger(seed) || seed < 0 || seed > 0xffffffff) {
    throw new Error(`valve seed must be an integer from 0 to 4294967295, got ${seed}`);
  }
  return { typeName: type.designation, seed };
}

/** Parses "TYPE#SEED" (e.g. "12AX7#1"); throws with a reason on bad input. */
export function parseValveSpec(text: string): ValveSpec {
  const match = /^\s*([^#\s]+)#(\d{1,10})\s*$/.exec(text);
  if (!match) throw new Error(`valve must be written TYPE#SEED, e.g. 12AX7#1, got "${text}"`);
  return makeValveSpec(match[1], Number(match[2]));
}

/** Writes a spec as "TYPE#SEED". */
export function formatValveSpec(spec: ValveSpec): string {
  return `${spec.typeName}#${spec.seed}`;
}
