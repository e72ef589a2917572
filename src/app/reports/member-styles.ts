/**
 * How each member of a report is drawn: a colour that stays distinct for the common colour
 * vision deficiencies (the PDF report uses the same colours, in the same order), and a dash
 * pattern, so a black-and-white print still tells the valves apart.
 */
const MEMBER_COLOURS = [
  '#0072b2',
  '#d55e00',
  '#009e73',
  '#cc79a7',
  '#e69f00',
  '#56b4e9',
  '#000000',
  '#999933',
];

/** Dash patterns in px (dash, gap ...); empty is solid. Their count is prime to the colours'. */
const MEMBER_DASHES: readonly (readonly number[])[] = [[], [7, 3], [2, 2.5], [10, 3, 2, 3], [4, 4]];

/** Line style of member `index`. */
export interface MemberStyle {
  colour: string;
  /** Dash pattern in px; empty for a solid line. */
  dash: readonly number[];
}

/** Line style of the member at place `index` of a report. */
export function memberStyle(index: number): MemberStyle {
  return {
    colour: MEMBER_COLOURS[index % MEMBER_COLOURS.length],
    dash: MEMBER_DASHES[index % MEMBER_DASHES.length],
  };
}
