/**
 * `eigenspan plot` through the built command line (dist/cli.js, dist/plot.js): the SVG is parsed back
 * and its series, bars, curves and axis names inspected; the PNG's signature and size are read; and the
 * chart library is shown to load for `plot` only.
 */
import { beforeAll, describe, expect, it } from 'vitest';
import { spawnSync } from 'node:child_process';
import { copyFileSync, existsSync, mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { Resvg } from '@resvg/resvg-js';
import { analyse } from '../../server/src/analysis/index';
import { DEFAULT_SETTINGS, describeView } from '../../client/webview/charts';
import { readPalette } from '../../client/webview/theme';
import { PICTURE_FONT, textWidth } from '../../server/src/cli/plotFont';
import { parseXml, type XmlElement } from './xml';

const ROOT = join(__dirname, '..', '..');
const CLI = join(ROOT, 'dist', 'cli.js');

function run(args: string[], preload?: string): { code: number | null; out: string; err: string } {
  const r = spawnSync(process.execPath, [...(preload ? ['--require', preload] : []), CLI, ...args], { encoding: 'utf8' });
  return { code: r.status, out: r.stdout, err: r.stderr };
}

let dir: string;
beforeAll(() => {
  if (!existsSync(CLI) || !existsSync(join(ROOT, 'dist', 'plot.js'))) throw new Error('dist/cli.js or dist/plot.js is missing: run `npm run build` first');
  dir = mkdtempSync(join(tmpdir(), 'eigenspan-plot-'));
});

function file(name: string, text: string): string {
  const p = join(dir, name);
  writeFileSync(p, text);
  return p;
}

/** The parabola state x(L - x) in a box; its coefficients are c_n = 8 sqrt(15)/(n pi)^3 for odd n and 0 for even n (Griffiths, Introduction to Quantum Mechanics, worked example on the parabola state; from memory). */
const PARABOLA = 'system box(0, 1)\nstate psi(x) = sqrt(30) x * (1 - x)\nbasis 10\n';
/** The same state in a 2 nm box with units, and an evolution. */
const PARABOLA_NM = 'units nm, meV, fs\nsystem box(0 nm, 2 nm)\nstate psi(x) = x * (2 nm - x)\nbasis 8\nevolve to 100 fs steps 40\n';

/** Every element of the tree, depth first. */
function elements(e: XmlElement): XmlElement[] {
  return [e, ...e.children.flatMap(elements)];
}

/** The SVG's tree; its one style sheet (hover rules in a CDATA section, which the test reader does not take) is set aside. */
function parseSvg(svg: string): XmlElement {
  return parseXml(svg.replace(/<style\s*><!\[CDATA\[[\s\S]*?\]\]>\s*<\/style>/, ''));
}

let files = 0;
function svgOf(text: string, args: string[] = []): XmlElement[] {
  const r = run(['plot', file(`s${++files}.qstate`, text), ...args]);
  expect(r.code, r.err).toBe(0);
  return elements(parseSvg(r.out));
}

const texts = (all: XmlElement[]) => all.filter((e) => e.name === 'text').map((e) => e.text);
/** The chart's own shapes (not the legend's icons) of series `index`. */
const seriesShapes = (all: XmlElement[], index: number) => all.filter((e) => e.attrs.ecmeta_ssr_type === 'chart' && e.attrs.ecmeta_series_index === String(index));
/** The x translation of a text element. */
const tx = (e: XmlElement) => Number(/translate\(([-\d.]+)/.exec(e.attrs.transform ?? '')![1]);
const ty = (e: XmlElement) => Number(/translate\([-\d.]+ ([-\d.]+)/.exec(e.attrs.transform ?? '')![1]);
/** The labels of the horizontal axis: numbers centred under the plot. */
const xTicks = (all: XmlElement[]) => all.filter((e) => e.name === 'text' && /^-?[\d.]+$/.test(e.text) && e.attrs['text-anchor'] === 'middle');
const LIGHT = readPalette(() => '', 'light');

describe('eigenspan plot --view spectrum', () => {
  it('draws one bar a level that holds weight, as tall as its weight, and the panel\'s series in the legend', () => {
    const all = svgOf(PARABOLA);
    // Odd n only: the even levels hold no weight (source above), so 5 of the 10 levels get a bar.
    const bars = seriesShapes(all, 0);
    expect(bars.map((b) => Number(b.attrs.ecmeta_data_index) + 1)).toEqual([1, 3, 5, 7, 9]);
    expect(seriesShapes(all, 1)).toEqual([]);
    // The first bar's height over the axis from 0 to 1 is |c_1|^2 = 960/pi^6 = 0.998555 (same source).
    const labels = all.filter((e) => e.name === 'text');
    const zero = labels.find((e) => e.text === '0')!;
    const one = labels.find((e) => e.text === '1' && tx(e) === tx(zero))!;
    const height = Math.abs(Number(/l0 (-?[\d.]+)/.exec(bars[0]!.attrs.d!)![1]));
    expect(Math.abs(height / (ty(zero) - ty(one)) - 960 / Math.PI ** 6)).toBeLessThan(1 / (ty(zero) - ty(one)));
    // The legend names the same series as the panel's option for the same file.
    const r = analyse(PARABOLA);
    const { file: _f, ...rest } = r;
    const panel = describeView({ result: JSON.parse(JSON.stringify(rest)), settings: DEFAULT_SETTINGS, palette: readPalette(() => '', 'light'), tooltip: () => '' });
    const names = (panel.option!.series as { name: string }[]).map((s) => s.name);
    expect(names.length).toBe(4);
    for (const n of names) expect(texts(all)).toContain(n);
    expect(texts(all)).toEqual(expect.arrayContaining(['n', '|c_n|²', 'cumulative']));
  });

  it('puts the levels on an energy axis with its unit, the first bar at E_1', () => {
    const all = svgOf(PARABOLA_NM, ['--axis', 'energy', '--width', '2400']);
    expect(texts(all)).toContain('E_n (meV)');
    // E_1 = pi^2 hbar^2 / (2 m_e L^2) = 94.0 meV for L = 2 nm (0.376 eV nm^2 / 4; from memory).
    const ticks = xTicks(all);
    const [a, b] = [ticks[0]!, ticks[1]!];
    const perMeV = (tx(b) - tx(a)) / (Number(b.text) - Number(a.text));
    const bar = seriesShapes(all, 0)[0]!;
    const left = Number(/^M([-\d.]+)/.exec(bar.attrs.d!)![1]);
    const width = Number(/l([\d.]+) 0/.exec(bar.attrs.d!)![1]);
    const energy = Number(a.text) + (left + width / 2 - tx(a)) / perMeV;
    // Bars are placed to 0.1 px, so the centre is known to a pixel.
    expect(Math.abs(energy - 94.0)).toBeLessThan(1 / perMeV + 0.1);
    expect(1 / perMeV).toBeLessThan(4);
  });

  it('draws the dark theme on the dark background', () => {
    const all = svgOf(PARABOLA, ['--theme', 'dark']);
    // The palette's dark fallback (client/webview/theme.ts).
    expect(all.find((e) => e.name === 'rect')?.attrs.fill).toBe('#1e1e1e');
  });
});

describe('eigenspan plot --view state and time', () => {
  it('draws the state as curves and names the axes with their units', () => {
    const all = svgOf(PARABOLA_NM, ['--view', 'state']);
    expect(texts(all)).toEqual(expect.arrayContaining(['x (nm)', 'E, V (meV)', 'ψ (nm^-1/2), |ψ|² (1/nm)', '|ψ|²', 'Re ψ']));
    // |psi|^2 is one line in the palette's density colour over the samples, highest (smallest y) at the box's centre x = 1 nm, where x(2 nm - x) peaks.
    const lines = all.filter((e) => e.name === 'path' && e.attrs.fill === 'none' && e.attrs.stroke === LIGHT.density && !e.attrs.transform);
    expect(lines).toHaveLength(1);
    const density = lines[0]!;
    const points = [...density.attrs.d!.matchAll(/([-\d.]+) ([-\d.]+)/g)].map((m) => [Number(m[1]), Number(m[2])] as const);
    expect(points.length).toBeGreaterThan(50);
    const top = points.reduce((p, q) => (q[1] < p[1] ? q : p));
    const ticks = xTicks(all);
    const x0 = ticks.find((e) => e.text === '0')!;
    const x2 = ticks.find((e) => e.text === '2')!;
    expect(Math.abs((top[0] - tx(x0)) / ((tx(x2) - tx(x0)) / 2) - 1)).toBeLessThan(0.03);
  });

  it('draws the evolution with the time axis in the file\'s time unit', () => {
    const all = svgOf(PARABOLA_NM, ['--view', 'time']);
    expect(texts(all)).toEqual(expect.arrayContaining(['t (fs)', 'x (nm)', '|ψ(x,t)|²', 't = 0 fs']));
    // Step 10 of 40 steps to 100 fs is t = 25 fs.
    expect(texts(svgOf(PARABOLA_NM, ['--view', 'time', '--step', '10']))).toContain('t = 25 fs');
  });

  it('draws a sweep: the quantities against the swept value, the design window and the located flips', () => {
    // The ground state of the box (0, 1) released into (0, L): |c_1|^2 = 32/(9 pi^2) = 0.36 at L = 2
    // (CHECKS.md, the suddenly widened well), and 1 at L = 1; the expect line holds for the narrow boxes only.
    const sweep = 'let L = 1.2\nsystem box(0, L)\nstate eigen(1) of box(0, 1)\nbasis 20\nsweep L from 1 to 2 steps 10\nexpect weight 1 >= 0.5\n';
    const all = svgOf(sweep, ['--view', 'sweep']);
    expect(texts(all)).toEqual(expect.arrayContaining(['captured weight', 'P(1)', 'L', 'weight', 'design window']));
    expect(texts(all).some((t) => /^line 6 fails$/.test(t))).toBe(true);
    // --quantity picks the lines: the level energies on an energy axis, or the bound count (every level of a box is bound, so none is counted).
    const energies = texts(svgOf(sweep, ['--view', 'sweep', '--quantity', 'energies']));
    expect(energies).toEqual(expect.arrayContaining(['E(1)', 'E(2)', 'energy']));
    expect(energies).not.toContain('captured weight');
    expect(texts(svgOf(sweep, ['--view', 'sweep', '--quantity', 'energy']))).toEqual(expect.arrayContaining(['⟨E⟩', '⟨E⟩ + ΔE', 'ΔE']));
  });

  it('draws a two-parameter sweep as a map: cells for every point, the colour scale, the design window\'s outline, axes named with units', () => {
    // The ground state of the box (0, a) released into the box (0, L), both swept (lengths in nm): the
    // expect line holds where the old box fills enough of the new one.
    const text = 'units nm, meV\nlet L = 1.2 nm\nlet a = 1 nm\nsystem box(0 nm, L)\nstate eigen(1) of box(0 nm, a)\nbasis 20\nexpect weight 1 >= 0.5\nsweep L from 1 nm to 2 nm steps 10\nsweep a from 0.5 nm to 1 nm steps 4 log\n';
    const all = svgOf(text, ['--view', 'sweep', '--quantity', 'populations']);
    // One cell a point (11 x 5), each filled and outlined in its own colour of the scale.
    const cells = all.filter((e) => e.name === 'path' && e.attrs['stroke-width'] === '0.6' && e.attrs.fill === e.attrs.stroke && e.attrs.fill !== 'none');
    expect(cells).toHaveLength(55);
    expect(new Set(cells.map((c) => c.attrs.fill)).size).toBeGreaterThan(5);
    // The legend names the mapped quantity (the lowest population) and the outline; the scale's two ends are printed.
    expect(texts(all)).toEqual(expect.arrayContaining(['P(1)', 'design window edge', 'L (nm)', 'a (nm)']));
    // The outline: a polyline in the text colour (light theme fallback) over a halo in the background colour.
    const outline = all.filter((e) => e.name === 'path' && e.attrs.fill === 'none' && e.attrs.stroke === '#1f1f1f' && e.attrs['stroke-width'] === '2');
    expect(outline.length).toBeGreaterThan(0);
    expect((outline[0]!.attrs.d ?? '').split('L').length).toBeGreaterThan(4);
    // A logarithmic sweep gets a logarithmic axis: its ticks are powers of 2 over a span under three decades.
    expect(texts(all)).toEqual(expect.arrayContaining(['0.5', '1']));
    // An unknown quantity is a usage error.
    expect(run(['plot', file('mapq.qstate', text), '--view', 'sweep', '--quantity', 'colour']).code).toBe(2);
  });
});

describe('eigenspan plot files and refusals', () => {
  it('writes a PNG of the requested size, and an SVG beside it', () => {
    const src = file('png.qstate', PARABOLA);
    const png = join(dir, 'out.png');
    const svg = join(dir, 'out.svg');
    const r = run(['plot', src, '--png', png, '--svg', svg, '--width', '640', '--height', '360']);
    expect(r.code, r.err).toBe(0);
    expect(r.out).toBe('');
    const b = readFileSync(png);
    // The PNG signature and the IHDR chunk's width and height (PNG specification, sections 5.2 and 11.2.2).
    expect([...b.subarray(0, 8)]).toEqual([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a]);
    expect(b.subarray(12, 16).toString('latin1')).toBe('IHDR');
    expect([b.readUInt32BE(16), b.readUInt32BE(20)]).toEqual([640, 360]);
    expect(parseSvg(readFileSync(svg, 'utf8')).attrs.width).toBe('640');
    // An existing picture is not replaced without --force.
    const again = run(['plot', src, '--png', png]);
    expect(again.code).toBe(2);
    expect(again.err).toContain('--force');
    expect(run(['plot', src, '--png', png, '--force']).code).toBe(0);
  });

  it('says how to get PNG output where the rasteriser is not installed, and still writes SVG', () => {
    // The two bundles alone, away from this repository's node_modules, as in a package installed without its development dependencies.
    const alone = mkdtempSync(join(tmpdir(), 'eigenspan-alone-'));
    for (const f of ['cli.js', 'cli-main.js', 'plot.js']) copyFileSync(join(ROOT, 'dist', f), join(alone, f));
    const src = file('alone.qstate', PARABOLA);
    const png = spawnSync(process.execPath, [join(alone, 'cli.js'), 'plot', src, '--png', join(alone, 'x.png')], { encoding: 'utf8', cwd: alone });
    expect(png.status).toBe(2);
    expect(png.stderr).toContain('npm install @resvg/resvg-js');
    expect(existsSync(join(alone, 'x.png'))).toBe(false);
    const svg = spawnSync(process.execPath, [join(alone, 'cli.js'), 'plot', src, '--svg', join(alone, 'x.svg')], { encoding: 'utf8', cwd: alone });
    expect(svg.status, svg.stderr).toBe(0);
    expect(parseSvg(readFileSync(join(alone, 'x.svg'), 'utf8')).name).toBe('svg');
  });

  it('refuses, as a usage error, a view the file has nothing for', () => {
    const src = file('nosweep.qstate', PARABOLA);
    const sweep = run(['plot', src, '--view', 'sweep']);
    expect(sweep.code).toBe(2);
    expect(sweep.err).toContain('has no sweep');
    expect(sweep.out).toBe('');
    const time = run(['plot', src, '--view', 'time']);
    expect(time.code).toBe(2);
    expect(time.err).toContain('evolve');
    expect(run(['plot', src, '--width', '10']).code).toBe(2);
    expect(run(['plot', src, '--view', 'spectra']).code).toBe(2);
  });

  it('prints no picture for a file whose errors make the plots meaningless, and locates the errors', () => {
    const r = run(['plot', file('bad.qstate', 'system box(0, 1)\nstate psi(x) = sqrt(30) y\n')]);
    expect(r.code).toBe(1);
    expect(r.out).toBe('');
    expect(r.err).toMatch(/bad\.qstate:2:\d+: error\[name\]/);
    // No state, no error: nothing to plot is a usage error.
    const empty = run(['plot', file('nostate.qstate', 'system box(0, 1)\n')]);
    expect(empty.code).toBe(2);
    expect(empty.out).toBe('');
  });

  it('escapes control characters in what it prints', () => {
    const r = run(['plot', join(dir, 'no\u001b[31mfile.qstate')]);
    expect(r.code).toBe(2);
    expect(r.err).toContain('no\\x1B[31mfile.qstate');
    expect(r.err).not.toContain('\u001b');
  });
});

describe('plotting loads lazily', () => {
  it('expand and check never load dist/plot.js or the chart library; plot does', () => {
    // A preload that lists every module the process requires, written at exit.
    const log = join(dir, 'modules.json');
    const preload = join(dir, 'trace.cjs');
    writeFileSync(preload, `const M = require('module'); const seen = []; const load = M._load;
M._load = function (req, ...rest) { seen.push(req); return load.call(this, req, ...rest); };
process.on('exit', () => require('fs').writeFileSync(${JSON.stringify(log)}, JSON.stringify(seen)));\n`);
    const src = file('lazy.qstate', PARABOLA);
    const loaded = (args: string[]) => {
      expect(run(args, preload).code).toBe(0);
      return JSON.parse(readFileSync(log, 'utf8')) as string[];
    };
    expect(loaded(['expand', src])).not.toContain('./plot.js');
    expect(loaded(['check', src])).not.toContain('./plot.js');
    expect(loaded(['plot', src, '--svg', join(dir, 'lazy.svg')])).toContain('./plot.js');
    // The command line's own bundle (dist/cli-main.js, run by the bin's loader) carries no chart library.
    expect(readFileSync(join(ROOT, 'dist', 'cli-main.js'), 'utf8')).not.toMatch(/echarts|zrender/i);
    expect(readFileSync(join(ROOT, 'dist', 'plot.js'), 'utf8')).toMatch(/renderToSVGString/);
  });
});

describe('one chart library set-up', () => {
  it('registers the chart and component types the panel registers', () => {
    // The panel (client/webview/main.ts) and the picture renderer import the same ECharts parts.
    const parts = (path: string, from: string) => {
      const m = new RegExp(`import \\{([^}]*)\\} from '${from}'`).exec(readFileSync(join(ROOT, path), 'utf8'));
      return m![1]!.split(',').map((x) => x.trim()).filter(Boolean).sort();
    };
    for (const from of ['echarts/charts', 'echarts/components']) {
      expect(parts('server/src/cli/plotRender.ts', from)).toEqual(parts('client/webview/main.ts', from));
    }
  });
});

describe('text widths of pictures', () => {
  it('reserve at least the drawn width of the chart\'s labels in the picture font, and not much more', () => {
    for (const s of ['symmetric about x = 0.5', 'cumulative weight', 'first K = 10 levels (ψ_K)', 'survival |⟨ψ(0)|ψ(t)⟩|²', 'E, V (meV)', 'x (nm)', '0.25', 'Re ψ_K (K = 2)']) {
      const svg = `<svg xmlns="http://www.w3.org/2000/svg" width="900" height="40"><text x="0" y="20" font-size="13" font-family="${PICTURE_FONT}">${s}</text></svg>`;
      const box = new Resvg(svg, { font: { loadSystemFonts: true, defaultFontFamily: PICTURE_FONT } }).getBBox();
      if (!box) throw new Error(`no text drawn: is ${PICTURE_FONT} installed (Debian's fonts-dejavu-core)?`);
      const ink = box.width;
      const estimate = textWidth(s, '13px sans-serif');
      expect(estimate, s).toBeGreaterThanOrEqual(ink);
      expect(estimate, s).toBeLessThan(1.3 * ink);
    }
  });
});
