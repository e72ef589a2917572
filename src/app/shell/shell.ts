import { BreakpointObserver } from '@angular/cdk/layout';
import { ChangeDetectionStrategy, Component, computed, inject } from '@angular/core';
import { toSignal } from '@angular/core/rxjs-interop';
import { MatButtonModule } from '@angular/material/button';
import { MatIconModule } from '@angular/material/icon';
import { MatListModule } from '@angular/material/list';
import { MatSidenavModule } from '@angular/material/sidenav';
import { MatToolbarModule } from '@angular/material/toolbar';
import { MatTooltipModule } from '@angular/material/tooltip';
import { Router, RouterLink, RouterLinkActive, RouterOutlet } from '@angular/router';
import { map } from 'rxjs';
import { Auth, type Role } from '../core/auth';
import { LiveConnection } from '../core/live-connection';
import { Theme } from '../core/theme';
import { HighVoltageBanner } from './high-voltage-banner';
import { NAV_ITEMS } from './nav-items';

const ROLE_LABELS: Record<Role, string> = {
  admin: 'Admin',
  technician: 'Technician',
  viewer: 'Viewer',
};

/** Frame of every signed-in page: toolbar, high-voltage banner, side navigation. */
@Component({
  selector: 'app-shell',
  imports: [
    HighVoltageBanner,
    MatButtonModule,
    MatIconModule,
    MatListModule,
    MatSidenavModule,
    MatToolbarModule,
    MatTooltipModule,
    RouterLink,
    RouterLinkActive,
    RouterOutlet,
  ],
  templateUrl: './shell.html',
  styleUrl: './shell.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class Shell {
  private readonly auth = inject(Auth);
  private readonly router = inject(Router);
  protected readonly live = inject(LiveConnection);
  protected readonly theme = inject(Theme);

  /** Side navigation beside the content on a laptop; a drawer on a tablet. */
  protected readonly wide = toSignal(
    inject(BreakpointObserver)
      .observe('(min-width: 1200px)')
      .pipe(map((s) => s.matches)),
    { initialValue: true },
  );
  protected readonly user = this.auth.user;
  protected readonly roleLabel = computed(() => {
    const role = this.user()?.role;
    return role ? ROLE_LABELS[role] : '';
  });
  protected readonly navItems = computed(() => {
    const role = this.user()?.role;
    return NAV_ITEMS.filter((item) => role !== undefined && item.roles.includes(role));
  });
  protected readonly benches = computed(() => this.live.benches() ?? []);

  protected signOut(): void {
    this.auth.signOut();
    void this.router.navigate(['/sign-in']);
  }
}
