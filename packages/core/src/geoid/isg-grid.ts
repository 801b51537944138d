/**
 * Geoid grids in the ISG format of the International Service for the Geoid (ISG format 1.0 and 2.0,
 * "ISG format specification", isgeoid.polimi.it; from memory): a header between `begin_of_head` and
 * `end_of_head` of `key : value` or `key = value` lines, then the grid rows from north to south, each
 * from west to east. Used here: `lat min`, `lat max`, `lon min`, `lon max`, `delta lat`, `delta lon`,
 * `nrows`, `ncols`, `nodata`, `model name`, `data units` (meters), `coord units` (deg), `data format`
 * (grid), `data ordering` (N-to-S, W-to-E), `ref ellipsoid`, `ref frame`, `height datum`.
 * Nodes lie on the limits (nrows = (lat max - lat min) / delta lat + 1); a grid whose limits are the
 * outer cell edges (nrows = (lat max - lat min) / delta lat) has its nodes at the cell centres.
 * Errors name the file, the line and what was expected.
 */
import { InputError } from '../errors.js';
import type { GeoidModel } from './geoid-model.js';
import { regularGridModel } from './regular-grid.js';

/** True when the text looks like an ISG file (its header starts within the first lines). */
export function looksLikeIsg(text: string): boolean {
  return /^\s*begin_of_head/m.test(text.slice(0, 4096));
}

export function parseIsgGrid(file: string, text: string): GeoidModel {
  const lines = text.split(/\r?\n/);
  const begin = lines.findIndex((l) => /^\s*begin_of_head/.test(l));
  if (begin < 0) throw new InputError(file, 1, "expected an ISG geoid grid: no 'begin_of_head' line");
  const end = lines.findIndex((l, i) => i > begin && /^\s*end_of_head/.test(l));
  if (end < 0) throw new InputError(file, lines.length, "expected 'end_of_head' after the ISG header");
  const head = new Map<string, { value: string; line: number }>();
  for (let i = begin + 1; i < end; i++) {
    const m = /^\s*([^:=]+?)\s*[:=]\s*(.*?)\s*$/.exec(lines[i]!);
    if (m) head.set(m[1]!.toLowerCase().replace(/\s+/g, ' '), { value: m[2]!, line: i + 1 });
  }
  const text_ = (k: string, fallback = ''): string => head.get(k)?.value ?? fallback;
  const num = (k: string): number => {
    const h = head.get(k);
    if (!h) throw new InputError(file, end + 1, `expected the ISG header field '${k}'`);
    const v = Number(h.value);
    if (!Number.isFinite(v)) throw new InputError(file, h.line, `ISG header field '${k}': expected a number in decimal degrees or a count, found '${h.value}'`);
    return v;
  };
  const units = text_('coord units', 'deg').toLowerCase();
  if (units !== 'deg') throw new InputError(file, head.get('coord units')!.line, `coord units '${units}': only decimal degrees ('deg') are read`);
  const format = text_('data format', 'grid').toLowerCase();
  if (format !== 'grid') throw new InputError(file, head.get('data format')!.line, `data format '${format}': only 'grid' is read`);
  const ordering = text_('data ordering', 'N-to-S, W-to-E').toLowerCase().replace(/\s+/g, '');
  if (ordering !== 'n-to-s,w-to-e') throw new InputError(file, head.get('data ordering')!.line, `data ordering '${text_('data ordering')}': expected 'N-to-S, W-to-E'`);
  const dataUnits = text_('data units', 'meters').toLowerCase();
  if (!/^met(er|re)s?$/.test(dataUnits)) throw new InputError(file, head.get('data units')!.line, `data units '${dataUnits}': expected meters`);
  const latMin = num('lat min'), latMax = num('lat max'), lonMin = num('lon min'), lonMax = num('lon max');
  const dLat = num('delta lat'), dLon = num('delta lon'), rows = num('nrows'), cols = num('ncols');
  const noData = head.has('nodata') ? num('nodata') : null;
  if (!(latMin < latMax && lonMin < lonMax && dLat > 0 && dLon > 0 && Number.isInteger(rows) && Number.isInteger(cols) && rows >= 2 && cols >= 2)) {
    throw new InputError(file, begin + 1, 'ISG header: expected lat min < lat max, lon min < lon max, positive spacings and at least 2 rows and 2 columns');
  }
  const nodeRows = Math.round((latMax - latMin) / dLat);
  // Limits on the nodes, or on the outer cell edges with nodes at the centres.
  const onNodes = nodeRows + 1 === rows;
  if (!onNodes && nodeRows !== rows) throw new InputError(file, head.get('nrows')!.line, `nrows ${rows} does not fit lat min/max and delta lat (${nodeRows + 1} nodes or ${nodeRows} cells)`);
  // Bounded memory: a damaged header must not make us allocate more values than the file could hold (two characters each at least).
  if (rows * cols > Math.max(0, text.length / 2)) {
    throw new InputError(file, head.get('nrows')!.line, `nrows ${rows} x ncols ${cols} declare ${rows * cols} values, more than the file can hold: a damaged header?`);
  }
  const values = new Float64Array(rows * cols);
  let k = 0;
  for (let i = end + 1; i < lines.length; i++) {
    const t = lines[i]!.trim();
    if (t === '') continue;
    for (const tok of t.split(/\s+/)) {
      const v = Number(tok);
      if (!Number.isFinite(v)) throw new InputError(file, i + 1, `expected a geoid undulation in metres, found '${tok}'`);
      if (k >= values.length) throw new InputError(file, i + 1, `expected ${rows} rows of ${cols} values: too many values`);
      values[k++] = v;
    }
  }
  if (k !== values.length) throw new InputError(file, lines.length, `expected ${rows} rows of ${cols} values (${values.length}), found ${k}: file truncated?`);
  const half = onNodes ? 0 : 0.5;
  const name = text_('model name', file) + (text_('model year') ? ` (${text_('model year')})` : '');
  const datum = text_('height datum');
  const frame = [text_('ref frame'), text_('ref ellipsoid')].filter((x) => x && x !== '---').join(', ');
  return regularGridModel({
    name: `${name}, ISG grid ${file.split(/[\\/]/).pop()}${frame ? ` (${frame})` : ''}`,
    heightReference: datum && datum !== '---' ? datum : `${text_('model name', 'geoid')} geoid`,
    northLatDeg: latMax - half * dLat, dLatDeg: dLat, westLonDeg: lonMin + half * dLon, dLonDeg: dLon,
    rows, cols, values, noData,
  });
}
