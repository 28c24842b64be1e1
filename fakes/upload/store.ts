/**
 * Files on disk for the upload fake: `<key>.bin` holds the bytes, `<key>.json` the
 * metadata. A file exists once its JSON exists (written last, atomically), so a
 * restart sees exactly the completed uploads.
 */
import { randomBytes } from "node:crypto";
import { mkdir, readdir, readFile, rename, rm, writeFile } from "node:fs/promises";
import path from "node:path";

export type Acl = "public-read" | "private";

export type StoredFile = {
  key: string;
  name: string;
  size: number;
  type: string;
  customId: string | null;
  acl: Acl;
  contentDisposition: "inline" | "attachment";
  /** md5 of the bytes, lowercase hex */
  fileHash: string;
  uploadedAt: number;
  appId: string;
};

const KEY_RE = /^[A-Za-z0-9_-]{8,200}$/;

export function isValidKey(key: string): boolean {
  return KEY_RE.test(key);
}

export class FileStore {
  constructor(readonly dir: string) {}

  async init(): Promise<void> {
    await mkdir(this.dir, { recursive: true });
  }

  bytesPath(key: string): string {
    return path.join(this.dir, `${key}.bin`);
  }

  private metaPath(key: string): string {
    return path.join(this.dir, `${key}.json`);
  }

  /** A fresh temporary path for an upload in progress. */
  tempPath(key: string): string {
    return path.join(this.dir, `${key}.${randomBytes(6).toString("hex")}.part`);
  }

  async get(key: string): Promise<StoredFile | null> {
    if (!isValidKey(key)) return null;
    try {
      return JSON.parse(await readFile(this.metaPath(key), "utf8")) as StoredFile;
    } catch (e) {
      if ((e as NodeJS.ErrnoException).code === "ENOENT") return null;
      throw e;
    }
  }

  /** Moves the finished temp file into place and records its metadata. */
  async commit(tempPath: string, meta: StoredFile): Promise<void> {
    await rename(tempPath, this.bytesPath(meta.key));
    await this.writeMeta(meta);
  }

  async writeMeta(meta: StoredFile): Promise<void> {
    const tmp = `${this.metaPath(meta.key)}.${randomBytes(4).toString("hex")}.tmp`;
    await writeFile(tmp, JSON.stringify(meta, null, 1));
    await rename(tmp, this.metaPath(meta.key));
  }

  async list(): Promise<StoredFile[]> {
    const names = await readdir(this.dir).catch(() => [] as string[]);
    const out: StoredFile[] = [];
    for (const n of names) {
      if (!n.endsWith(".json")) continue;
      const f = await this.get(n.slice(0, -5));
      if (f) out.push(f);
    }
    return out.sort((a, b) => a.uploadedAt - b.uploadedAt || a.key.localeCompare(b.key));
  }

  async findByCustomId(customId: string): Promise<StoredFile | null> {
    return (await this.list()).find((f) => f.customId === customId) ?? null;
  }

  async delete(key: string): Promise<boolean> {
    if (!(await this.get(key))) return false;
    await rm(this.metaPath(key), { force: true });
    await rm(this.bytesPath(key), { force: true });
    return true;
  }

  async discard(tempPath: string): Promise<void> {
    await rm(tempPath, { force: true });
  }
}
