import { DOCUMENT } from '@angular/common';
import { computed, DestroyRef, effect, inject, Injectable, signal } from '@angular/core';

/** The user's colour-scheme choice; 'system' follows the operating system. */
export type ThemeChoice = 'system' | 'light' | 'dark';

/** localStorage key of the theme choice. */
export const THEME_STORAGE_KEY = 'emberline.theme';

/** Light or dark: follows the system until the user picks one in the toolbar. */
@Injectable({ providedIn: 'root' })
export class Theme {
  private readonly document = inject(DOCUMENT);
  private readonly media =
    typeof this.document.defaultView?.matchMedia === 'function'
      ? this.document.defaultView.matchMedia('(prefers-color-scheme: dark)')
      : null;
  private readonly systemDark = signal(this.media?.matches ?? false);

  readonly choice = signal<ThemeChoice>(readChoice());
  /** Whether the page is dark now. */
  readonly dark = computed(() =>
    this.choice() === 'system' ? this.systemDark() : this.choice() === 'dark',
  );

  constructor() {
    const onChange = (e: MediaQueryListEvent) => this.systemDark.set(e.matches);
    this.media?.addEventListener('change', onChange);
    inject(DestroyRef).onDestroy(() => this.media?.removeEventListener('change', onChange));
    effect(() => {
      const root = this.document.documentElement;
      root.classList.toggle('theme-light', this.choice() === 'light');
      root.classList.toggle('theme-dark', this.choice() === 'dark');
    });
  }

  /** Switches to the other scheme and remembers the choice. */
  toggle(): void {
    const next: ThemeChoice = this.dark() ? 'light' : 'dark';
    this.choice.set(next);
    localStorage.setItem(THEME_STORAGE_KEY, next);
  }
}

function readChoice(): ThemeChoice {
  const stored = localStorage.getItem(THEME_STORAGE_KEY);
  return stored === 'light' || stored === 'dark' ? stored : 'system';
}
