/**
 * DXF of the points for CAD: each point a 3-D POINT entity (x = easting, y = northing, z = height) on
 * the layer REFDELTA_POINTS, with its name as a TEXT entity on REFDELTA_NAMES beside it (a POINT has
 * no name of its own in DXF). Written with @tarikjabiri/dxf; units metres ($INSUNITS 6). DXF holds no
 * CRS: the projection goes in the .prj of the same base name and the metadata sidecar.
 */
import { DxfWriter, point3d, Units } from '@tarikjabiri/dxf';

export const DXF_POINTS_LAYER = 'REFDELTA_POINTS';
export const DXF_NAMES_LAYER = 'REFDELTA_NAMES';

export interface DxfPoint {
  readonly name: string;
  readonly eastingM: number;
  readonly northingM: number;
  readonly heightM: number;
}

export function pointsDxf(points: readonly DxfPoint[]): string {
  const dxf = new DxfWriter();
  dxf.setUnits(Units.Meters);
  dxf.addLayer(DXF_POINTS_LAYER, 7, 'CONTINUOUS');
  dxf.addLayer(DXF_NAMES_LAYER, 3, 'CONTINUOUS');
  for (const p of points) {
    if (![p.eastingM, p.northingM, p.heightM].every(Number.isFinite)) continue;
    dxf.addPoint(p.eastingM, p.northingM, p.heightM, { layerName: DXF_POINTS_LAYER });
    // Label 0.5 m to the north-east, 0.5 m high (common practice for survey plots at 1:500).
    dxf.addText(point3d(p.eastingM + 0.5, p.northingM + 0.5, p.heightM), 0.5, p.name, { layerName: DXF_NAMES_LAYER });
  }
  return dxf.stringify();
}
