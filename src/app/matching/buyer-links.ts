import { Clipboard } from '@angular/cdk/clipboard';
import { DatePipe } from '@angular/common';
import {
  ChangeDetectionStrategy,
  Component,
  computed,
  inject,
  input,
  output,
  signal,
} from '@angular/core';
import { FormControl, ReactiveFormsModule, Validators } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { apiErrorMessage } from '../core/api-error-message';
import { MatchSetsApi, type CreatedShare, type MatchSetShare } from './match-sets-api';

/** A buyer's link with its state now. */
interface LinkRow {
  share: MatchSetShare;
  state: 'active' | 'expired' | 'withdrawn';
}

/** Read-only links a buyer opens without signing in: make one, copy it once, withdraw it. */
@Component({
  selector: 'app-buyer-links',
  imports: [
    DatePipe,
    MatButtonModule,
    MatFormFieldModule,
    MatIconModule,
    MatInputModule,
    ReactiveFormsModule,
  ],
  template: `
    @if (canOperate()) {
      <div class="create">
        <mat-form-field class="days">
          <mat-label>Expires after</mat-label>
          <input matInput type="number" [formControl]="days" min="1" max="365" />
          <span matTextSuffix>days</span>
          <mat-error>1 to 365 days</mat-error>
        </mat-form-field>
        <button
          mat-stroked-button
          type="button"
          (click)="create()"
          [disabled]="days.invalid || busy()"
        >
          <mat-icon svgIcon="link" />Make a buyer link
        </button>
      </div>
    }
    @if (created(); as c) {
      <div class="created" role="status">
        <p>
          New link, valid until {{ c.expiresAt | date: 'yyyy-MM-dd HH:mm' }}. Copy it now: it is
          shown only this once.
        </p>
        <div class="url-row">
          <code class="url" aria-label="New buyer link">{{ c.url }}</code>
          <button mat-flat-button type="button" (click)="copy(c.url)">
            <mat-icon svgIcon="content_copy" />{{ copied() ? 'Copied' : 'Copy link' }}
          </button>
        </div>
      </div>
    }
    @if (error(); as message) {
      <p class="error-text" role="alert">{{ message }}</p>
    }
    @if (rows().length) {
      <ul class="links" aria-label="Buyer links">
        @for (r of rows(); track r.share.id) {
          <li>
            <span class="readout">Link #{{ r.share.id }}</span>
            @switch (r.state) {
              @case ('active') {
                <span>valid until {{ r.share.expiresAt | date: 'yyyy-MM-dd HH:mm' }}</span>
              }
              @case ('expired') {
                <span class="muted"
                  >expired {{ r.share.expiresAt | date: 'yyyy-MM-dd HH:mm' }}</span
                >
              }
              @case ('withdrawn') {
                <span class="muted"
                  >withdrawn {{ r.share.revokedAt | date: 'yyyy-MM-dd HH:mm' }}</span
                >
              }
            }
            @if (r.state === 'active' && canOperate()) {
              <button mat-button type="button" (click)="withdraw(r.share)" [disabled]="busy()">
                <mat-icon svgIcon="link_off" />Withdraw
              </button>
            }
          </li>
        }
      </ul>
    } @else {
      <p class="muted">No buyer links yet.</p>
    }
  `,
  styles: `
    .create {
      display: flex;
      flex-wrap: wrap;
      align-items: baseline;
      gap: 12px;
    }
    .days {
      width: 160px;
    }
    .created {
      margin: 8px 0;
      padding: 8px 12px;
      border-radius: 8px;
      background: var(--mat-sys-secondary-container);
      color: var(--mat-sys-on-secondary-container);
    }
    .created p {
      margin: 0 0 8px;
    }
    .url-row {
      display: flex;
      gap: 8px;
      align-items: center;
    }
    .url {
      flex: 1;
      min-width: 0;
      word-break: break-all;
      user-select: all;
      font-family: var(--ember-mono);
      padding: 6px 8px;
      border: 1px solid var(--mat-sys-outline);
      border-radius: 4px;
      background: var(--mat-sys-surface);
      color: var(--mat-sys-on-surface);
      font-size: 13px;
    }
    .links {
      list-style: none;
      margin: 8px 0 0;
      padding: 0;
    }
    .links li {
      display: flex;
      flex-wrap: wrap;
      align-items: center;
      gap: 4px 12px;
      min-height: 40px;
      border-bottom: 1px solid var(--mat-sys-outline-variant);
    }
    .muted {
      color: var(--mat-sys-on-surface-variant);
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class BuyerLinks {
  readonly setId = input.required<number>();
  readonly shares = input.required<readonly MatchSetShare[]>();
  readonly canOperate = input(false);
  /** A link was made or withdrawn: the set's lists are stale. */
  readonly changed = output<void>();

  private readonly api = inject(MatchSetsApi);
  private readonly clipboard = inject(Clipboard);
  protected readonly days = new FormControl(30, {
    nonNullable: true,
    validators: [Validators.required, Validators.min(1), Validators.max(365)],
  });
  protected readonly created = signal<CreatedShare | null>(null);
  protected readonly copied = signal(false);
  protected readonly busy = signal(false);
  protected readonly error = signal<string | null>(null);
  protected readonly rows = computed<LinkRow[]>(() => {
    const now = new Date().toISOString();
    return this.shares().map((share) => ({
      share,
      state: share.revokedAt ? 'withdrawn' : share.expiresAt <= now ? 'expired' : 'active',
    }));
  });

  protected create(): void {
    if (this.days.invalid || this.busy()) return;
    this.busy.set(true);
    this.error.set(null);
    this.copied.set(false);
    this.api.share(this.setId(), this.days.value).subscribe({
      next: (share) => {
        this.busy.set(false);
        this.created.set(share);
        this.changed.emit();
      },
      error: (err: unknown) => {
        this.busy.set(false);
        this.error.set(apiErrorMessage(err, 'The link was not made.'));
      },
    });
  }

  protected copy(url: string): void {
    this.copied.set(this.clipboard.copy(url));
  }

  protected withdraw(share: MatchSetShare): void {
    this.busy.set(true);
    this.error.set(null);
    this.api.withdrawShare(this.setId(), share.id).subscribe({
      next: () => {
        this.busy.set(false);
        if (this.created()?.id === share.id) this.created.set(null);
        this.changed.emit();
      },
      error: (err: unknown) => {
        this.busy.set(false);
        this.error.set(apiErrorMessage(err, 'The link was not withdrawn.'));
      },
    });
  }
}
