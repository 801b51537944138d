/**
 * Small edits of OGC WKT 1 (OGC 01-009, "Coordinate Transformation Services", section 7: the form .prj
 * files hold): the base geographic CRS of a PROJCS read, replaced, and the projected CRS renamed. Used
 * to state grid coordinates whose datum is not the one of the EPSG projected CRS whose parameters made
 * them (frames/ and report/grid-crs.ts decide when). Only the element structure is read: keyword[...]
 * with quoted strings, numbers and nested elements.
 */

/** [start, end) of the first element `keyword[...]` at or after `from`, or null. */
function elementSpan(wkt: string, keyword: string, from = 0): readonly [number, number] | null {
  const start = wkt.indexOf(`${keyword}[`, from);
  if (start < 0) return null;
  let depth = 0;
  let quoted = false;
  for (let i = start + keyword.length; i < wkt.length; i++) {
    const ch = wkt[i];
    if (ch === '"') quoted = !quoted;
    else if (!quoted && ch === '[') depth++;
    else if (!quoted && ch === ']') {
      depth--;
      if (depth === 0) return [start, i + 1];
    }
  }
  return null;
}

/** The first element `keyword[...]` of a WKT (e.g. the PROJCS of a COMPD_CS), or null. */
export function firstElement(wkt: string, keyword: string): string | null {
  const s = elementSpan(wkt, keyword);
  return s ? wkt.slice(s[0], s[1]) : null;
}

/** The GEOGCS[...] element of a PROJCS (or the GEOGCS itself), or null. */
export function geogcsOf(wkt: string): string | null {
  const s = elementSpan(wkt, 'GEOGCS');
  return s ? wkt.slice(s[0], s[1]) : null;
}

/** The EPSG code in an element's own (last, top-level) AUTHORITY["EPSG","n"], or null. */
export function ownEpsgCode(element: string): number | null {
  const m = /AUTHORITY\["EPSG","(\d+)"\]\]\s*$/.exec(element.trim());
  return m ? Number(m[1]) : null;
}

/** Semi-major axis and inverse flattening of the first SPHEROID, or null. */
export function spheroidOf(wkt: string): { readonly name: string; readonly aM: number; readonly inverseFlattening: number } | null {
  const m = /SPHEROID\["([^"]*)",([-+0-9.eE]+),([-+0-9.eE]+)/.exec(wkt);
  return m ? { name: m[1]!, aM: Number(m[2]), inverseFlattening: Number(m[3]) } : null;
}

/** A GEOGCS on an unknown datum with the given spheroid (GDAL's idiom for "datum not known"). */
export function unknownDatumGeogcs(spheroid: { readonly name: string; readonly aM: number; readonly inverseFlattening: number }): string {
  return `GEOGCS["unknown",DATUM["unknown",SPHEROID["${spheroid.name}",${spheroid.aM},${spheroid.inverseFlattening}]],PRIMEM["Greenwich",0],UNIT["degree",0.0174532925199433]]`;
}

/**
 * The PROJCS `projcs` renamed and on the base geographic CRS `geogcs`: its own AUTHORITY (the EPSG code
 * of the original) is dropped, since the result is not that CRS.
 */
export function projcsOnGeogcs(projcs: string, geogcs: string, name: string): string {
  const g = elementSpan(projcs, 'GEOGCS');
  if (!projcs.startsWith('PROJCS[') || !g) throw new RangeError('expected an OGC WKT 1 PROJCS with a GEOGCS');
  const body = projcs.slice(0, g[0]).replace(/^PROJCS\["(?:[^"]*)",/, `PROJCS["${name.replace(/"/g, "'")}",`) + geogcs + projcs.slice(g[1]);
  return body.replace(/,AUTHORITY\["EPSG","\d+"\]\]\s*$/, ']');
}
