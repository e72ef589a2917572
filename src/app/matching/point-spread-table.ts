import { ChangeDetectionStrategy, Component, computed, input } from '@angular/core';
import { figureText, percentText } from './match-labels';
import type { PointSpread } from './matching-api';

/** Spreads of a group at each operating point (and section), with its curve spread. */
@Component({
  selector: 'app-point-spread-table',
  template: `
    <table class="spreads">
      <thead>
        <tr>
          <th>Point</th>
          <th class="num">Ia mean</th>
          <th class="num">Ia spread</th>
          <th class="num">gm mean</th>
          <th class="num">gm spread</th>
          @if (equalCurrent()) {
            <th class="num">Vg1 mean</th>
          }
        </tr>
      </thead>
      <tbody>
        @for (p of points(); track $index) {
          <tr>
            <td>
              {{ sectioned() ? p.label + ', section ' + p.section : p.label }}
              @if (where(p); as where) {
                <span class="where">{{ where }}</span>
              }
            </td>
            <td class="num readout">{{ figure(p.iaMeanMilliamps) }} mA</td>
            <td class="num readout">
              {{ p.iaSpreadPercent === null ? 'equal by choice' : percent(p.iaSpreadPercent) }}
            </td>
            <td class="num readout">{{ figure(p.gmMeanMicrosiemens) }} µS</td>
            <td class="num readout">{{ percent(p.gmSpreadPercent) }}</td>
            @if (equalCurrent()) {
              <td class="num readout">
                {{ figure(p.vg1MeanVolts) }} V{{
                  p.kind === 'equal-current' ? ' (spread ' + figure(p.vg1SpreadVolts) + ' V)' : ''
                }}
              </td>
            }
          </tr>
        }
        @if (curveSpreadPercent() !== null) {
          <tr>
            <td>whole curves in the window</td>
            <td [attr.colspan]="equalCurrent() ? 4 : 3" class="num">
              largest difference between two members
            </td>
            <td class="num readout">{{ percent(curveSpreadPercent()) }}</td>
          </tr>
        }
      </tbody>
    </table>
  `,
  styles: `
    :host {
      display: block;
      overflow-x: auto;
    }
    .spreads {
      width: 100%;
      border-collapse: collapse;
      font: var(--mat-sys-body-small);
    }
    th,
    td {
      padding: 4px 8px;
      border-bottom: 1px solid var(--mat-sys-outline-variant);
      text-align: left;
      white-space: nowrap;
    }
    th {
      color: var(--mat-sys-on-surface-variant);
      font-weight: 500;
    }
    .num {
      text-align: right;
    }
    .where {
      display: block;
      color: var(--mat-sys-on-surface-variant);
    }
    tr:last-child td {
      border-bottom: 0;
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class PointSpreadTable {
  readonly points = input.required<readonly PointSpread[]>();
  /** Largest curve difference over the window, % (null: no window). */
  readonly curveSpreadPercent = input<number | null>(null);
  /** Where each point lies, in words by label (V, mA); points without an entry show none. */
  readonly conditions = input<ReadonlyMap<string, string>>(new Map());

  protected readonly percent = percentText;
  protected readonly figure = figureText;
  /** Where a point lies: from the criteria, else from the point's own Va and Vg2. */
  protected where(p: PointSpread): string {
    const given = this.conditions().get(p.label);
    if (given) return given;
    if (p.vaVolts === undefined) return '';
    const vg1 = p.kind === 'fixed-bias' ? `, Vg1 ${figureText(p.vg1MeanVolts)} V` : '';
    const vg2 = typeof p.vg2Volts === 'number' ? `, Vg2 ${p.vg2Volts} V` : '';
    return `Va ${p.vaVolts} V${vg1}${vg2}`;
  }

  /** The Vg1 column is shown only where a point takes each valve at its own Vg1. */
  protected readonly equalCurrent = computed(() =>
    this.points().some((p) => p.kind === 'equal-current'),
  );
  /** Section names shown: some point is of section 2. */
  protected readonly sectioned = computed(() => this.points().some((p) => p.section > 1));
}
