import type { SweepPlan, SweepPoint } from '../../../shared/domain/sweep';
import type { ChartOverlay } from '../sweeps/sweep-chart';

/** One member's measured family, as the overlay chart draws it. */
export interface MemberFamily {
  /** The valve's label: its legend entry. */
  label: string;
  plan: SweepPlan;
  points: readonly SweepPoint[];
}

/*
 * One colour per valve, not per grid step: in an overlay the question is which valve a curve
 * belongs to. Our own categorical set, picked for contrast on both surfaces.
 */
const LIGHT_MEMBER_COLOURS = [
  '#c8431f',
  '#1f6fc4',
  '#1f8a5b',
  '#7a34a8',
  '#a86b00',
  '#0d8597',
  '#b8286f',
  '#5a5650',
];
const DARK_MEMBER_COLOURS = [
  '#ff8a5c',
  '#6fb1ff',
  '#5fd39a',
  '#c792ff',
  '#ffd166',
  '#4fd6e3',
  '#ff7ab8',
  '#d4cfc8',
];

/** Colour of member `index` of a set. */
export function memberColour(index: number, dark: boolean): string {
  const colours = dark ? DARK_MEMBER_COLOURS : LIGHT_MEMBER_COLOURS;
  return colours[index % colours.length];
}

/**
 * The overlay series of a set's members: one Ia line per measured curve (grid step) of each
 * member, all of a member's lines in its colour under its label, so the legend lists the
 * valves and a click on a label hides that valve's curves.
 */
export function memberCurveOverlays(
  families: readonly MemberFamily[],
  dark: boolean,
): ChartOverlay[] {
  const out: ChartOverlay[] = [];
  families.forEach((family, index) => {
    const colour = memberColour(index, dark);
    const byCurve = new Map<number, SweepPoint[]>();
    for (const p of family.points) {
      const list = byCurve.get(p.curve);
      if (list) list.push(p);
      else byCurve.set(p.curve, [p]);
    }
    for (const curve of [...byCurve.keys()].sort((a, b) => a - b)) {
      const data = byCurve
        .get(curve)!
        .slice()
        .sort((a, b) => a.seq - b.seq)
        .map((p): [number, number] => [p.vaVolts, p.iaMilliamps]);
      out.push({
        id: `member-${index}-curve-${curve}`,
        name: family.label,
        type: 'line',
        data,
        showSymbol: false,
        animation: false,
        emphasis: { focus: 'series' },
        lineStyle: { color: colour, width: 1.5, type: 'solid' },
        itemStyle: { color: colour },
      });
    }
  });
  return out;
}

/**
 * A plan that sets the chart's axes for all members: Va up to the highest stop. The screen
 * voltage is left out, since only Ia is drawn.
 */
export function overlayPlan(families: readonly MemberFamily[]): SweepPlan | null {
  if (!families.length) return null;
  const first = families[0].plan;
  const vaStopVolts = Math.max(...families.map((f) => f.plan.vaStopVolts));
  return { ...first, kind: 'anode', vaStopVolts, vg2Volts: 0 };
}
