import { existsSync, readdirSync } from 'node:fs';
import path from 'node:path';
import sharp from 'sharp';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { multipart } from '../multipart';
import { startTestHub, type TestHub } from '../test-hub';

/** A real image of `width` x `height` pixels in the given format. */
function image(format: 'jpeg' | 'png' | 'webp', width = 800, height = 600): Promise<Buffer> {
  const blank = sharp({ create: { width, height, channels: 3, background: '#c86414' } });
  return blank.toFormat(format).toBuffer();
}

describe('valve photos', () => {
  let hub: TestHub;
  let tech: string;
  let viewer: string;
  let valveId: number;
  let uploads: string;

  beforeAll(async () => {
    hub = await startTestHub();
    [tech, viewer] = await Promise.all([hub.token('tech'), hub.token('viewer')]);
    valveId = (
      await hub.api
        .post('/api/valves')
        .set('authorization', `Bearer ${tech}`)
        .send({ type: 'EL34' })
        .expect(201)
    ).body.id;
    uploads = path.join(hub.config.dataDir, 'uploads');
  });
  afterAll(() => hub.close());

  const files = () => (existsSync(uploads) ? readdirSync(uploads).sort() : []);
  const rows = () => hub.services.db.selectFrom('attachments').selectAll().execute();

  function upload(filename: string, contentType: string, data: Buffer, token = tech) {
    const form = multipart([{ name: 'photo', filename, contentType, data }]);
    return hub.api
      .post(`/api/valves/${valveId}/photos`)
      .set('authorization', `Bearer ${token}`)
      .set('content-type', form.contentType)
      .send(form.body);
  }

  it('stores a photo under a generated name with a thumbnail, and serves both', async () => {
    const res = await upload('front of the box.jpg', 'image/jpeg', await image('jpeg')).expect(201);
    expect(res.body).toMatchObject({
      valveId,
      originalName: 'front of the box.jpg',
      mime: 'image/jpeg',
      width: 800,
      height: 600,
      uploadedBy: 'tech',
    });
    const [row] = await rows();
    expect(row.stored_name).toMatch(/^[0-9a-f-]{36}\.jpg$/);
    expect(files()).toEqual([row.stored_name, row.thumb_name].sort());

    const full = await hub.api
      .get(res.body.url)
      .set('authorization', `Bearer ${viewer}`)
      .buffer(true)
      .expect(200);
    expect(full.headers['content-type']).toBe('image/jpeg');
    expect(full.body.length).toBe(res.body.bytes);
    const thumb = await hub.api
      .get(res.body.thumbUrl)
      .set('authorization', `Bearer ${viewer}`)
      .buffer(true)
      .expect(200);
    const meta = await sharp(thumb.body).metadata();
    expect([meta.format, meta.width, meta.height]).toEqual(['webp', 320, 240]);
    await hub.api.get(res.body.url).expect(401);

    const listed = await hub.api
      .get(`/api/valves/${valveId}/photos`)
      .set('authorization', `Bearer ${viewer}`)
      .expect(200);
    expect(listed.body.map((p: { id: number }) => p.id)).toEqual([res.body.id]);
  });

  it('accepts PNG and WebP by their content', async () => {
    for (const format of ['png', 'webp'] as const) {
      const res = await upload(
        `p.${format}`,
        'application/octet-stream',
        await image(format, 40, 30),
      ).expect(201);
      expect(res.body).toMatchObject({ mime: `image/${format}`, width: 40, height: 30 });
    }
  });

  describe('refusals leave no file and no row behind', () => {
    let before: { files: string[]; rows: number };
    const same = async () => {
      expect(files()).toEqual(before.files);
      expect((await rows()).length).toBe(before.rows);
    };
    beforeAll(async () => {
      before = { files: files(), rows: (await rows()).length };
    });

    it('refuses a file that is not an image, whatever its name and media type say', async () => {
      const text = Buffer.from('just some text pretending to be a picture');
      const res = await upload('fake.png', 'image/png', text).expect(415);
      expect(res.body.error.code).toBe('not_an_image');
      expect(res.body.error.fields).toHaveProperty('photo');
      const gif = Buffer.from('GIF89a\u0001\u0000\u0001\u0000\u0000\u0000\u0000;', 'latin1');
      await upload('anim.gif', 'image/gif', gif).expect(415);
      const broken = Buffer.concat([(await image('png')).subarray(0, 40)]);
      const damaged = await upload('cut.png', 'image/png', broken).expect(415);
      expect(damaged.body.error.fields.photo).toContain('damaged');
      await same();
    });

    it('refuses a photo over 5 MiB', async () => {
      const png = await image('png', 16, 16);
      const big = Buffer.concat([png, Buffer.alloc(5 * 1024 * 1024)]);
      const res = await upload('big.png', 'image/png', big).expect(413);
      expect(res.body.error).toMatchObject({
        code: 'file_too_large',
        fields: { photo: 'at most 5 MiB' },
      });
      await same();
    });

    it('refuses a file name that carries a path', async () => {
      const png = await image('png', 16, 16);
      for (const name of ['../../x.png', '..\\..\\x.png', '/etc/x.png', '..']) {
        const res = await upload(name, 'image/png', png).expect(400);
        expect(res.body.error).toMatchObject({ code: 'unsafe_file_name' });
        expect(res.body.error.fields).toHaveProperty('photo');
      }
      expect(existsSync(path.join(hub.config.dataDir, '..', 'x.png'))).toBe(false);
      await same();
    });

    it('refuses a missing file, a viewer and an unknown valve', async () => {
      const empty = multipart([{ name: 'note', value: 'no file here' }]);
      const res = await hub.api
        .post(`/api/valves/${valveId}/photos`)
        .set('authorization', `Bearer ${tech}`)
        .set('content-type', empty.contentType)
        .send(empty.body)
        .expect(400);
      expect(res.body.error.fields).toHaveProperty('photo');
      const png = await image('png', 16, 16);
      await upload('v.png', 'image/png', png, viewer).expect(403);
      const form = multipart([
        { name: 'photo', filename: 'v.png', contentType: 'image/png', data: png },
      ]);
      await hub.api
        .post('/api/valves/99999/photos')
        .set('authorization', `Bearer ${tech}`)
        .set('content-type', form.contentType)
        .send(form.body)
        .expect(404);
      await same();
    });
  });

  it('deletes a photo with its files, and all photos with their valve', async () => {
    const [first, ...rest] = await rows();
    await hub.api
      .delete(`/api/photos/${first.id}`)
      .set('authorization', `Bearer ${viewer}`)
      .expect(403);
    await hub.api
      .delete(`/api/photos/${first.id}`)
      .set('authorization', `Bearer ${tech}`)
      .expect(204);
    expect(files()).not.toContain(first.stored_name);
    expect(files()).not.toContain(first.thumb_name);
    expect(rest.length).toBeGreaterThan(0);
    await hub.api
      .delete(`/api/valves/${valveId}`)
      .set('authorization', `Bearer ${await hub.token('admin')}`)
      .expect(204);
    expect(files()).toEqual([]);
    expect(await rows()).toEqual([]);
  });
});
