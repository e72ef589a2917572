import { inject, provideAppInitializer, type EnvironmentProviders } from '@angular/core';
import { MatIconRegistry } from '@angular/material/icon';
import { DomSanitizer } from '@angular/platform-browser';

/**
 * The Material Symbols (outlined, weight 400) the app uses. angular.json copies exactly these
 * files from @material-symbols/svg-400 into /icons, so no icon is fetched from elsewhere.
 */
export const APP_ICONS = [
  'add',
  'arrow_back',
  'bolt',
  'bookmark_add',
  'cable',
  'category',
  'check_circle',
  'compare_arrows',
  'content_copy',
  'dark_mode',
  'delete',
  'download',
  'edit',
  'error',
  'inventory_2',
  'light_mode',
  'link',
  'link_off',
  'local_fire_department',
  'logout',
  'mail',
  'menu',
  'monitoring',
  'open_in_new',
  'outbox',
  'photo_camera',
  'picture_as_pdf',
  'play_arrow',
  'print',
  'search',
  'sell',
  'settings',
  'stop_circle',
  'table_rows',
  'timer',
  'undo',
  'upload',
  'warning',
] as const;

/** Registers APP_ICONS with MatIconRegistry under their Material Symbols names. */
export function provideAppIcons(): EnvironmentProviders {
  return provideAppInitializer(() => {
    const registry = inject(MatIconRegistry);
    const sanitizer = inject(DomSanitizer);
    for (const name of APP_ICONS) {
      registry.addSvgIcon(name, sanitizer.bypassSecurityTrustResourceUrl(`icons/${name}.svg`));
    }
  });
}
