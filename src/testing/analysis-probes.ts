import { buildAnodeFamily, type AnodeFamily } from '../../shared/analysis/anode-family';
import { childLangmuirPoints, CHILD_LANGMUIR_PLAN, WORKED_K } from './child-langmuir-points';

let cached: AnodeFamily | null = null;

/** The ideal mu-100 triode family of the specs (built once per spec file). */
export function idealTriodeFamily(): AnodeFamily {
  if (cached) return cached;
  const built = buildAnodeFamily(childLangmuirPoints(WORKED_K, 100, CHILD_LANGMUIR_PLAN));
  if (!built.ok) throw new Error(built.reason);
  cached = built.family;
  return cached;
}

/** Text of a figure tile (`data-figure` attribute) with runs of white space made single. */
export function tileText(root: HTMLElement, figure: string): string {
  const dd = root.querySelector(`[data-figure="${figure}"] dd`);
  if (!dd) throw new Error(`no tile ${figure}`);
  return (dd.textContent ?? '').replace(/\s+/g, ' ').trim();
}

/** The first number in a text. */
export function firstNumber(text: string): number {
  const m = /-?\d+(\.\d+)?/.exec(text);
  if (!m) throw new Error(`no number in "${text}"`);
  return Number(m[0]);
}

/** The unit shown in a figure tile, '' where it has none. */
export function tileUnit(root: HTMLElement, figure: string): string {
  return root.querySelector(`[data-figure="${figure}"] .unit`)?.textContent?.trim() ?? '';
}
