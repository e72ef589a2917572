import { HttpErrorResponse } from '@angular/common/http';
import {
  ChangeDetectionStrategy,
  Component,
  inject,
  input,
  signal,
  viewChild,
} from '@angular/core';
import {
  FormGroupDirective,
  NonNullableFormBuilder,
  ReactiveFormsModule,
  Validators,
} from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { Router } from '@angular/router';
import { apiErrorMessage } from '../core/api-error-message';
import { Auth } from '../core/auth';

/** Sign-in page: user name and password against the hub. */
@Component({
  selector: 'app-sign-in',
  imports: [
    MatButtonModule,
    MatFormFieldModule,
    MatIconModule,
    MatInputModule,
    MatProgressBarModule,
    ReactiveFormsModule,
  ],
  templateUrl: './sign-in.html',
  styleUrl: './sign-in.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class SignIn {
  private readonly auth = inject(Auth);
  private readonly router = inject(Router);

  /** Where to go after signing in (query parameter, set by the guard). */
  readonly returnUrl = input<string | undefined>();

  protected readonly form = inject(NonNullableFormBuilder).group({
    username: ['', Validators.required],
    password: ['', Validators.required],
  });
  private readonly formDirective = viewChild(FormGroupDirective);
  protected readonly busy = signal(false);
  protected readonly error = signal<string | null>(null);

  protected signIn(): void {
    if (this.form.invalid || this.busy()) {
      this.form.markAllAsTouched();
      return;
    }
    const { username, password } = this.form.getRawValue();
    this.busy.set(true);
    this.error.set(null);
    this.auth.signIn(username.trim(), password).subscribe({
      next: () => {
        this.busy.set(false);
        void this.router.navigateByUrl(this.safeReturnUrl());
      },
      error: (err: unknown) => {
        this.busy.set(false);
        // Clears the submitted state too, so the empty password is not flagged on top.
        this.formDirective()?.resetForm({ username, password: '' });
        this.error.set(
          err instanceof HttpErrorResponse && err.status === 401
            ? 'That user name and password do not match. Check both and try again.'
            : apiErrorMessage(err, 'Signing in failed. Try again.'),
        );
      },
    });
  }

  private safeReturnUrl(): string {
    const url = this.returnUrl();
    // Only paths inside the app: an absolute URL here would be an open redirect.
    return url && url.startsWith('/') && !url.startsWith('//') && !url.startsWith('/sign-in')
      ? url
      : '/bench';
  }
}
