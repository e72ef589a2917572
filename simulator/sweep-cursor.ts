import { anodeSteps, type SweepPlan } from '../shared/domain/sweep';

/** One setting of a sweep: where the next reading is taken. */
export interface SweepSetting {
  /** Curve index (index into vg1Volts; always 0 for a transfer sweep). */
  curve: number;
  /** Anode voltage, V. */
  vaVolts: number;
  /** Grid-1 voltage, V. */
  vg1Volts: number;
}

/**
 * Walks the settings of a plan in order: anode family, curve by curve with Va stepping;
 * transfer, one setting per grid-1 voltage at the fixed Va. A curve can be cut short.
 */
export class SweepCursor {
  private readonly vaSteps: number[];
  private curve = 0;
  private step = 0;

  constructor(private readonly plan: SweepPlan) {
    this.vaSteps = plan.kind === 'anode' ? anodeSteps(plan) : [plan.vaStartVolts];
  }

  /** The next setting to measure, or null when the sweep is through. */
  current(): SweepSetting | null {
    const p = this.plan;
    if (p.kind === 'transfer') {
      if (this.step >= p.vg1Volts.length) return null;
      return { curve: 0, vaVolts: p.vaStartVolts, vg1Volts: p.vg1Volts[this.step] };
    }
    if (this.curve >= p.vg1Volts.length || this.vaSteps.length === 0) return null;
    return {
      curve: this.curve,
      vaVolts: this.vaSteps[this.step],
      vg1Volts: p.vg1Volts[this.curve],
    };
  }

  /**
   * Moves to the next setting. `endCurve` drops the rest of the present curve; a transfer
   * sweep has one curve, so it ends there. Returns whether the next setting starts a new curve.
   */
  advance(endCurve: boolean): boolean {
    if (this.plan.kind === 'transfer') {
      this.step = endCurve ? this.plan.vg1Volts.length : this.step + 1;
      return false;
    }
    this.step++;
    if (endCurve || this.step >= this.vaSteps.length) {
      this.curve++;
      this.step = 0;
      return true;
    }
    return false;
  }
}
