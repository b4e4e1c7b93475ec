import { readdirSync, readFileSync, statSync } from 'node:fs';
import { dirname, join, relative, resolve, sep } from 'node:path';
import ts from 'typescript';

export const ROOT = resolve(__dirname, '../../..');

/** Every .ts/.tsx file under a folder of the repository. */
export function sourceFiles(folder: string): string[] {
  const absolute = resolve(ROOT, folder);
  return readdirSync(absolute).flatMap((entry) => {
    const path = join(absolute, entry);
    if (statSync(path).isDirectory()) return entry === 'node_modules' ? [] : sourceFiles(relative(ROOT, path));
    return /\.tsx?$/.test(entry) ? [path] : [];
  });
}

export interface ImportOf {
  /** The file that imports, relative to the repository root with forward slashes. */
  file: string;
  specifier: string;
  /** For a relative specifier: the imported path relative to the repository root (no extension resolution). */
  target: string | null;
}

/** Every import, re-export, import() and import type of a file (TypeScript's own pre-processor reads them). */
export function importsOf(path: string): ImportOf[] {
  const file = relative(ROOT, path).split(sep).join('/');
  return ts.preProcessFile(readFileSync(path, 'utf8'), true, true).importedFiles.map(({ fileName }) => ({
    file,
    specifier: fileName,
    target: fileName.startsWith('.') ? relative(ROOT, resolve(dirname(path), fileName)).split(sep).join('/') : null,
  }));
}
