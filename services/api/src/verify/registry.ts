import { randomBytes } from 'node:crypto';
import { mkdir, readFile, rename, writeFile } from 'node:fs/promises';
import { join } from 'node:path';

/** A catalogue the service verifies: a server folder an admin allowed, or an uploaded ZIP. */
export interface CatalogueRecord {
  readonly id: string;
  readonly tenant: string;
  readonly name: string;
  readonly kind: 'folder' | 'upload';
  /** The folder, or where the uploaded archive is kept. */
  readonly path: string;
  /** Key of its run history (a folder shares it with `keelson verify` of the same folder). */
  readonly historyKey: string;
  readonly schedule: { readonly cron: string; readonly timezone?: string } | null;
  /** Where finished runs are announced; the secret signs them. */
  readonly webhook: { readonly url: string; readonly secret: string } | null;
  readonly createdAt: string;
}

/**
 * The registered catalogues, one JSON file in the data folder (`verify/catalogues.json`), rewritten
 * whole to a temporary name and renamed on every change; changes are serialised. Small by nature:
 * a plant has a handful of catalogues, each of hundreds to thousands of drawings.
 */
export class CatalogueRegistry {
  private readonly file: string;
  private records = new Map<string, CatalogueRecord>();
  private writing: Promise<void> = Promise.resolve();

  constructor(private readonly dir: string) {
    this.file = join(dir, 'catalogues.json');
  }

  async load(): Promise<void> {
    const text = await readFile(this.file, 'utf8').catch((e: NodeJS.ErrnoException) => (e.code === 'ENOENT' ? '[]' : Promise.reject(e)));
    this.records = new Map((JSON.parse(text) as CatalogueRecord[]).map((r) => [r.id, r]));
  }

  all(): CatalogueRecord[] {
    return [...this.records.values()];
  }

  list(tenant: string): CatalogueRecord[] {
    return this.all().filter((r) => r.tenant === tenant);
  }

  get(tenant: string, id: string): CatalogueRecord | undefined {
    const r = this.records.get(id);
    return r?.tenant === tenant ? r : undefined;
  }

  static newId(): string {
    return `cat_${randomBytes(6).toString('hex')}`;
  }

  async put(r: CatalogueRecord): Promise<void> {
    this.records.set(r.id, r);
    await this.persist();
  }

  private persist(): Promise<void> {
    const text = JSON.stringify(this.all(), null, 2);
    this.writing = this.writing.then(async () => {
      await mkdir(this.dir, { recursive: true });
      const tmp = `${this.file}.${process.pid}.tmp`;
      // The file holds webhook secrets: readable by the service's user only.
      await writeFile(tmp, text, { mode: 0o600 });
      await rename(tmp, this.file);
    });
    return this.writing;
  }
}
