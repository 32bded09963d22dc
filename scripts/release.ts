/**
 * `pnpm release [--out <dir>]`: one installable npm tarball per published package, in
 * `release/` (gitignored) by default. Builds first (scripts/build.ts), then stages each package as
 * npm will see it: the files its `files` field lists and a package.json whose `workspace:*`
 * ranges are the workspace's exact versions and which carries no development dependencies. The
 * CLI package ships the bundle, so its staged dependencies are only the packages the bundle
 * leaves out (native modules, BUNDLE_EXTERNAL); the libraries keep their own runtime
 * dependencies. Each stage is packed with `npm pack`. Prints the tarball paths, one a line.
 */
import { execFileSync } from 'node:child_process';
import { cpSync, existsSync, mkdirSync, readdirSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { join, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';
import { buildAll } from './build.ts';
import { BUNDLE_EXTERNAL } from './bundle.ts';

const ROOT = resolve(fileURLToPath(new URL('..', import.meta.url)));

interface Manifest {
  name: string;
  version: string;
  private?: boolean;
  files?: string[];
  dependencies?: Record<string, string>;
  optionalDependencies?: Record<string, string>;
  devDependencies?: Record<string, string>;
  [k: string]: unknown;
}

/** The workspace's packages by name, with their folders. */
export function workspacePackages(): Map<string, { dir: string; manifest: Manifest }> {
  const out = new Map<string, { dir: string; manifest: Manifest }>();
  for (const name of readdirSync(join(ROOT, 'packages')).sort()) {
    const dir = join(ROOT, 'packages', name);
    if (!existsSync(join(dir, 'package.json'))) continue;
    const manifest = JSON.parse(readFileSync(join(dir, 'package.json'), 'utf8')) as Manifest;
    if (!manifest.private) out.set(manifest.name, { dir, manifest });
  }
  return out;
}

/** `workspace:*` ranges become the named package's exact version. */
function pinWorkspace(deps: Record<string, string> | undefined, all: Map<string, { manifest: Manifest }>): Record<string, string> | undefined {
  if (!deps) return undefined;
  const out: Record<string, string> = {};
  for (const [k, v] of Object.entries(deps)) {
    if (!v.startsWith('workspace:')) out[k] = v;
    else {
      const p = all.get(k);
      if (!p) throw new Error(`release: ${k} is a workspace dependency but not a published package.`);
      out[k] = p.manifest.version;
    }
  }
  return out;
}

/** The external (unbundled) packages the CLI bundle needs, with the ranges the libraries declare. */
function bundleExternals(all: Map<string, { manifest: Manifest }>): Record<string, string> {
  const out: Record<string, string> = {};
  for (const { manifest } of all.values())
    for (const deps of [manifest.dependencies, manifest.optionalDependencies])
      for (const [k, v] of Object.entries(deps ?? {})) if (BUNDLE_EXTERNAL.includes(k) && !v.startsWith('workspace:')) out[k] = v;
  return out;
}

/** Builds, stages and packs every published package into `outDir`; returns the tarball paths. */
export async function release(outDir = join(ROOT, 'release'), build = true): Promise<string[]> {
  if (build) await buildAll(true);
  const all = workspacePackages();
  const stageRoot = join(ROOT, '.build', 'release-stage');
  rmSync(stageRoot, { recursive: true, force: true });
  mkdirSync(outDir, { recursive: true });
  const tarballs: string[] = [];
  for (const [name, { dir, manifest }] of all) {
    const stage = join(stageRoot, name.replace('/', '__'));
    mkdirSync(stage, { recursive: true });
    for (const f of [...(manifest.files ?? []), 'README.md', 'LICENSE']) {
      const src = existsSync(join(dir, f)) ? join(dir, f) : f === 'LICENSE' ? join(ROOT, 'LICENSE') : '';
      if (src && existsSync(src)) cpSync(src, join(stage, f), { recursive: true });
      else if (f !== 'README.md' && f !== 'LICENSE') throw new Error(`release: ${name} lists ${f} in "files" but it does not exist; run the build.`);
    }
    const staged: Manifest = { ...manifest };
    delete staged.devDependencies;
    if (name === '@codeweir/cli') {
      staged.dependencies = bundleExternals(all);
      delete staged.optionalDependencies;
    } else {
      staged.dependencies = pinWorkspace(manifest.dependencies, all);
      if (manifest.optionalDependencies) staged.optionalDependencies = pinWorkspace(manifest.optionalDependencies, all);
    }
    writeFileSync(join(stage, 'package.json'), JSON.stringify(staged, null, 2) + '\n');
    const file = execFileSync('npm', ['pack', '--silent', '--pack-destination', outDir], { cwd: stage, encoding: 'utf8' }).trim().split('\n').pop()!;
    tarballs.push(join(outDir, file));
  }
  rmSync(stageRoot, { recursive: true, force: true });
  return tarballs;
}

if (process.argv[1] && resolve(process.argv[1]) === fileURLToPath(import.meta.url)) {
  const at = process.argv.indexOf('--out');
  const files = await release(at > 0 ? resolve(process.argv[at + 1]!) : undefined);
  process.stdout.write(files.join('\n') + '\n');
}
