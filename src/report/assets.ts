import { readFileSync } from 'node:fs';
import { createRequire } from 'node:module';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';

/**
 * Files the renderers need, located from this module or from the installed packages, never from
 * the current directory: the templates folder of this package, and the Roboto TTFs that pdfmake ships.
 */

/** `templates/` at the package root: two levels up from src/report/ (and from dist/report/). */
export const TEMPLATES_DIR = join(dirname(fileURLToPath(import.meta.url)), '..', '..', 'templates');

export function templateText(name: string): string {
  return readFileSync(join(TEMPLATES_DIR, name), 'utf8');
}

const requireHere = createRequire(import.meta.url);

/** node_modules/pdfmake/build/fonts/Roboto, found through the package resolver. */
export const FONT_DIR = join(dirname(requireHere.resolve('pdfmake/package.json')), 'build', 'fonts', 'Roboto');

/** The faces used: Medium stands in for bold (it is what pdfmake's Roboto set calls bold). */
export const FONT_FILES = {
  normal: join(FONT_DIR, 'Roboto-Regular.ttf'),
  bold: join(FONT_DIR, 'Roboto-Medium.ttf'),
  italics: join(FONT_DIR, 'Roboto-Italic.ttf'),
  bolditalics: join(FONT_DIR, 'Roboto-MediumItalic.ttf'),
} as const;

const cache = new Map<string, Buffer>();

export function fontBytes(path: string): Buffer {
  let bytes = cache.get(path);
  if (!bytes) {
    bytes = readFileSync(path);
    cache.set(path, bytes);
  }
  return bytes;
}
