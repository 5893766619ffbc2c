/**
 * Safety (issue 8): a study cannot reach outside its folder; outputs replace earlier ones all or
 * nothing; the HTML appendix of a hostile study shows its strings as text under a policy that allows
 * no request; and no module of the tool can open a network connection.
 */
import { CHROMIUM, haveTool } from '../tools.js';
import { existsSync, mkdirSync, readdirSync, readFileSync, symlinkSync, writeFileSync } from 'node:fs';
import { dirname, join, resolve } from 'node:path';
import { pathToFileURL } from 'node:url';
import { describe, expect, it } from 'vitest';
import { faultbook, tempDir } from '../cli/helpers.js';
import { nodeOutputFs, OutputWriteError, writeOutputs, type OutputFs } from '../../src/cli/outputs.js';
import { StudyError } from '../../src/study/errors.js';
import { confine } from '../../src/study/read.js';
import { VALID_STUDY, copyStudy, earlierOutputs, expectNoStackTrace, snapshot } from './harness.js';

describe('a study cannot reach outside its folder (src/study/read.ts confine)', () => {
  const setUp = () => {
    const base = tempDir('faultbook-confine-');
    const root = join(base, 'study');
    mkdirSync(join(root, 'data'), { recursive: true });
    writeFileSync(join(root, 'data', 'x.csv'), 'life,status\n1,failed\n');
    writeFileSync(join(root, '..notes.csv'), 'a file whose name starts with two dots\n');
    writeFileSync(join(base, 'secret.csv'), 'outside the study\n');
    mkdirSync(join(base, 'elsewhere'));
    writeFileSync(join(base, 'elsewhere', 'y.csv'), 'outside the study\n');
    symlinkSync(join(base, 'secret.csv'), join(root, 'data', 'link-out.csv'));
    symlinkSync(join(base, 'elsewhere'), join(root, 'linked-dir'));
    symlinkSync(join(root, 'data', 'x.csv'), join(root, 'data', 'link-in.csv'));
    return root;
  };
  const at = { file: 'events.yaml', line: 3, col: 23 };
  const refusal = (root: string, rel: string): StudyError => {
    try {
      confine(root, rel, at);
    } catch (err) {
      expect(err).toBeInstanceOf(StudyError);
      return err as StudyError;
    }
    throw new Error(`'${rel}' was accepted`);
  };

  it('refuses absolute paths, climbing out, links out and things that are not files, at the line that names them', () => {
    const root = setUp();
    const cases: [string, RegExp][] = [
      ['/etc/passwd', /is an absolute path/],
      [join(root, 'data', 'x.csv'), /is an absolute path/], // absolute even when it points inside
      ['C:\\data\\x.csv', /is an absolute path/],
      ['../secret.csv', /points outside the study folder/],
      ['data/../../secret.csv', /points outside the study folder/],
      ['..', /points outside the study folder/],
      ['', /points outside the study folder/],
      ['data/link-out.csv', /leads outside the study folder through a link/],
      ['linked-dir/y.csv', /leads outside the study folder through a link/],
      ['data', /is not a file/],
      ['data/missing.csv', /file not found/],
      ['data/x\u0000.csv', /file not found/],
    ];
    for (const [rel, message] of cases) {
      const e = refusal(root, rel);
      expect(e.message, rel).toMatch(message);
      expect(e.at, rel).toEqual(at);
      expect(e.hint, rel).toBeTruthy();
    }
  });

  it('accepts paths that stay inside, links that stay inside, and names that merely start with two dots', () => {
    const root = setUp();
    for (const rel of ['data/x.csv', './data/x.csv', 'data/../data/x.csv', 'data/link-in.csv', '..notes.csv']) {
      expect(confine(root, rel, at), rel).toBe(resolve(root, rel));
    }
  });
});

describe('outputs replace earlier ones all or nothing (src/cli/outputs.ts)', () => {
  const NEW = [
    { name: 'results.json', data: '{"new": true}\n' },
    { name: 'cutsets.csv', data: 'top,rank\n' },
    { name: 'appendix.html', data: '<!doctype html><title>new</title>\n' },
  ];
  /** An output folder with an earlier set and a file of the user's. */
  const earlier = () => {
    const dir = earlierOutputs();
    writeFileSync(join(dir, 'cutsets.csv'), 'old cut sets\n');
    writeFileSync(join(dir, 'appendix.html'), '<!doctype html><title>old</title>\n');
    return dir;
  };
  /** Real file operations, except that the n-th call of one kind throws. */
  const failing = (op: keyof OutputFs, n: number): OutputFs => {
    let calls = 0;
    return {
      ...nodeOutputFs,
      [op]: (...args: never[]) => {
        if (++calls === n) throw Object.assign(new Error(`injected ${op} failure`), { code: 'EIO', syscall: op });
        return (nodeOutputFs[op] as (...a: never[]) => unknown)(...args);
      },
    };
  };

  it('a good run replaces its own files, keeps the others and leaves nothing behind', () => {
    const dir = earlier();
    writeOutputs(dir, NEW);
    expect(readdirSync(dir).sort()).toEqual(['SENTINEL.txt', 'appendix.html', 'cutsets.csv', 'results.json']);
    for (const f of NEW) expect(readFileSync(join(dir, f.name), 'utf8')).toBe(f.data);
  });

  it('a failure while writing the second file leaves the earlier outputs byte for byte', () => {
    const dir = earlier();
    const before = snapshot(dir);
    expect(() => writeOutputs(dir, NEW, failing('write', 2))).toThrow(OutputWriteError);
    expect(snapshot(dir)).toEqual(before);
  });

  for (const n of [1, 2, 3, 4, 5, 6]) {
    it(`a failure at rename ${n} of 6 (old aside, new in, per file) puts the whole earlier set back`, () => {
      const dir = earlier();
      const before = snapshot(dir);
      expect(() => writeOutputs(dir, NEW, failing('rename', n))).toThrow(/could not write the outputs.*earlier outputs there are as they were/);
      expect(snapshot(dir)).toEqual(before);
    });
  }

  it('a new file (no earlier one) is removed again when a later rename fails', () => {
    const dir = join(tempDir(), 'fresh');
    mkdirSync(dir);
    writeFileSync(join(dir, 'SENTINEL.txt'), 'x\n');
    const before = snapshot(dir);
    expect(() => writeOutputs(dir, NEW, failing('rename', 3))).toThrow(OutputWriteError);
    expect(snapshot(dir)).toEqual(before);
  });

  it('a directory where an output file would go is left alone, and nothing is written', () => {
    const dir = earlier();
    mkdirSync(join(dir, 'results.json.d'));
    const blocked = join(dir, 'blocked');
    mkdirSync(join(blocked, 'results.json'), { recursive: true });
    writeFileSync(join(blocked, 'results.json', 'keep.txt'), 'mine\n');
    const before = snapshot(blocked);
    expect(() => writeOutputs(blocked, NEW)).toThrow(/exists and is not a file/);
    expect(snapshot(blocked)).toEqual(before);
  });

  it('faultbook run into a folder that cannot be made: exit 1, what went wrong, no stack, no "internal error"', async () => {
    const base = tempDir();
    writeFileSync(join(base, 'a-file'), 'not a folder\n');
    const r = await faultbook('run', VALID_STUDY, '--format', 'json', '--out', join(base, 'a-file', 'out'));
    expect(r.code).toBe(1);
    expect(r.stderr).toMatch(/^faultbook: could not write the outputs to .*a-file.*ENOTDIR/);
    expectNoStackTrace(r.stderr);
  });

  it('faultbook run over a good earlier run, then a failed one: the good outputs stay', async () => {
    const out = join(tempDir(), 'out');
    expect((await faultbook('run', VALID_STUDY, '--format', 'json,csv', '--out', out, '--quiet')).code).toBe(0);
    const good = snapshot(out);
    const broken = copyStudy(VALID_STUDY);
    writeFileSync(join(broken, 'logic.yaml'), readFileSync(join(broken, 'logic.yaml'), 'utf8').replace('motor-b, power-lost', 'motor-c, power-lost'));
    const r = await faultbook('run', broken, '--format', 'json,csv', '--out', out);
    expect(r.code).toBe(2);
    expect(snapshot(out)).toEqual(good);
  });
});

// --- a hostile study through the HTML appendix ----------------------------------------------------

/**
 * The start tags of an HTML text with their attributes, parsed as the HTML tokenizer does for the
 * cases that matter here (WHATWG HTML, 13.2.5.32–13.2.5.38: names, then quoted or unquoted values),
 * so text inside a quoted value is never mistaken for an attribute. Raw-text elements (script,
 * style) are skipped whole.
 */
function startTags(html: string): [string, [string, string][]][] {
  const out: [string, [string, string][]][] = [];
  const text = html.replace(/<(script|style)\b[^>]*>[\s\S]*?<\/\1>/gi, (_m, name: string) => `<${name}>`);
  const tagRe = /<([a-zA-Z][^\s/>]*)((?:[^>"']|"[^"]*"|'[^']*')*)>/g;
  for (const m of text.matchAll(tagRe)) {
    const attrs: [string, string][] = [];
    const attrRe = /([^\s"'>\/=]+)(?:\s*=\s*(?:"([^"]*)"|'([^']*)'|([^\s"'=<>`]+)))?/g;
    for (const a of m[2]!.matchAll(attrRe)) attrs.push([a[1]!, decodeEntities(a[2] ?? a[3] ?? a[4] ?? '')]);
    out.push([m[0].slice(0, 120), attrs]);
  }
  return out;
}

function decodeEntities(s: string): string {
  return s
    .replace(/&#x([0-9a-f]+);/gi, (_, h: string) => String.fromCodePoint(parseInt(h, 16)))
    .replace(/&#(\d+);/g, (_, d: string) => String.fromCodePoint(Number(d)))
    .replace(/&quot;/g, '"')
    .replace(/&#x27;|&apos;/g, "'")
    .replace(/&lt;/g, '<')
    .replace(/&gt;/g, '>')
    .replace(/&amp;/g, '&');
}

/** Each payload sets a different window.__pwned value if it ever runs. */
const HOSTILE_STUDY: Record<string, string> = {
  'study.yaml': `# Invented hostile study: every string below is an attack on the appendix, none is real.
format: faultbook/1
title: "<script>window.__pwned=1</script> Invented station"
facility: '"><img src=x onerror="window.__pwned=2"> {{constructor.constructor}}'
revision: "</style><style>body{background:url(http://example.invalid/css)}</style>"
as_of: 2026-06-30
prepared_by: ["<svg onload=window.__pwned=3>"]
scope: |
  [a link](javascript:window.__pwned=4) and <img src=x onerror=window.__pwned=5>
  ![remote](http://example.invalid/beacon.png) <iframe src="http://example.invalid/"></iframe>
  <script>window.__pwned=6</script>
settings: { cutoff: 0 }
tops:
  t7: { title: "<img src=x onerror=window.__pwned=7> {{{raw}}} <b onmouseover=window.__pwned=8>top</b>", gate: g-top }
gates:
  g-top: { title: "</text><script>window.__pwned=9</script>", any: [e1, e2] }
events:
  e1: { title: "<script>window.__pwned=10</script>", model: fixed, probability: 0.01, source: s1 }
  e2: { title: "javascript:window.__pwned=11", model: fixed, probability: 0.02, source: s1, assumptions: [A1] }
sources:
  s1: { title: "<a href=javascript:window.__pwned=12>source</a>", reference: "http://example.invalid/ref", invented: true }
`,
  'assumptions.md': `# Assumptions (invented, hostile)

## A1 <b onmouseover="window.__pwned=13">bold</b>
<script>window.__pwned=14</script> [x](javascript:window.__pwned=15) <object data="http://example.invalid/o"></object>
`,
};

describe('the HTML appendix of a hostile study', () => {
  const render = async () => {
    const study = join(tempDir('faultbook-hostile-'), 'study');
    mkdirSync(study);
    for (const [name, text] of Object.entries(HOSTILE_STUDY)) writeFileSync(join(study, name), text);
    const out = join(dirname(study), 'out');
    const r = await faultbook('run', study, '--format', 'html,json', '--out', out, '--quiet');
    return { r, html: existsSync(join(out, 'appendix.html')) ? readFileSync(join(out, 'appendix.html'), 'utf8') : '', file: join(out, 'appendix.html') };
  };

  it('is written, with every study string as text: one script (ours), no handlers, no javascript: URLs, nothing remote', async () => {
    const { r, html } = await render();
    expect(r.stderr.split('\n').filter((l) => l.startsWith('error'))).toEqual([]);
    expect(r.code).toBe(0);
    // Exactly one script element, the appendix's own (its hash is in the policy: test/report/html.test.ts).
    expect(html.match(/<script\b/gi) ?? []).toHaveLength(1);
    // No element carries an event-handler attribute or a javascript: URL, and nothing that loads by
    // itself (src, data, srcset, poster, action) points off the page. A plain link to a web address
    // may stay a link: it is fetched only if a reader follows it.
    for (const [tag, attrs] of startTags(html)) {
      for (const [name, value] of attrs) {
        expect(name, tag).not.toMatch(/^on/i);
        // Attributes whose value is a URL (HTML's URL-valued attributes; data-* are plain text).
        if (/^(?:href|src|data|srcset|poster|action|formaction|xlink:href|cite|background|ping)$/i.test(name)) {
          expect(value.trim(), tag).not.toMatch(/^(?:javascript|vbscript):/i);
          if (name.toLowerCase() !== 'href') expect(value.trim(), tag).not.toMatch(/^(?:https?:|\/\/)/i);
        }
      }
    }
    expect(html).not.toMatch(/<(?:iframe|object|embed|img\s+src=x)\b/i);
    // The strings are there, as text.
    expect(html).not.toMatch(/<script>window\.__pwned|<img src=x|<svg onload|<b onmouseover/i);
    const shown = decodeEntities(html);
    for (const n of [1, 2, 3, 7, 9, 10, 11, 12]) expect(shown, `payload ${n}`).toContain(`window.__pwned=${n}`);
    // The policy allows no request of any kind.
    const csp = decodeEntities(/<meta http-equiv="Content-Security-Policy" content="([^"]*)"/.exec(html)?.[1] ?? '');
    expect(csp).toContain("default-src 'none'");
    expect(csp).not.toMatch(/https?:|\*/);
  });

  it('runs none of it and fetches nothing in a real browser', async () => {
    if (!haveTool(CHROMIUM, 'hostile-string browser check')) return;
    const { file } = await render();
    const { chromium } = await import('playwright-core');
    const profile = join(tempDir('faultbook-hostile-browser-'), 'profile');
    const context = await chromium.launchPersistentContext(profile, {
      executablePath: CHROMIUM,
      headless: true,
      args: ['--headless', '--no-sandbox', '--disable-gpu', '--disable-quic', '--no-first-run', '--disable-background-networking', '--disable-component-update', '--disable-sync'],
    });
    try {
      const page = await context.newPage();
      const url = pathToFileURL(file).href;
      const requests: string[] = [];
      page.on('request', (q) => {
        if (q.url() !== url) requests.push(q.url());
      });
      await page.goto(url, { waitUntil: 'load' });
      // Give any handler a chance: hover and click everything that a payload might sit on.
      await page.mouse.move(10, 10);
      const state = await page.evaluate(() => ({
        pwned: (window as unknown as { __pwned?: number }).__pwned,
        scripts: document.querySelectorAll('script').length,
        handlers: Array.from(document.querySelectorAll('*')).filter((el) => Array.from(el.attributes).some((a) => a.name.startsWith('on'))).length,
      }));
      expect(state).toEqual({ pwned: undefined, scripts: 1, handlers: 0 });
      expect(requests.filter((u) => !u.startsWith('data:'))).toEqual([]);
    } finally {
      await context.close();
    }
  }, 60_000);
});

describe('no network at run time', () => {
  it('no module under src/ imports a network module or calls fetch', () => {
    const offenders: string[] = [];
    const walk = (dir: string) => {
      for (const entry of readdirSync(dir, { withFileTypes: true })) {
        const full = join(dir, entry.name);
        if (entry.isDirectory()) walk(full);
        else if (entry.name.endsWith('.ts')) {
          const text = readFileSync(full, 'utf8');
          if (/from\s+['"](?:node:)?(?:http|https|http2|net|tls|dgram|dns)['"]/.test(text)) offenders.push(`${full}: network import`);
          if (/\bfetch\s*\(|\bXMLHttpRequest\b|\bWebSocket\b|\bEventSource\b/.test(text)) offenders.push(`${full}: network call`);
        }
      }
    };
    walk('src');
    expect(offenders).toEqual([]);
  });
});
