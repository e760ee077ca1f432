import { createHash } from 'node:crypto';
import type { INestApplication } from '@nestjs/common';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { as, binary, makeCaller, type Caller } from './support/sessions';
import { createTestApp } from './support/test-app';

// The smallest well-formed files of each kind, by their published signatures (PDF 1.4 header, PNG
// signature per RFC 2083 section 3.1, JPEG SOI/JFIF): enough for the content to say what it is.
const PDF = Buffer.from('%PDF-1.4\n1 0 obj<<>>endobj\ntrailer<<>>\n%%EOF\n');
const PNG = Buffer.concat([
  Buffer.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a]),
  Buffer.from('0000000d49484452000000010000000108060000001f15c489', 'hex'),
]);
const ELF = Buffer.concat([Buffer.from([0x7f, 0x45, 0x4c, 0x46, 2, 1, 1, 0]), Buffer.alloc(56)]);

describe('attachments', () => {
  let app: INestApplication;
  let engineer: Caller;
  let checker: Caller;
  let outsider: Caller;
  let sheetId: string;

  beforeAll(async () => {
    app = await createTestApp();
    engineer = await makeCaller(app, ['engineer']);
    checker = await makeCaller(app, ['checker'], engineer.firm);
    outsider = await makeCaller(app, ['owner', 'engineer']);
    const project = await as(app, engineer, 'post', '/api/projects')
      .send({ jobNumber: 'A-1', title: 'Attachments', clientOrganisation: 'Client', site: 'Site' })
      .expect(201);
    const sheet = await as(app, engineer, 'post', `/api/projects/${project.body.id}/sheets`).send({ number: 'C-1', title: 'With files' }).expect(201);
    sheetId = sheet.body.id;
  });
  afterAll(async () => {
    await app?.close();
  });

  const upload = (who: Caller, content: Buffer, name: string) => as(app, who, 'post', `/api/sheets/${sheetId}/attachments`).attach('file', content, name);

  it('stores a PDF in the object store with its SHA-256, and gives the same bytes back through the API', async () => {
    const res = await upload(engineer, PDF, 'datasheet.pdf').expect(201);
    expect(res.body).toMatchObject({
      fileName: 'datasheet.pdf',
      mediaType: 'application/pdf',
      size: PDF.length,
      sha256: createHash('sha256').update(PDF).digest('hex'),
    });
    const list = await as(app, checker, 'get', `/api/sheets/${sheetId}/attachments`).expect(200);
    expect(list.body.map((a: { id: string }) => a.id)).toContain(res.body.id);
    const down = await binary(as(app, checker, 'get', `/api/attachments/${res.body.id}/download`)).expect(200);
    expect(Buffer.compare(down.body as Buffer, PDF)).toBe(0);
    expect(down.headers['content-disposition']).toMatch(/^attachment; filename="datasheet.pdf"/);
    expect(down.headers['x-content-type-options']).toBe('nosniff');
  });

  it('judges the type by the content: a PNG named .pdf and a program named .png are refused, nothing stored', async () => {
    const before = (await as(app, engineer, 'get', `/api/sheets/${sheetId}/attachments`)).body.length;
    const lying = await upload(engineer, PNG, 'drawing.pdf').expect(415);
    expect(lying.body.message).toMatch(/ends in \.pdf but its content is image\/png/);
    const program = await upload(engineer, ELF, 'photo.png').expect(415);
    expect(program.body.message).toMatch(/not a kind of file Ampwright keeps/);
    const textAsExe = await upload(engineer, Buffer.from('echo hi\n'), 'run.sh').expect(415);
    expect(textAsExe.body.message).toMatch(/text is kept as/);
    await upload(engineer, PNG, 'drawing.png').expect(201);
    expect((await as(app, engineer, 'get', `/api/sheets/${sheetId}/attachments`)).body.length).toBe(before + 1);
  });

  it('refuses a file over 25 MB with 413 and a sentence, and an empty or missing file with 400', async () => {
    const big = Buffer.alloc(25 * 1024 * 1024 + 1, 0x20);
    const res = await upload(engineer, big, 'big.txt').expect(413);
    expect(res.body.message).toBe('The file is larger than the 25 MB limit; nothing was stored.');
    await upload(engineer, Buffer.alloc(0), 'empty.txt').expect(400);
    await as(app, engineer, 'post', `/api/sheets/${sheetId}/attachments`).send({}).expect(400);
  });

  it('keeps only the last part of a file name with folders in it', async () => {
    const res = await upload(engineer, Buffer.from('a,b\n1,2\n'), '../../etc/readings.csv').expect(201);
    expect(res.body.fileName).toBe('readings.csv');
    expect(res.body.mediaType).toBe('text/csv');
  });

  it('lets no other firm list, download or delete them', async () => {
    const list = (await as(app, engineer, 'get', `/api/sheets/${sheetId}/attachments`)).body as { id: string }[];
    await as(app, outsider, 'get', `/api/sheets/${sheetId}/attachments`).expect(404);
    await as(app, outsider, 'get', `/api/attachments/${list[0].id}/download`).expect(404);
    await as(app, outsider, 'delete', `/api/attachments/${list[0].id}`).expect(404);
    await upload(outsider, PDF, 'x.pdf').expect(404);
  });

  it('removes an attachment from the list when an engineer deletes it', async () => {
    const res = await upload(engineer, PDF, 'old.pdf').expect(201);
    await as(app, engineer, 'delete', `/api/attachments/${res.body.id}`).expect(204);
    const list = (await as(app, engineer, 'get', `/api/sheets/${sheetId}/attachments`)).body as { id: string }[];
    expect(list.map((a) => a.id)).not.toContain(res.body.id);
  });
});
