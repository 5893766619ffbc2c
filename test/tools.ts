/**
 * System tools some tests need (Debian's chromium and poppler-utils). On a developer's machine a
 * missing tool skips those tests with a message; under CI (`CI` set) it is a failure, because
 * .ci/run installs them and a skip there would hide a broken install step.
 */
import { existsSync } from 'node:fs';

export const CHROMIUM = '/usr/bin/chromium';
export const PDFTOTEXT = '/usr/bin/pdftotext';
export const XMLLINT = '/usr/bin/xmllint';

const INSTALL: Record<string, string> = {
  [CHROMIUM]: 'apt-get install -y chromium',
  [PDFTOTEXT]: 'apt-get install -y poppler-utils',
  [XMLLINT]: 'apt-get install -y libxml2-utils',
};

/** True when the tool is there; false (with a warning) when it is not and this is not CI; throws under CI. */
export function haveTool(path: string, what: string): boolean {
  if (existsSync(path)) return true;
  const message = `${what}: ${path} not found (Debian: ${INSTALL[path] ?? 'install it'})`;
  if (process.env.CI) throw new Error(`${message}; CI must have it`);
  console.warn(`${message}; skipped`);
  return false;
}
