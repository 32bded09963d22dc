/**
 * A PostgreSQL server for the engine tests: the one named by CODEWEIR_PG_URL (CI starts one),
 * else one started here from the PostgreSQL binaries (Debian's postgresql package puts them in
 * /usr/lib/postgresql/<version>/bin) in a temporary folder, listening on a unix socket only, and
 * stopped after. PostgreSQL refuses to run as root, so as root it runs as the postgres user.
 * When no server can be had, `reason` says why and the tests that need one are skipped.
 */
import { execFileSync } from 'node:child_process';
import { chmodSync, chownSync, existsSync, mkdtempSync, readdirSync, rmSync } from 'node:fs';
import { tmpdir, userInfo } from 'node:os';
import { join } from 'node:path';

export interface PgServer {
  url?: string;
  reason?: string;
  stop(): void;
}

function binDir(): string | undefined {
  const root = '/usr/lib/postgresql';
  if (!existsSync(root)) return undefined;
  const versions = readdirSync(root).filter((v) => existsSync(join(root, v, 'bin', 'pg_ctl'))).sort((a, b) => Number(b) - Number(a));
  return versions.length ? join(root, versions[0]!, 'bin') : undefined;
}

/** The server to test against: CODEWEIR_PG_URL, or one started here; `reason` when neither. */
export function startPg(): PgServer {
  const given = process.env.CODEWEIR_PG_URL;
  if (given) return { url: given, stop: () => undefined };
  const bin = binDir();
  if (!bin) return { reason: 'no PostgreSQL server: CODEWEIR_PG_URL is not set and no PostgreSQL binaries are installed (apt-get install postgresql)', stop: () => undefined };
  const dir = mkdtempSync(join(tmpdir(), 'cw-pg-'));
  const asRoot = userInfo().uid === 0;
  const run = (tool: string, args: string[]) => {
    const cmd = asRoot ? 'runuser' : join(bin, tool);
    const argv = asRoot ? ['-u', 'postgres', '--', join(bin, tool), ...args] : args;
    execFileSync(cmd, argv, { stdio: 'pipe', timeout: 60_000 });
  };
  try {
    chmodSync(dir, 0o700);
    if (asRoot) {
      const uid = Number(execFileSync('id', ['-u', 'postgres']).toString().trim());
      const gid = Number(execFileSync('id', ['-g', 'postgres']).toString().trim());
      chownSync(dir, uid, gid);
    }
    const data = join(dir, 'data');
    run('initdb', ['-D', data, '-A', 'trust', '-U', 'postgres', '-E', 'UTF8', '--locale=C', '--no-sync']);
    run('pg_ctl', ['-D', data, '-l', join(dir, 'log'), '-w', '-o', `-k ${dir} -c listen_addresses='' -F`, 'start']);
    return {
      url: `postgresql://postgres@/postgres?host=${encodeURIComponent(dir)}`,
      stop: () => {
        try {
          run('pg_ctl', ['-D', data, '-m', 'immediate', '-w', 'stop']);
        } finally {
          rmSync(dir, { recursive: true, force: true });
        }
      },
    };
  } catch (e) {
    rmSync(dir, { recursive: true, force: true });
    const why = ((e as { stderr?: Buffer }).stderr?.toString() || (e as Error).message).trim().split('\n')[0];
    return { reason: `no PostgreSQL server: starting one from ${bin} failed (${why})`, stop: () => undefined };
  }
}
