import { mkdir, readFile, readdir, rename, writeFile } from 'node:fs/promises';
import { join } from 'node:path';
import type { DeliveryAttempt, RunRecord } from '@keelson/verify';
import { SourceError } from './errors';

/** A stored run as a listing shows it. */
export interface RunEntry {
  readonly id: string;
  readonly catalogue: string;
  readonly startedAt: string;
  readonly summary: RunRecord['summary'];
}

/** Where runs are kept: JSON files today; the interface lets a database take over. */
export interface RunHistory {
  save(key: string, run: RunRecord): Promise<void>;
  load(id: string): Promise<RunRecord>;
  /** Runs of one catalogue (or all), oldest first. */
  list(key?: string): Promise<RunEntry[]>;
  latest(key: string): Promise<RunRecord | null>;
  /** The run before `id` of the same catalogue, or null. */
  previous(id: string): Promise<RunRecord | null>;
  keyOf(id: string): Promise<string>;
  appendDeliveries(id: string, attempts: readonly DeliveryAttempt[]): Promise<void>;
  deliveries(id: string): Promise<DeliveryAttempt[]>;
}

const RUN_ID = /^[0-9]{8}T[0-9]{6}Z-[0-9a-f]{6}$/;
const KEY = /^[A-Za-z0-9._-]+$/;

/**
 * Run history as files: `<dataDir>/verify/<catalogue key>/<run id>.json`, one document per run,
 * written whole to a temporary name and renamed (a crash never leaves half a run). Run ids sort by
 * start time, so a directory listing is the history in order. Delivery logs sit beside their run.
 */
export class FileRunHistory implements RunHistory {
  private readonly root: string;

  constructor(dataDir: string) {
    this.root = join(dataDir, 'verify');
  }

  private async keys(): Promise<string[]> {
    // Catalogue folders only: the service keeps its registry and uploads beside them.
    const entries = await readdir(this.root, { withFileTypes: true }).catch((e: NodeJS.ErrnoException) => (e.code === 'ENOENT' ? [] : Promise.reject(e)));
    return entries
      .filter((e) => e.isDirectory() && KEY.test(e.name))
      .map((e) => e.name)
      .sort();
  }

  private async ids(key: string): Promise<string[]> {
    const names = await readdir(join(this.root, key)).catch((e: NodeJS.ErrnoException) => (e.code === 'ENOENT' ? [] : Promise.reject(e)));
    return names.filter((n) => n.endsWith('.json') && RUN_ID.test(n.slice(0, -5))).map((n) => n.slice(0, -5)).sort();
  }

  /** The catalogue key a run is stored under; SourceError RUN_NOT_FOUND when there is none. */
  async keyOf(id: string): Promise<string> {
    if (RUN_ID.test(id)) for (const key of await this.keys()) if ((await this.ids(key)).includes(id)) return key;
    throw new SourceError('RUN_NOT_FOUND', id, `no stored run with this id under ${this.root}`);
  }

  private async write(file: string, text: string): Promise<void> {
    const tmp = `${file}.${process.pid}.tmp`;
    await writeFile(tmp, text);
    await rename(tmp, file);
  }

  async save(key: string, run: RunRecord): Promise<void> {
    if (!KEY.test(key) || !RUN_ID.test(run.id)) throw new Error(`bad history key "${key}" or run id "${run.id}"`);
    await mkdir(join(this.root, key), { recursive: true });
    await this.write(join(this.root, key, `${run.id}.json`), JSON.stringify(run));
  }

  async load(id: string): Promise<RunRecord> {
    const key = await this.keyOf(id);
    return JSON.parse(await readFile(join(this.root, key, `${id}.json`), 'utf8')) as RunRecord;
  }

  async list(key?: string): Promise<RunEntry[]> {
    const out: RunEntry[] = [];
    for (const k of key ? [key] : await this.keys())
      for (const id of await this.ids(k)) {
        const run = JSON.parse(await readFile(join(this.root, k, `${id}.json`), 'utf8')) as RunRecord;
        out.push({ id, catalogue: k, startedAt: run.startedAt, summary: run.summary });
      }
    return out.sort((a, b) => (a.id < b.id ? -1 : 1));
  }

  async latest(key: string): Promise<RunRecord | null> {
    const id = (await this.ids(key)).at(-1);
    return id ? this.load(id) : null;
  }

  async previous(id: string): Promise<RunRecord | null> {
    const ids = await this.ids(await this.keyOf(id));
    const before = ids[ids.indexOf(id) - 1];
    return before ? this.load(before) : null;
  }

  async appendDeliveries(id: string, attempts: readonly DeliveryAttempt[]): Promise<void> {
    const file = join(this.root, await this.keyOf(id), `${id}.deliveries.json`);
    await this.write(file, JSON.stringify([...(await this.deliveries(id)), ...attempts]));
  }

  async deliveries(id: string): Promise<DeliveryAttempt[]> {
    const file = join(this.root, await this.keyOf(id), `${id}.deliveries.json`);
    return readFile(file, 'utf8').then(
      (t) => JSON.parse(t) as DeliveryAttempt[],
      (e: NodeJS.ErrnoException) => (e.code === 'ENOENT' ? [] : Promise.reject(e)),
    );
  }
}
