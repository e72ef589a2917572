import { ChangeDetectionStrategy, Component, inject, output, signal } from '@angular/core';
import { takeUntilDestroyed } from '@angular/core/rxjs-interop';
import { FormControl, ReactiveFormsModule } from '@angular/forms';
import { MatAutocompleteModule } from '@angular/material/autocomplete';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatInputModule } from '@angular/material/input';
import { catchError, debounceTime, distinctUntilChanged, filter, of, switchMap, tap } from 'rxjs';
import { ValvesApi, type ValveView } from './valves-api';

/**
 * Finds a valve record by label, maker or notes, so a sweep lands on the record. Typing again
 * after a pick drops the pick.
 */
@Component({
  selector: 'app-valve-record-picker',
  imports: [MatAutocompleteModule, MatFormFieldModule, MatInputModule, ReactiveFormsModule],
  template: `
    <mat-form-field class="picker">
      <mat-label>Valve record</mat-label>
      <input
        matInput
        [formControl]="search"
        [matAutocomplete]="auto"
        placeholder="Search label or maker"
      />
      <mat-autocomplete
        #auto="matAutocomplete"
        [displayWith]="display"
        (optionSelected)="choose($event.option.value)"
      >
        @for (v of options(); track v.id) {
          <mat-option [value]="v"
            >{{ v.label }} · {{ v.type }}{{ v.maker ? ' · ' + v.maker : '' }}</mat-option
          >
        }
      </mat-autocomplete>
      <mat-hint>{{ choice() ? 'The sweep is saved to this record' : 'Optional' }}</mat-hint>
    </mat-form-field>
  `,
  styles: `
    .picker {
      width: 100%;
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class ValveRecordPicker {
  /** The chosen record, or null when the choice is dropped. */
  readonly picked = output<ValveView | null>();

  private readonly api = inject(ValvesApi);
  protected readonly search = new FormControl<string | ValveView>('', { nonNullable: true });
  protected readonly options = signal<ValveView[]>([]);
  protected readonly choice = signal<ValveView | null>(null);
  protected readonly display = (v: ValveView | string | null) =>
    typeof v === 'string' ? v : v ? `${v.label} · ${v.type}` : '';

  constructor() {
    this.search.valueChanges
      .pipe(
        filter((v): v is string => typeof v === 'string'),
        tap(() => {
          if (this.choice()) {
            this.choice.set(null);
            this.picked.emit(null);
          }
        }),
        debounceTime(250),
        distinctUntilChanged(),
        switchMap((q) =>
          q.trim()
            ? this.api
                .list({
                  page: 1,
                  pageSize: 10,
                  sort: 'label',
                  order: 'asc',
                  type: '',
                  status: '',
                  grade: '',
                  location: '',
                  q,
                })
                .pipe(catchError(() => of({ items: [] as ValveView[] })))
            : of({ items: [] as ValveView[] }),
        ),
        takeUntilDestroyed(),
      )
      .subscribe((page) => this.options.set(page.items));
  }

  protected choose(valve: ValveView): void {
    this.choice.set(valve);
    this.picked.emit(valve);
  }
}
