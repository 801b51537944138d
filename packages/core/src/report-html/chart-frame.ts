/** The frame every chart shares: a <figure> with an SVG of fixed viewBox, a title and a caption. */
import { esc } from './svg-kit.js';

export interface ChartFrame {
  /** data-chart name (tests and the print stylesheet find charts by it). */
  readonly chart: string;
  readonly title: string;
  readonly widthPx: number;
  readonly heightPx: number;
  /** SVG content. */
  readonly body: string;
  /** Caption sentences (what is drawn, decimation, units). */
  readonly caption: readonly string[];
  /** Extra data-* attributes on the figure (counts a reader can check). */
  readonly data?: Readonly<Record<string, string | number>>;
  readonly className?: string;
  /** HTML after the caption (legend). */
  readonly after?: string;
}

export function chartFigure(f: ChartFrame): string {
  const data = Object.entries(f.data ?? {}).map(([k, v]) => ` data-${k}="${esc(String(v))}"`).join('');
  return `<figure class="chart${f.className ? ` ${f.className}` : ''}" data-chart="${esc(f.chart)}"${data}>` +
    `<figcaption class="chart-title">${esc(f.title)}</figcaption>` +
    `<svg xmlns="http://www.w3.org/2000/svg" viewBox="0 0 ${f.widthPx} ${f.heightPx}" width="${f.widthPx}" height="${f.heightPx}" role="img" aria-label="${esc(f.title)}">${f.body}</svg>` +
    (f.after ?? '') +
    (f.caption.length ? `<p class="chart-note">${f.caption.map(esc).join(' ')}</p>` : '') +
    `</figure>`;
}

/** A placeholder where a chart has no data. */
export function chartMissing(chart: string, title: string, why: string): string {
  return `<figure class="chart chart-missing" data-chart="${esc(chart)}"><figcaption class="chart-title">${esc(title)}</figcaption><p class="chart-note">${esc(why)}</p></figure>`;
}

/** Legend entries as HTML under a chart (colour swatch + words). */
export function legendHtml(entries: readonly { readonly colour: string; readonly label: string; readonly shape?: 'line' | 'dot' | 'cross' | 'box' | 'triangle' }[]): string {
  return `<ul class="legend">${entries.map((e) => `<li><svg width="18" height="12" viewBox="0 0 18 12" aria-hidden="true">${swatch(e.colour, e.shape ?? 'box')}</svg>${esc(e.label)}</li>`).join('')}</ul>`;
}

function swatch(c: string, shape: string): string {
  switch (shape) {
    case 'line': return `<line x1="1" y1="6" x2="17" y2="6" stroke="${c}" stroke-width="2.5"/>`;
    case 'dot': return `<circle cx="9" cy="6" r="3.5" fill="${c}"/>`;
    case 'cross': return `<path d="M5 2l8 8M13 2l-8 8" stroke="${c}" stroke-width="2"/>`;
    case 'triangle': return `<path d="M9 1l6 10h-12z" fill="none" stroke="${c}" stroke-width="1.8"/>`;
    default: return `<rect x="2" y="2" width="14" height="8" fill="${c}"/>`;
  }
}
