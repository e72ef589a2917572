import type { Router } from 'express';
import type { ApiMount } from '../route-table';
import type { PhotoService } from './photo.service';

/** Photos of valve records. */
export function registerPhotoRoutes(router: Router, mount: ApiMount, photos: PhotoService): void {
  mount(router, 'GET /api/valves/:id/photos', ({ params }) => photos.list(params.id));
  mount(router, 'POST /api/valves/:id/photos', ({ params, user }, res, req) =>
    photos.upload(params.id, req, res, user),
  );
  for (const which of ['full', 'thumb'] as const) {
    const key = which === 'full' ? 'GET /api/photos/:id' : 'GET /api/photos/:id/thumb';
    mount(router, key, async ({ params }, res) => {
      const { mime, data } = await photos.content(params.id, which);
      // Private: the photo needs a sign-in, so no shared cache may keep it.
      res.status(200).type(mime).set('cache-control', 'private, max-age=3600').send(data);
    });
  }
  mount(router, 'DELETE /api/photos/:id', async ({ params, user }, res) => {
    await photos.remove(params.id, user);
    res.status(204).end();
  });
}
