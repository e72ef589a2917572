import {
  ChangeDetectionStrategy,
  Component,
  inject,
  input,
  signal,
  effect,
  untracked,
} from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MatIconModule } from '@angular/material/icon';
import { switchMap } from 'rxjs';
import { apiErrorMessage } from '../core/api-error-message';
import { blobDataUrl } from './blob-data-url';
import { ValvesApi, type PhotoView } from './valves-api';

/** Image types the hub stores (it checks the content too). */
export const PHOTO_TYPES = ['image/jpeg', 'image/png', 'image/webp'];
/** Largest photo the hub takes, bytes. */
export const PHOTO_MAX_BYTES = 5 * 1024 * 1024;

/** Why a file cannot be a valve photo, or null when it can. */
export function photoProblem(file: { name: string; type: string; size: number }): string | null {
  if (!PHOTO_TYPES.includes(file.type)) return `${file.name} is not a JPEG, PNG or WebP image.`;
  if (file.size > PHOTO_MAX_BYTES) return `${file.name} is larger than 5 MiB.`;
  return null;
}

/**
 * A valve's photos as thumbnails, with upload and delete for technicians. The hub serves images
 * only with the bearer header, so each is fetched as a blob and shown from a data: URL.
 */
@Component({
  selector: 'app-valve-photos',
  imports: [MatButtonModule, MatIconModule],
  template: `
    <div class="thumbs">
      @for (p of photos(); track p.id) {
        <figure class="thumb">
          @if (urls()[p.id]; as url) {
            <a [href]="url" target="_blank" (click)="openFull($event, p)">
              <img [src]="url" [alt]="p.originalName" />
            </a>
          } @else {
            <div class="placeholder">Loading…</div>
          }
          <figcaption>
            <span class="name">{{ p.originalName }}</span>
            @if (canEdit()) {
              <button
                mat-icon-button
                type="button"
                [attr.aria-label]="'Delete photo ' + p.originalName"
                (click)="remove(p)"
              >
                <mat-icon svgIcon="delete" />
              </button>
            }
          </figcaption>
        </figure>
      } @empty {
        <p class="empty">No photos yet.</p>
      }
    </div>
    @if (canEdit()) {
      <button mat-stroked-button type="button" (click)="picker.click()" [disabled]="uploading()">
        <mat-icon svgIcon="photo_camera" />{{ uploading() ? 'Uploading…' : 'Add photo' }}
      </button>
      <input
        #picker
        class="hidden-input"
        type="file"
        accept="image/jpeg,image/png,image/webp"
        aria-label="Photo to upload"
        (change)="upload(picker)"
      />
      <span class="hint">JPEG, PNG or WebP, at most 5 MiB.</span>
    }
    @if (error(); as message) {
      <p class="error" role="alert">{{ message }}</p>
    }
  `,
  styles: `
    .thumbs {
      display: flex;
      flex-wrap: wrap;
      gap: 12px;
      margin-bottom: 12px;
    }
    .thumb {
      margin: 0;
      width: 160px;
    }
    .thumb img,
    .placeholder {
      width: 160px;
      height: 120px;
      object-fit: cover;
      border-radius: 8px;
      display: grid;
      place-items: center;
      background: var(--mat-sys-surface-container-high);
    }
    figcaption {
      display: flex;
      align-items: center;
      gap: 4px;
      font: var(--mat-sys-body-small);
    }
    .name {
      flex: 1;
      overflow: hidden;
      text-overflow: ellipsis;
      white-space: nowrap;
    }
    .hidden-input {
      display: none;
    }
    .hint,
    .empty {
      color: var(--mat-sys-on-surface-variant);
      margin-left: 8px;
    }
    .error {
      color: var(--mat-sys-error);
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class ValvePhotos {
  readonly valveId = input.required<number>();
  readonly canEdit = input(false);

  private readonly api = inject(ValvesApi);
  protected readonly photos = signal<PhotoView[]>([]);
  protected readonly urls = signal<Record<number, string>>({});
  protected readonly uploading = signal(false);
  protected readonly error = signal<string | null>(null);

  constructor() {
    effect(() => {
      const id = this.valveId();
      untracked(() => this.load(id));
    });
  }

  protected upload(picker: HTMLInputElement): void {
    const file = picker.files?.[0];
    picker.value = '';
    if (!file) return;
    const problem = photoProblem(file);
    this.error.set(problem);
    if (problem) return;
    this.uploading.set(true);
    this.api.uploadPhoto(this.valveId(), file).subscribe({
      next: (photo) => {
        this.uploading.set(false);
        this.photos.update((list) => [...list, photo]);
        this.fetchThumb(photo);
      },
      error: (err: unknown) => {
        this.uploading.set(false);
        this.error.set(apiErrorMessage(err, 'The photo was not stored.'));
      },
    });
  }

  protected remove(photo: PhotoView): void {
    this.api.deletePhoto(photo.id).subscribe({
      next: () => this.photos.update((list) => list.filter((p) => p.id !== photo.id)),
      error: (err: unknown) => this.error.set(apiErrorMessage(err, 'The photo was not deleted.')),
    });
  }

  /** Shows the full image in a new window once fetched with the bearer header. */
  protected openFull(event: Event, photo: PhotoView): void {
    event.preventDefault();
    // Open at once, inside the click: a window opened after the fetch would be blocked.
    const win = globalThis.open?.('', '_blank');
    if (!win) return;
    win.document.title = photo.originalName;
    this.api
      .image(photo.url)
      .pipe(switchMap((blob) => blobDataUrl(blob)))
      .subscribe((url) => {
        const img = win.document.createElement('img');
        img.src = url;
        img.alt = photo.originalName;
        img.style.maxWidth = '100%';
        win.document.body.appendChild(img);
      });
  }

  private load(id: number): void {
    this.api.photos(id).subscribe({
      next: (photos) => {
        this.photos.set(photos);
        photos.forEach((p) => this.fetchThumb(p));
      },
      error: (err: unknown) => this.error.set(apiErrorMessage(err, 'The photos did not load.')),
    });
  }

  private fetchThumb(photo: PhotoView): void {
    this.api
      .image(photo.thumbUrl)
      .pipe(switchMap((blob) => blobDataUrl(blob)))
      .subscribe((url) => this.urls.update((m) => ({ ...m, [photo.id]: url })));
  }
}
