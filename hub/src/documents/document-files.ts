import { createReadStream, type ReadStream } from 'node:fs';
import { chmod, mkdir, rename, rm, stat, writeFile } from 'node:fs/promises';
import { join } from 'node:path';
import { Inject, Injectable } from '@nestjs/common';
import { APP_CONFIG, type AppConfig } from '../config/app-config.js';

/** Folder of the data sheets inside the data folder; the backup copies it by this name. */
export const DOCUMENTS_FOLDER = 'documents';

/**
 * The PDFs on disk: `<data folder>/documents/<id>.pdf`, out of the station's web root, private to
 * the hub's user like the rest of the data folder (folder 0700, files 0600).
 */
@Injectable()
export class DocumentFiles {
  private readonly dir: string;

  constructor(@Inject(APP_CONFIG) config: AppConfig) {
    this.dir = join(config.data.dir, DOCUMENTS_FOLDER);
  }

  private pathOf(id: string): string {
    // Ids are the database's UUIDs; anything else never reaches the file system.
    if (!/^[0-9a-f-]{36}$/u.test(id)) throw new Error(`Not a document id: ${id}`);
    return join(this.dir, `${id}.pdf`);
  }

  /** Writes the whole file under a temporary name first, so a reader never sees half of it. */
  async write(id: string, bytes: Uint8Array): Promise<void> {
    await mkdir(this.dir, { recursive: true, mode: 0o700 });
    await chmod(this.dir, 0o700);
    const path = this.pathOf(id);
    const partial = `${path}.partial`;
    await writeFile(partial, bytes, { mode: 0o600 });
    await chmod(partial, 0o600);
    await rename(partial, path);
  }

  async remove(id: string): Promise<void> {
    await rm(this.pathOf(id), { force: true });
  }

  /** The file as a stream and its size; undefined when it is not on disk. */
  async open(id: string): Promise<{ stream: ReadStream; sizeBytes: number } | undefined> {
    const path = this.pathOf(id);
    const info = await stat(path).catch((err: NodeJS.ErrnoException) => {
      if (err.code === 'ENOENT') return undefined;
      throw err;
    });
    if (!info) return undefined;
    return { stream: createReadStream(path), sizeBytes: info.size };
  }
}
