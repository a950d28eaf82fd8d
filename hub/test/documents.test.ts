import { randomBytes } from 'node:crypto';
import { readFile, stat } from 'node:fs/promises';
import { join } from 'node:path';
import {
  apiErrorSchema,
  materialDocumentSchema,
  MAX_DOCUMENT_BYTES,
  type Material,
  type MaterialDocument,
} from '@tareline/protocol';
import * as tar from 'tar';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { restoreBackup } from '../src/backup/backup.js';
import { badgeSignIn, call, DEMO, login } from './support/auth-helpers.js';
import { startTestHub, tempDataDir, type TestHub } from './support/test-app.js';

/** A small PDF: the `%PDF-` header (ISO 32000-1, 7.5.2), binary bytes, the end marker. */
function pdfBytes(size = 4096): Buffer {
  const head = Buffer.from('%PDF-1.7\n%\xe2\xe3\xcf\xd3\n', 'latin1');
  const tail = Buffer.from('\n%%EOF\n');
  return Buffer.concat([head, randomBytes(size - head.length - tail.length), tail]);
}

/** The eight-byte PNG signature (ISO/IEC 15948, 5.2) and some bytes after it. */
const PNG = Buffer.concat([
  Buffer.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a]),
  randomBytes(2000),
]);

describe('material data sheets', () => {
  let data: Awaited<ReturnType<typeof tempDataDir>>;
  let hub: TestHub;
  let lead: string;
  let operator: string;
  let material: Material;

  beforeAll(async () => {
    data = await tempDataDir();
    hub = await startTestHub(data.dir, { TARELINE_SIGN_IN_LIMIT: '1000' });
    lead = await login(hub, DEMO.lead.email, DEMO.lead.password);
    operator = (await badgeSignIn(hub, DEMO.joss.badge)).body.token;
    const materials = await call<Material[]>(hub, 'GET', '/api/materials', { token: lead });
    material = materials.body[0]!;
  });

  afterAll(async () => {
    await hub?.close();
    await data?.remove();
  });

  function upload(
    bytes: Buffer,
    options: {
      kind?: string;
      name?: string;
      type?: string;
      token?: string;
      materialId?: string;
    } = {},
  ) {
    const form = new FormData();
    if (options.kind !== '') form.append('kind', options.kind ?? 'sds');
    form.append(
      'file',
      new Blob([bytes], { type: options.type ?? 'application/pdf' }),
      options.name ?? 'sheet.pdf',
    );
    return fetch(`${hub.url}/api/materials/${options.materialId ?? material.id}/documents`, {
      method: 'POST',
      headers: { Authorization: `Bearer ${options.token ?? lead}` },
      body: form,
    });
  }

  async function errorOf(res: Response) {
    return apiErrorSchema.parse(await res.json());
  }

  const uploaded: { doc: MaterialDocument; bytes: Buffer }[] = [];

  it('takes a PDF from a lead and streams the same bytes to anyone signed in', async () => {
    const bytes = pdfBytes(300_000);
    const res = await upload(bytes, { name: 'SDS resin, rev 3.pdf' });
    expect(res.status).toBe(201);
    const doc = materialDocumentSchema.parse(await res.json());
    uploaded.push({ doc, bytes });
    expect(doc).toMatchObject({ kind: 'sds', sizeBytes: bytes.length, materialId: material.id });
    expect(doc.uploadedBy.name).toBe('Ilse Varga');

    const got = await fetch(`${hub.url}/api/documents/${doc.id}`, {
      headers: { Authorization: `Bearer ${operator}` },
    });
    expect(got.status).toBe(200);
    expect(got.headers.get('content-type')).toBe('application/pdf');
    expect(Buffer.from(await got.arrayBuffer()).equals(bytes)).toBe(true);
  });

  it('keeps the file under the data folder, private to the hub', async () => {
    const { doc, bytes } = uploaded[0]!;
    const path = join(data.dir, 'documents', `${doc.id}.pdf`);
    expect((await readFile(path)).equals(bytes)).toBe(true);
    expect((await stat(path)).mode & 0o777).toBe(0o600);
    expect((await stat(join(data.dir, 'documents'))).mode & 0o777).toBe(0o700);
  });

  it('lists every version, newest first, with its upload date', async () => {
    const second = await upload(pdfBytes(), { name: 'sds-rev4.pdf' });
    expect(second.status).toBe(201);
    const tds = await upload(pdfBytes(), { kind: 'tds', name: 'tds.pdf' });
    expect(tds.status).toBe(201);
    const list = await call<MaterialDocument[]>(
      hub,
      'GET',
      `/api/materials/${material.id}/documents`,
      { token: operator },
    );
    expect(list.status).toBe(200);
    expect(list.body.map((d) => d.fileName)).toEqual([
      'tds.pdf',
      'sds-rev4.pdf',
      'SDS resin, rev 3.pdf',
    ]);
    for (const d of list.body) expect(Date.parse(d.uploadedAt)).not.toBeNaN();
  });

  it('refuses a PNG named .pdf and sent as application/pdf with 415, in words', async () => {
    const res = await upload(PNG, { name: 'sds.pdf', type: 'application/pdf' });
    expect(res.status).toBe(415);
    expect((await errorOf(res)).message).toMatch(/not a PDF/);
  });

  it('refuses a file over 20 MB with 413, in words', async () => {
    const big = Buffer.concat([pdfBytes(), Buffer.alloc(MAX_DOCUMENT_BYTES)]);
    const res = await upload(big);
    expect(res.status).toBe(413);
    expect((await errorOf(res)).message).toMatch(/larger than 20 MB/);
  });

  it('refuses a missing file, an unknown kind, an unknown material and an operator', async () => {
    const noFile = await fetch(`${hub.url}/api/materials/${material.id}/documents`, {
      method: 'POST',
      headers: { Authorization: `Bearer ${lead}` },
      body: (() => {
        const f = new FormData();
        f.append('kind', 'sds');
        return f;
      })(),
    });
    expect(noFile.status).toBe(400);
    expect((await errorOf(noFile)).errors.map((e) => e.path)).toEqual(['file']);

    const badKind = await upload(pdfBytes(), { kind: 'msds' });
    expect(badKind.status).toBe(400);
    expect((await errorOf(badKind)).errors.map((e) => e.path)).toEqual(['kind']);

    const noMaterial = await upload(pdfBytes(), { materialId: 'no-such-material' });
    expect(noMaterial.status).toBe(404);

    expect((await upload(pdfBytes(), { token: operator })).status).toBe(403);
  });

  it('answers 401 to anyone not signed in, and opens by a fresh signed link only', async () => {
    const { doc, bytes } = uploaded[0]!;
    const anonymous = await fetch(`${hub.url}/api/documents/${doc.id}`);
    expect(anonymous.status).toBe(401);

    // What the station puts behind the SDS button: a tab opens it without the token.
    const opened = await fetch(`${hub.url}${doc.openUrl}`);
    expect(opened.status).toBe(200);
    expect(opened.headers.get('content-type')).toBe('application/pdf');
    expect(Buffer.from(await opened.arrayBuffer()).equals(bytes)).toBe(true);

    const [, link] = doc.openUrl.split('?link=');
    const tampered = link!.replace(/.$/u, (c) => (c === 'A' ? 'B' : 'A'));
    expect((await fetch(`${hub.url}/api/documents/${doc.id}/open?link=${tampered}`)).status).toBe(
      401,
    );
    // A link made for one sheet opens no other.
    const other = (
      await call<MaterialDocument[]>(hub, 'GET', `/api/materials/${material.id}/documents`, {
        token: lead,
      })
    ).body.find((d) => d.id !== doc.id)!;
    expect((await fetch(`${hub.url}/api/documents/${other.id}/open?link=${link}`)).status).toBe(
      401,
    );
  });

  it('is in the backup, and comes back with a restore', async () => {
    const admin = await login(hub, DEMO.admin.email, DEMO.admin.password);
    const res = await fetch(`${hub.url}/api/backup`, {
      headers: { Authorization: `Bearer ${admin}` },
    });
    expect(res.status).toBe(200);
    const backup = Buffer.from(await res.arrayBuffer());
    const restored = await tempDataDir();
    try {
      await restoreBackup(restored.dir, backup);
      const { doc, bytes } = uploaded[0]!;
      const copy = await readFile(join(restored.dir, 'documents', `${doc.id}.pdf`));
      expect(copy.equals(bytes)).toBe(true);
    } finally {
      await restored.remove();
    }
    // tar is how the backup is written; listing it names the folder.
    const names: string[] = [];
    const { Readable } = await import('node:stream');
    await new Promise<void>((resolve, reject) => {
      Readable.from(backup)
        .pipe(tar.t({ onReadEntry: (e) => names.push(e.path) }))
        .on('finish', resolve)
        .on('error', reject);
    });
    expect(names.some((n) => n.startsWith('documents/'))).toBe(true);
  });
});
