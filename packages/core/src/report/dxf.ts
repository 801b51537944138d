/**
 * DXF of the points for CAD: each point a 3-D POINT entity (x = easting, y = northing, z = height) on
 * the layer REFDELTA_POINTS, with its name as an MTEXT entity on REFDELTA_NAMES beside it (a POINT has
 * no name of its own in DXF). Written with @tarikjabiri/dxf; units metres ($INSUNITS 6). DXF holds no
 * CRS: the projection goes in the .prj of the same base name and the metadata sidecar; comment lines
 * (group code 999) at the top of the file say it for a reader who opens the DXF alone.
 *
 * Text encoding. The writer declares AutoCAD 2007 ($ACADVER AC1021), whose DXF text is UTF-8, while
 * readers of the older versions take $DWGCODEPAGE (ANSI_1252 by default) and GDAL up to at least 3.6 reads
 * every DXF by $DWGCODEPAGE alone (a UTF-8 name comes out as 'RÃ¡th'). The file is therefore plain
 * ASCII, which is the same bytes in UTF-8 and in Windows-1252, with every other character written as the
 * DXF Unicode escape \U+XXXX (AutoCAD DXF Reference, "Group Codes in Numerical Order" and the MTEXT
 * format codes), and $DWGCODEPAGE ANSI_1252 stated. The names are MTEXT, not TEXT: GDAL 3.6 translates
 * \U+XXXX in MTEXT and leaves it as it is in TEXT (checked with ogrinfo 3.6.2).
 *
 * Two percent signs start a special-character code in DXF text (%%d degree, %%c diameter, %%p plus/minus:
 * AutoCAD DXF Reference, MTEXT and TEXT control codes, from memory), and GDAL 3.6 turns them into those
 * characters in MTEXT too, but does not read the '%%%' of TEXT as a percent sign (ogrinfo 3.6.2 shows
 * '%%%q' as it is). A percent sign that follows another is therefore written \U+0025, so the file never
 * holds two in a row and a name such as '10%%d' is shown as written.
 */
import { DxfWriter, MTextAttachmentPoint, point3d, Units } from '@tarikjabiri/dxf';

export const DXF_POINTS_LAYER = 'REFDELTA_POINTS';
export const DXF_NAMES_LAYER = 'REFDELTA_NAMES';

export interface DxfPoint {
  readonly name: string;
  readonly eastingM: number;
  readonly northingM: number;
  readonly heightM: number;
}

/**
 * Longest MTEXT value in one group 1 line: a longer one is split into group 3 chunks (AutoCAD DXF
 * Reference, MTEXT group codes), which the writer does not do; a point label never needs that much.
 */
const MTEXT_GROUP1_MAX_CHARS = 250;

/** One character as MTEXT content in ASCII. */
function mtextCharacter(codePoint: number): string {
  // Control characters (C0, DEL, C1) would break the line structure of the file: a space instead.
  if (codePoint < 0x20 || (codePoint >= 0x7f && codePoint <= 0x9f)) return ' ';
  // MTEXT format codes start with a backslash and group with braces: both written escaped. A caret
  // introduces a control character in a DXF string; a caret itself is a caret and a space.
  if (codePoint === 0x5c) return '\\\\';
  if (codePoint === 0x7b) return '\\{';
  if (codePoint === 0x7d) return '\\}';
  if (codePoint === 0x5e) return '^ ';
  if (codePoint < 0x80) return String.fromCharCode(codePoint);
  // \U+ takes four hexadecimal digits: a character beyond the Basic Multilingual Plane becomes U+FFFD.
  return `\\U+${(codePoint > 0xffff ? 0xfffd : codePoint).toString(16).toUpperCase().padStart(4, '0')}`;
}

/**
 * A name as the ASCII value of an MTEXT entity (see the file comment), cut at a whole character when it
 * would not fit in one group 1 line.
 */
export function dxfMtextValue(name: string): string {
  let out = '';
  let previous = '';
  for (const ch of name) {
    const piece = ch === '%' && previous === '%' ? '\\U+0025' : mtextCharacter(ch.codePointAt(0)!);
    previous = ch;
    if (out.length + piece.length > MTEXT_GROUP1_MAX_CHARS) break;
    out += piece;
  }
  return out;
}

/** A comment line of the file, in ASCII (non-ASCII characters become '?': comments carry no escapes). */
function dxfComment(text: string): string {
  return `999\n${text.replace(/[^\x20-\x7e]/g, '?')}\n`;
}

/**
 * The DXF text. `comments` are written as comment lines (group code 999) at the top of the file: what
 * the coordinates are (CRS, heights), which DXF cannot otherwise hold.
 */
export function pointsDxf(points: readonly DxfPoint[], comments: readonly string[] = []): string {
  const dxf = new DxfWriter();
  dxf.setUnits(Units.Meters);
  // The code page of the file's bytes (ASCII: the same in Windows-1252) for readers that use it.
  dxf.setVariable('$DWGCODEPAGE', { 3: 'ANSI_1252' });
  dxf.addLayer(DXF_POINTS_LAYER, 7, 'CONTINUOUS');
  dxf.addLayer(DXF_NAMES_LAYER, 3, 'CONTINUOUS');
  for (const p of points) {
    if (![p.eastingM, p.northingM, p.heightM].every(Number.isFinite)) continue;
    dxf.addPoint(p.eastingM, p.northingM, p.heightM, { layerName: DXF_POINTS_LAYER });
    // Label 0.5 m to the north-east, 0.5 m high (common practice for survey plots at 1:500), its
    // bottom-left corner there as a TEXT's insertion point would be.
    dxf.addMText(point3d(p.eastingM + 0.5, p.northingM + 0.5, p.heightM), 0.5, dxfMtextValue(p.name), {
      layerName: DXF_NAMES_LAYER, attachmentPoint: MTextAttachmentPoint.BottomLeft,
    });
  }
  return comments.map(dxfComment).join('') + dxf.stringify();
}
