export interface Cluster {
  bin: string;
  dataDir: string;
  port: number;
  startedHere: boolean;
  url: (db: string) => string;
  stop: () => void;
}
export function ensurePostgresInstalled(): string;
export function dataDirFor(projectDir: string, name: string): string;
export function startCluster(options: { projectDir: string; name: string; port: number }): Cluster;
export function stopCluster(bin: string, dataDir: string): void;
export function ensureDatabase(cluster: Cluster, db: string): void;
