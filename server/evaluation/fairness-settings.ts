/**
 * How the evaluation workers are shared. Read from the environment once per pool (the
 * defaults suit a small machine):
 *
 * | variable | default | meaning |
 * | --- | --- | --- |
 * | EVALUATION_BUDGET_MS | 60000 | total time for all of a worksheet's statements |
 * | EVALUATION_CAP_PER_USER | 3 | evaluations one account may have running or queued, over all server processes |
 * | EVALUATION_CAP_PER_REFEREE_LINK | 2 | the same for one referee link |
 * | EVALUATION_EXTRA_WORKERS | 1 | workers beyond EVALUATION_WORKERS while several owners wait |
 * | REPORT_STATEMENT_BYTES | 262144 | largest record of one statement (JSON) |
 * | REPORT_BYTES | 2097152 | largest report of a worksheet (JSON, all statements) |
 */
export interface FairnessSettings {
  worksheetBudgetMs: number;
  capPerUser: number;
  capPerRefereeLink: number;
  extraWorkers: number;
  statementBytes: number;
  reportBytes: number;
}

const num = (env: NodeJS.ProcessEnv, name: string, fallback: number, min = 0) => {
  const v = Number(env[name]);
  return Number.isFinite(v) && env[name] !== undefined && env[name] !== '' ? Math.max(min, v) : fallback;
};

export function fairnessSettings(env: NodeJS.ProcessEnv = process.env): FairnessSettings {
  return {
    worksheetBudgetMs: num(env, 'EVALUATION_BUDGET_MS', 60_000, 1),
    capPerUser: num(env, 'EVALUATION_CAP_PER_USER', 3, 1),
    capPerRefereeLink: num(env, 'EVALUATION_CAP_PER_REFEREE_LINK', 2, 1),
    extraWorkers: num(env, 'EVALUATION_EXTRA_WORKERS', 1, 0),
    statementBytes: num(env, 'REPORT_STATEMENT_BYTES', 256 * 1024, 1024),
    reportBytes: num(env, 'REPORT_BYTES', 2 * 1024 * 1024, 4096),
  };
}
