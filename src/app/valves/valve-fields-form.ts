import { ChangeDetectionStrategy, Component, input } from '@angular/core';
import {
  NonNullableFormBuilder,
  ReactiveFormsModule,
  Validators,
  type FormControl,
  type FormGroup,
} from '@angular/forms';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatInputModule } from '@angular/material/input';
import { MatSelectModule } from '@angular/material/select';
import { ORIGIN_LABELS, STATUS_LABELS } from './valve-labels';
import {
  ORIGIN_KINDS,
  VALVE_STATUSES,
  type OriginKind,
  type ValveFields,
  type ValveStatus,
} from './valves-api';

/** The controls of a valve record's editable fields. */
export type ValveFieldsGroup = FormGroup<{
  label: FormControl<string>;
  type: FormControl<string>;
  maker: FormControl<string>;
  dateCode: FormControl<string>;
  originKind: FormControl<OriginKind | ''>;
  originText: FormControl<string>;
  location: FormControl<string>;
  status: FormControl<ValveStatus>;
  notes: FormControl<string>;
}>;

/** The fields of a valve record, shared by the new-record dialog and the record page. */
@Component({
  selector: 'app-valve-fields-form',
  imports: [MatFormFieldModule, MatInputModule, MatSelectModule, ReactiveFormsModule],
  template: `
    <div class="grid" [formGroup]="form()">
      <mat-form-field>
        <mat-label>Label</mat-label>
        <input matInput formControlName="label" placeholder="generated" />
      </mat-form-field>
      <mat-form-field>
        <mat-label>Type</mat-label>
        <mat-select formControlName="type">
          @for (t of types(); track t.designation) {
            <mat-option [value]="t.designation">{{ t.designation }}</mat-option>
          }
        </mat-select>
      </mat-form-field>
      <mat-form-field>
        <mat-label>Maker as printed</mat-label>
        <input matInput formControlName="maker" />
      </mat-form-field>
      <mat-form-field>
        <mat-label>Date code as printed</mat-label>
        <input matInput formControlName="dateCode" />
      </mat-form-field>
      <mat-form-field>
        <mat-label>Came from</mat-label>
        <mat-select formControlName="originKind">
          <mat-option value="">Not recorded</mat-option>
          @for (o of origins; track o.value) {
            <mat-option [value]="o.value">{{ o.label }}</mat-option>
          }
        </mat-select>
      </mat-form-field>
      <mat-form-field>
        <mat-label>Lot, supplier or amplifier</mat-label>
        <input matInput formControlName="originText" />
      </mat-form-field>
      <mat-form-field>
        <mat-label>Location</mat-label>
        <input matInput formControlName="location" placeholder="e.g. Drawer C3" />
      </mat-form-field>
      <mat-form-field>
        <mat-label>Status</mat-label>
        <mat-select formControlName="status">
          @for (s of statuses; track s.value) {
            <mat-option [value]="s.value">{{ s.label }}</mat-option>
          }
        </mat-select>
      </mat-form-field>
      <mat-form-field class="wide">
        <mat-label>Notes</mat-label>
        <textarea matInput formControlName="notes" rows="3"></textarea>
      </mat-form-field>
    </div>
  `,
  styles: `
    .grid {
      display: grid;
      grid-template-columns: repeat(auto-fill, minmax(220px, 1fr));
      gap: 12px;
    }
    .wide {
      grid-column: 1 / -1;
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class ValveFieldsForm {
  readonly form = input.required<ValveFieldsGroup>();
  readonly types = input<readonly { designation: string }[]>([]);

  protected readonly origins = ORIGIN_KINDS.map((o) => ({ value: o, label: ORIGIN_LABELS[o] }));
  protected readonly statuses = VALVE_STATUSES.map((s) => ({ value: s, label: STATUS_LABELS[s] }));

  /** A blank group of the fields, status in stock. */
  static build(fb: NonNullableFormBuilder): ValveFieldsGroup {
    return fb.group({
      label: ['', Validators.maxLength(40)],
      type: [''],
      maker: ['', Validators.maxLength(80)],
      dateCode: ['', Validators.maxLength(40)],
      originKind: fb.control<OriginKind | ''>(''),
      originText: ['', Validators.maxLength(200)],
      location: ['', Validators.maxLength(80)],
      status: fb.control<ValveStatus>('in-stock'),
      notes: ['', Validators.maxLength(4000)],
    });
  }

  /** The fields as the API takes them: empty text is null, an empty label is left out. */
  static fields(form: ValveFieldsGroup): ValveFields {
    const v = form.getRawValue();
    const text = (s: string) => (s.trim() ? s.trim() : null);
    return {
      ...(v.label.trim() ? { label: v.label.trim() } : {}),
      ...(v.type ? { type: v.type } : {}),
      maker: text(v.maker),
      dateCode: text(v.dateCode),
      originKind: v.originKind || null,
      originText: text(v.originText),
      location: text(v.location),
      status: v.status,
      notes: text(v.notes),
    };
  }
}
