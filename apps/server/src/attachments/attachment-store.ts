import { createHash, randomBytes } from 'node:crypto';
import { createReadStream, type ReadStream } from 'node:fs';
import { mkdir, open, readFile, rename, rm, stat } from 'node:fs/promises';
import path from 'node:path';
import { Inject, Injectable } from '@nestjs/common';
import { APP_CONFIG } from '../config/config.module.js';
import type { AppConfig } from '../config/config.js';

const DIGEST = /^[0-9a-f]{64}$/;

/**
 * Files on disk under DATA_DIR/uploads, named by the SHA-256 of their bytes: the same bytes are
 * kept once however often they are attached, and a name can be checked against its contents.
 */
@Injectable()
export class AttachmentStore {
  readonly dir: string;

  constructor(@Inject(APP_CONFIG) config: AppConfig) {
    this.dir = path.join(config.dataDir, 'uploads');
  }

  pathOf(sha256: string): string {
    if (!DIGEST.test(sha256)) throw new Error(`Not a SHA-256 digest: ${sha256}`);
    return path.join(this.dir, sha256);
  }

  /**
   * Writes the bytes unless a file with their digest is there already. A temporary file, synced
   * and then renamed, so a crash never leaves a half-written file under a digest name.
   */
  async put(sha256: string, bytes: Buffer): Promise<{ written: boolean }> {
    const target = this.pathOf(sha256);
    await mkdir(this.dir, { recursive: true, mode: 0o700 });
    // Kept only when it still holds these bytes: a file changed on disk is written again.
    const existing = await readFile(target).catch(() => undefined);
    if (existing && createHash('sha256').update(existing).digest('hex') === sha256) return { written: false };
    const temp = path.join(this.dir, `.${sha256}.${randomBytes(6).toString('hex')}.tmp`);
    try {
      const file = await open(temp, 'wx', 0o600);
      try {
        await file.writeFile(bytes);
        await file.sync();
      } finally {
        await file.close();
      }
      await rename(temp, target);
    } catch (err) {
      await rm(temp, { force: true });
      throw err;
    }
    return { written: true };
  }

  async size(sha256: string): Promise<number | undefined> {
    const info = await stat(this.pathOf(sha256)).catch(() => undefined);
    return info?.isFile() ? info.size : undefined;
  }

  read(sha256: string): ReadStream {
    return createReadStream(this.pathOf(sha256));
  }

  /** The whole file (attachments are capped at ATTACHMENT_MAX_MB), or undefined when it is missing. */
  async readAll(sha256: string): Promise<Buffer | undefined> {
    try {
      return await readFile(this.pathOf(sha256));
    } catch (err) {
      if ((err as NodeJS.ErrnoException).code === 'ENOENT') return undefined;
      throw err;
    }
  }
}
