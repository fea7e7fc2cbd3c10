// Types for cluster.mjs, which stays plain JavaScript because it runs before node_modules exists.
export class ClusterError extends Error {}
export type Cluster = {
  dir: string;
  pgdata: string;
  port: number;
  bin: string;
  url: (database: string) => string;
  stop: () => void;
  startedHere: boolean;
};
export function findPgBin(): string | null;
export function ensurePostgres(): string;
export function persistentClusterDir(projectDir: string): string;
export function throwawayClusterDir(): string;
export function freePort(): Promise<number>;
export function startCluster(opts: {
  dir: string;
  port: number;
  bin?: string;
  settings?: Record<string, string | number>;
  /** A folder to archive WAL into, 'off', or undefined to keep what the last start set. */
  walArchive?: string;
  /** Start a cluster laid out from a base backup as a recovery to `targetTime` from `archiveDir`. */
  recovery?: { archiveDir: string; targetTime: string };
}): Promise<Cluster>;
/** A hot standby of `primary`, streaming its WAL, started on `port` (pg_basebackup -X stream -R). */
export function startStandby(opts: { primary: Cluster; dir: string; port: number; bin?: string }): Promise<Cluster>;
export function walArchiveOf(pgdata: string): string | null;
export function chownToServer(dir: string): void;
export function ensureDatabase(cluster: Cluster, database: string): Promise<void>;
